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
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadIals } from '../../src-main/core/models/ials.ts';
import { buildDemoWorkspace } from '../../src-main/services/demo.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { importFile } from '../../src-main/services/import.ts';
import { trainAndSave } from '../../src-main/services/train/train-job.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

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

/** The demo shop, small, built once through the real import and training path; each test works on a copy. */
const built = path.join(dir, 'built.sqlite');
beforeAll(async () => {
  await buildDemoWorkspace(built, { seed: 11, size: { items: 200, customers: 600, signals: 8_000 } });
});
let copies = 0;
function copy(): string {
  const file = path.join(dir, `shop-${++copies}.sqlite`);
  fs.copyFileSync(built, file);
  return file;
}

interface Person {
  ext: string;
  signals: number;
  needles: { id: Buffer; factors: Buffer; records: Buffer[] };
}

/**
 * The person with the most signals (demo ids are fixed-width, "C000123", so no other id contains theirs),
 * after a later import that names them in its file name and adds a signal through the upsert path; and the
 * bytes that identify them.
 */
async function person(db: Db, file: string): Promise<Person> {
  const p = db
    .prepare('SELECT c.id, c.external_id AS ext FROM customer c JOIN signal s ON s.customer_id = c.id GROUP BY c.id ORDER BY count(*) DESC, c.id LIMIT 1')
    .get() as { id: number; ext: string };
  const extra = path.join(path.dirname(file), `returns ${p.ext} ${copies}.csv`);
  const item = db.prepare('SELECT external_id FROM item ORDER BY id LIMIT 1').pluck().get() as string;
  fs.writeFileSync(extra, `customer,item,kind,value,at\n${p.ext},${item},rating,4.5,2026-01-02T03:04:05Z\n`);
  expect((await importFile(db, { target: 'signals', file: extra })).committed).toBe(true);

  const signals = db.prepare('SELECT id, customer_id, item_id, kind, value, at FROM signal WHERE customer_id = ?').all(p.id) as SignalRow[];
  const records = signals.flatMap(signalRecords);
  const ials = loadIals(new ModelRepo(db).loadCurrent('ials')!.bytes);
  const k = ials.factors;
  const row = (db.prepare('SELECT count(*) FROM customer WHERE id < ?').pluck().get(p.id) as number) * k;
  const factors = Buffer.from(ials.customerFactors.slice(row, row + k).buffer); // little-endian on every platform we run
  expect(k).toBeGreaterThanOrEqual(8);
  expect(factors.length).toBe(4 * k);
  expect(signals.length).toBeGreaterThan(10);
  expect(records.every((rec) => rec.length >= 8)).toBe(true);
  return { ext: p.ext, signals: signals.length, needles: { id: Buffer.from(p.ext, 'utf8'), factors, records } };
}

/** Which needles are in the workspace's bytes on disk (the file and its write-ahead log). */
function found(file: string, n: Person['needles']): { id: boolean; factors: boolean; records: number } {
  const bytes = diskBytes(file);
  return { id: bytes.includes(n.id), factors: bytes.includes(n.factors), records: n.records.filter((r) => bytes.includes(r)).length };
}

describe('forget leaves no bytes of the person', () => {
  it('finds none of the id, the signal records or the factor vector in the file and its log after the erasure', async () => {
    const file = copy();
    const db = openWorkspace(file);
    try {
      const who = await person(db, file);
      // Before: every needle is on disk (this is what makes the scan below mean something).
      expect(found(file, who.needles)).toEqual({ id: true, factors: true, records: who.needles.records.length });

      const r = forgetCustomer(db, who.ext);
      expect(r).toMatchObject({ signals: who.signals, modelsDeleted: ['ials'], bytesRemoved: true });
      // After, with the workspace still open (as the app keeps it): nothing, in the file or in its log.
      expect(found(file, who.needles)).toEqual({ id: false, factors: false, records: 0 });
      // The workspace still works: the other customers' signals are there.
      expect(db.prepare('SELECT count(*) FROM signal').pluck().get()).toBeGreaterThan(7_000);
    } finally {
      db.close();
    }
  });

  it('finishes the scrub once a reader that held the old pages has gone (here: when a training run ends)', async () => {
    const file = copy();
    const db = openWorkspace(file);
    const reader = openWorkspace(file, { readonly: true });
    try {
      const who = await person(db, file);
      // Another connection in the middle of a read (a training thread loading its data) keeps the old pages.
      reader.prepare('BEGIN').run();
      reader.prepare('SELECT count(*) FROM signal').pluck().get();
      db.pragma('busy_timeout = 50'); // how long the checkpoint waits for that reader; short, to keep the test quick
      const r = forgetCustomer(db, who.ext);
      expect(r.bytesRemoved).toBe(false);
      expect(r.message).toMatch(/another program is still reading the workspace, so the erased rows may linger in its log file/);
      expect(db.prepare('SELECT count(*) FROM customer WHERE external_id = ?').pluck().get(who.ext)).toBe(0);
      reader.prepare('COMMIT').run();
      db.pragma('busy_timeout = 5000');

      await trainAndSave(db, file, { models: ['popularity'] });
      expect(found(file, who.needles)).toEqual({ id: false, factors: false, records: 0 });
      expect(db.prepare("SELECT value FROM workspace_meta WHERE key = 'scrub_pending'").pluck().get()).toBe(0);
    } finally {
      reader.close();
      db.close();
    }
  });

  it('finishes the scrub when the workspace is next opened for writing, while another program still has it open', async () => {
    const file = copy();
    const db = openWorkspace(file);
    const reader = openWorkspace(file, { readonly: true });
    try {
      const who = await person(db, file);
      reader.prepare('BEGIN').run();
      reader.prepare('SELECT count(*) FROM signal').pluck().get();
      db.pragma('busy_timeout = 50');
      expect(forgetCustomer(db, who.ext).bytesRemoved).toBe(false);
      reader.prepare('COMMIT').run();
      db.close(); // the reader stays open, so closing cannot empty the log itself
      expect(fs.statSync(`${file}-wal`).size).toBeGreaterThan(0);

      openWorkspace(file).close();
      expect(found(file, who.needles)).toEqual({ id: false, factors: false, records: 0 });
    } finally {
      reader.close();
      if (db.open) db.close();
    }
  });
});
