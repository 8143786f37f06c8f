import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { InputError } from '../../src-main/core/errors.ts';
import { StringIdTable } from '../../src-main/core/util/string-id-table.ts';
import { importFile } from '../../src-main/services/import.ts';
import { MAX_ERRORS, runImport, type ImportReport, type RunOptions } from '../../src-main/ingest/run.ts';
import { readSignalsInThread } from '../../src-main/ingest/signal-thread.ts';
import { SIGNAL_BATCH } from '../../src-main/store/catalogue-writes.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { CUSTOMERS_CSV, freshWorkspace, snapshot, tempDir, write } from './helpers.ts';

/**
 * The pipelined signal import (parsing in a worker thread, writes here) against the single-thread path:
 * the same file, imported both ways into twin workspaces, must leave identical tables (every row of every
 * table, the index list, the import log) and identical reports. Files span several batches so the
 * back-pressure between the threads is exercised.
 */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const ITEMS = 'id,title\n' + Array.from({ length: 60 }, (_, i) => `b${i},Book ${i}`).join('\n') + '\n';
const KINDS = ['view', 'purchase', 'rating', 'click', 'cart'];
const N = 2 * SIGNAL_BATCH + 777;
const itemsFile = write(dir, 'items.csv', ITEMS);
const customersFile = write(dir, 'customers.csv', CUSTOMERS_CSV);
let k = 0;

async function twin(): Promise<Db> {
  const db = freshWorkspace(dir, `t${++k}.shelf`);
  await importFile(db, { target: 'items', file: itemsFile });
  await importFile(db, { target: 'customers', file: customersFile });
  return db;
}
const file = (name: string, rows: string[]) => write(dir, name, 'customer,item,kind,value,at\n' + rows.join('\n') + '\n');
const row = (i: number, value = 1 + (i % 4)) => `r${1 + (i % 2)},b${i % 60},${KINDS[i % 5]},${value},${1_700_000_000 + i}`;

/** The report and workspace contents with the wall-clock parts (elapsed time, log time) taken out. */
function comparable(db: Db, r: ImportReport) {
  const s = snapshot(db);
  s.import_log = (s.import_log as { at: number; report: string }[]).map((l) => ({ ...l, at: 0, report: { ...JSON.parse(l.report), elapsedMs: 0 } }));
  return { report: { ...r, elapsedMs: 0 }, tables: s };
}

/** Imports `o` both ways into two fresh twin workspaces (after `before`, run on each) and compares. */
async function bothWays(o: Omit<RunOptions, 'parseThread'>, before?: (db: Db) => Promise<unknown>) {
  const single = await twin();
  const piped = await twin();
  if (before) {
    await before(single);
    await before(piped);
  }
  const a = await runImport(single, { ...o, parseThread: false });
  const b = await runImport(piped, { ...o, parseThread: true });
  const out = { single: comparable(single, a), piped: comparable(piped, b), db: piped, report: b };
  expect(out.piped).toEqual(out.single);
  single.close();
  return out;
}

describe('signal import with parsing in a worker thread', () => {
  it('bulk load with in-file repeats: identical tables and report', async () => {
    // Every 11th row repeats an earlier identity with another value: the bulk path keeps the last one.
    const rows = Array.from({ length: N }, (_, i) => (i % 11 === 10 ? row(i - 5, 9) : row(i)));
    const { report, db } = await bothWays({ target: 'signals', file: file('bulk.csv', rows) });
    const repeats = Math.floor(N / 11);
    expect(report).toMatchObject({ rows: N, added: N - repeats, updated: repeats, unchanged: 0, committed: true });
    expect(db.prepare('SELECT count(*) FROM signal').pluck().get()).toBe(N - repeats);
    db.close();
  });

  it('upsert into a non-empty table: added / updated / unchanged match exactly', async () => {
    const first = Array.from({ length: N }, (_, i) => row(i));
    const second = Array.from({ length: N + 500 }, (_, i) => (i < N && i % 6 === 0 ? row(i, 7) : row(i)));
    const firstFile = file('first.csv', first);
    const { report, db } = await bothWays({ target: 'signals', file: file('second.csv', second) }, (db) =>
      runImport(db, { target: 'signals', file: firstFile, parseThread: false }),
    );
    const changed = Math.ceil(N / 6);
    expect(report).toMatchObject({ rows: N + 500, added: 500, updated: changed, unchanged: N - changed, committed: true });
    db.close();
  });

  it("customers created on the fly get the ids SQLite's own INSERT gives them, in file order", async () => {
    // Every 997th row names a new customer; a few new ones recur later (created once).
    const rows = Array.from({ length: N }, (_, i) => (i % 997 === 0 ? `n${(i / 997) % 7},b${i % 60},view,1,${i}` : row(i)));
    const { report, db } = await bothWays({ target: 'signals', file: file('create.csv', rows), unknown: 'create' });
    const firstSeen = [...new Set(rows.filter((r) => r.startsWith('n')).map((r) => r.split(',')[0]!))];
    expect(report.customersCreated).toBe(firstSeen.length);
    // Reference: a plain INSERT per new customer, in order of first appearance, into an INTEGER PRIMARY
    // KEY table assigns max(rowid) + 1 each time (sqlite.org/autoinc.html, "without AUTOINCREMENT").
    const ref = freshWorkspace(dir, `ref${k}.shelf`);
    await importFile(ref, { target: 'customers', file: customersFile });
    const insert = ref.prepare('INSERT INTO customer (external_id) VALUES (?)');
    const expected = firstSeen.map((c) => [Number(insert.run(c).lastInsertRowid), c]);
    const got = db.prepare("SELECT id, external_id FROM customer WHERE external_id LIKE 'n%' ORDER BY id").raw().all();
    expect(got).toEqual(expected);
    ref.close();
    db.close();
  });

  it('rejected rows keep line, column and reason, the 100-message cap and the exact count', async () => {
    // 150 bad rows spread over the batches (a negative value in column 4), and a few unknown items.
    const rows = Array.from({ length: N }, (_, i) => (i % 130 === 0 && i < 150 * 130 ? `r1,b1,view,-1,${i}` : i % 4001 === 7 ? `r1,ghost${i},view,1,${i}` : row(i)));
    const bad = rows.filter((r) => r.includes(',-1,') || r.includes('ghost')).length;
    const partial = await bothWays({ target: 'signals', file: file('partial.csv', rows), acceptPartial: true });
    expect(partial.report).toMatchObject({ rows: N, rejected: bad, errorCount: bad, added: N - bad, committed: true });
    expect(partial.report.errors).toHaveLength(MAX_ERRORS);
    expect(partial.report.errors[0]).toMatchObject({ line: 2, column: 4, reason: "value: must not be negative: '-1'" });
    expect(partial.report.errors[1]).toMatchObject({ line: 9, column: 2 });
    partial.db.close();
  });

  it('JSON Lines, with a broken line: identical tables and report', async () => {
    const lines = Array.from({ length: SIGNAL_BATCH + 300 }, (_, i) =>
      i === 4000 ? '{"customer": "r1", oops' : JSON.stringify({ customer: `r${1 + (i % 2)}`, item: `b${i % 60}`, kind: KINDS[i % 5], at: 1_700_000_000 + i }),
    );
    const { report, db } = await bothWays({ target: 'signals', file: write(dir, 'sig.jsonl', lines.join('\n') + '\n'), acceptPartial: true });
    expect(report).toMatchObject({ format: 'jsonl', rows: SIGNAL_BATCH + 300, rejected: 1, added: SIGNAL_BATCH + 299, errors: [{ line: 4001, column: null }] });
    db.close();
  });

  it('a rejected row fails the whole import and changes nothing', async () => {
    const rows = Array.from({ length: N }, (_, i) => (i === N - 3 ? 'r1,b1,nope,1,1' : row(i)));
    const f = file('fail.csv', rows);
    const db = await twin();
    const before = snapshot(db);
    const r = await runImport(db, { target: 'signals', file: f, parseThread: true });
    expect(r).toMatchObject({ committed: false, rejected: 1, added: 0, errors: [{ line: N - 1, column: 3 }] });
    expect(snapshot(db)).toEqual(before);
    db.close();
  });

  it('a file that is not CSV throws the same InputError (file, line, column) and changes nothing', async () => {
    const rows = Array.from({ length: N }, (_, i) => (i === N - 10 ? 'r1,b1,"view"x,1,1' : row(i)));
    const f = file('broken.csv', rows);
    const errors: string[] = [];
    for (const parseThread of [false, true]) {
      const db = await twin();
      const before = snapshot(db);
      const e = await runImport(db, { target: 'signals', file: f, parseThread }).then(() => undefined, (x: unknown) => x);
      expect(e).toBeInstanceOf(InputError);
      expect(snapshot(db)).toEqual(before);
      errors.push((e as InputError).describe());
      db.close();
    }
    expect(errors[1]).toBe(errors[0]);
    expect(errors[0]).toContain(`${f}:${N - 8}:`);
  });

  it('a write that fails stops the parsing thread and rejects with that error, after the batches before it', async () => {
    const f = file('stop.csv', Array.from({ length: 5 * SIGNAL_BATCH }, (_, i) => row(i)));
    const ids = {
      items: StringIdTable.from(Array.from({ length: 60 }, (_, i) => `b${i}`), Array.from({ length: 60 }, (_, i) => i + 1)),
      customers: StringIdTable.from(['r1', 'r2'], [1, 2]),
      nextCustomerId: 3,
    };
    const seen: number[] = [];
    const failure = new Error('disk full (simulated)');
    const e = await readSignalsInThread({ file: f, format: 'csv', createCustomers: false }, ids, (b) => {
      seen.push(b.n);
      if (seen.length === 2) throw failure;
    }).then(() => undefined, (x: unknown) => x);
    expect(e).toBe(failure);
    expect(seen).toEqual([SIGNAL_BATCH, SIGNAL_BATCH]);
  });
});
