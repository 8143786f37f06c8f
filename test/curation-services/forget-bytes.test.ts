/**
 * After `forget`, no byte of the person is left in the workspace's files (DESIGN.md: erasure "leaves no bytes
 * (secure delete, WAL truncated, vacuum)"). Found in a review: the file still held the id twice, hundreds of
 * the person's signal records and their whole iALS factor vector in freed pages, and the import log kept the
 * id in its stored messages.
 *
 * The scan reads the database file and its write-ahead log as raw bytes and looks for:
 * - the customer's id as UTF-8 text;
 * - each of their signal rows as SQLite stores it: the table record (id, customer_id, item_id, kind, value, at)
 *   and the signal_identity index record (item_id, customer_id, kind, ifnull(at, -1), rowid), encoded by the
 *   record format of the SQLite file format document (sqlite.org/fileformat2.html, 2.1 "Record Format");
 * - their iALS factor row as raw little-endian float32 bytes, taken from the stored model before the erasure.
 * Before the erasure the same scan must find every one of them, which checks the encoder against SQLite itself.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadIals } from '../../src-main/core/models/ials.ts';
import { buildDemoWorkspace } from '../../src-main/services/demo.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { importFile } from '../../src-main/services/import.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-forget-bytes-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** An integer's serial type and big-endian bytes (fileformat2.html 2.1: types 1-6, and 8/9 for 0 and 1 in schema format 4). */
function integer(v: number): { type: number; bytes: Buffer } {
  if (v === 0) return { type: 8, bytes: Buffer.alloc(0) };
  if (v === 1) return { type: 9, bytes: Buffer.alloc(0) };
  for (const [type, size] of [[1, 1], [2, 2], [3, 3], [4, 4], [5, 6]] as const) {
    const limit = 2 ** (8 * size - 1);
    if (v >= -limit && v < limit) {
      const b = Buffer.alloc(size);
      b.writeIntBE(v, 0, size);
      return { type, bytes: b };
    }
  }
  const b = Buffer.alloc(8);
  b.writeBigInt64BE(BigInt(v));
  return { type: 6, bytes: b };
}

/**
 * One value of a record. A REAL column's whole-number value is stored as an integer (SQLite docs,
 * "Datatypes In SQLite", 3.2: "small floating point values with no fractional component ... are written to
 * disk as integers"); other reals as big-endian float64 (type 7).
 */
function field(v: number | null, real = false): { type: number; bytes: Buffer } {
  if (v === null) return { type: 0, bytes: Buffer.alloc(0) };
  if (!real || Number.isInteger(v)) return integer(v);
  const b = Buffer.alloc(8);
  b.writeDoubleBE(v);
  return { type: 7, bytes: b };
}

/** A record: header length and serial types as varints (all below 128 here, so one byte each), then the bodies. */
function sqliteRecord(fields: { type: number; bytes: Buffer }[]): Buffer {
  const header = Buffer.from([fields.length + 1, ...fields.map((f) => f.type)]);
  return Buffer.concat([header, ...fields.map((f) => f.bytes)]);
}

interface SignalRow {
  id: number;
  customer_id: number;
  item_id: number;
  kind: number;
  value: number;
  at: number | null;
}

function signalRecords(s: SignalRow): Buffer[] {
  const table = sqliteRecord([field(null), field(s.customer_id), field(s.item_id), field(s.kind), field(s.value, true), field(s.at)]);
  const index = sqliteRecord([field(s.item_id), field(s.customer_id), field(s.kind), field(s.at ?? -1), field(s.id)]);
  return [table, index];
}

/** The workspace's bytes on disk: the file and its write-ahead log, if there is one. */
function diskBytes(file: string): Buffer {
  const parts = [fs.readFileSync(file)];
  if (fs.existsSync(`${file}-wal`)) parts.push(fs.readFileSync(`${file}-wal`));
  return Buffer.concat(parts);
}

describe('forget leaves no bytes of the person', () => {
  it('finds none of the id, the signal records or the factor vector in the file and its log after the erasure', async () => {
    const file = path.join(dir, 'shop.sqlite');
    await buildDemoWorkspace(file, { seed: 11, size: { items: 200, customers: 600, signals: 8_000 } });
    const db = openWorkspace(file);
    try {
      // The person with the most signals; demo ids are fixed-width ("C000123"), so no other id contains theirs.
      const person = db
        .prepare('SELECT c.id, c.external_id AS ext FROM customer c JOIN signal s ON s.customer_id = c.id GROUP BY c.id ORDER BY count(*) DESC, c.id LIMIT 1')
        .get() as { id: number; ext: string };
      // A later import names them in its file name and adds signals through the upsert path (into the log file).
      const extra = path.join(dir, `returns ${person.ext}.csv`);
      fs.writeFileSync(extra, `customer,item,kind,value,at\n${person.ext},${firstItem(db)},rating,4.5,2026-01-02T03:04:05Z\n`);
      expect((await importFile(db, { target: 'signals', file: extra })).committed).toBe(true);

      const signals = db.prepare('SELECT id, customer_id, item_id, kind, value, at FROM signal WHERE customer_id = ?').all(person.id) as SignalRow[];
      const records = signals.flatMap(signalRecords);
      const ials = loadIals(new ModelRepo(db).loadCurrent('ials')!.bytes);
      const k = ials.factors;
      const row = (db.prepare('SELECT count(*) FROM customer WHERE id < ?').pluck().get(person.id) as number) * k;
      const factors = Buffer.from(ials.customerFactors.slice(row, row + k).buffer); // little-endian on every platform we run
      expect(factors.length).toBe(4 * k);
      expect(k).toBeGreaterThanOrEqual(8);
      const needles = { id: Buffer.from(person.ext, 'utf8'), factors, records };

      // Before: every needle is on disk (this is what makes the scan below mean something).
      const before = diskBytes(file);
      expect(signals.length).toBeGreaterThan(10);
      expect(records.every((rec) => rec.length >= 8)).toBe(true);
      expect(before.includes(needles.id)).toBe(true);
      expect(before.includes(needles.factors)).toBe(true);
      expect(records.filter((r) => !before.includes(r))).toEqual([]);

      const r = forgetCustomer(db, person.ext);
      expect(r).toMatchObject({ signals: signals.length, modelsDeleted: ['ials'], bytesRemoved: true });

      // After, with the workspace still open (as the app keeps it): nothing, in the file or in its log.
      const after = diskBytes(file);
      expect(after.includes(needles.id)).toBe(false);
      expect(after.includes(needles.factors)).toBe(false);
      expect(records.filter((rec) => after.includes(rec)).length).toBe(0);
      // The workspace still works: the other customers' signals are there.
      expect(db.prepare('SELECT count(*) FROM signal').pluck().get()).toBeGreaterThan(7_000);
    } finally {
      db.close();
    }
    const closed = diskBytes(file);
    expect(closed.includes(Buffer.from('C0', 'utf8'))).toBe(true); // other ids remain readable
  });
});

function firstItem(db: ReturnType<typeof openWorkspace>): string {
  return db.prepare('SELECT external_id FROM item ORDER BY id LIMIT 1').pluck().get() as string;
}
