import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { importFile } from '../../src-main/services/import.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { CUSTOMERS_CSV, ITEMS_CSV, SIGNALS_CSV, freshWorkspace, snapshot, tempDir, write } from './helpers.ts';

const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let k = 0;
async function catalogue() {
  const db = freshWorkspace(dir, `s${++k}.shelf`);
  await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
  await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS_CSV) });
  return db;
}
const signals = (db: ReturnType<typeof freshWorkspace>) =>
  db.prepare(
    'SELECT c.external_id AS customer, i.external_id AS item, k.name AS kind, s.value, s.at FROM signal s JOIN signal_kind k ON k.code = s.kind ' +
      'JOIN customer c ON c.id = s.customer_id JOIN item i ON i.id = s.item_id ORDER BY customer, item, kind, at',
  ).all();

describe('importFile: signals', () => {
  it("imports the demo generator's signals.csv; a missing time is stored as null", async () => {
    const db = await catalogue();
    const r = await importFile(db, { target: 'signals', file: write(dir, 'signals.csv', SIGNALS_CSV) });
    expect(r).toMatchObject({ rows: 4, added: 4, updated: 0, unchanged: 0, committed: true });
    expect(signals(db)).toEqual([
      { customer: 'r1', item: 'b1', kind: 'purchase', value: 1, at: Date.parse('2026-03-14T09:30:00Z') },
      { customer: 'r1', item: 'b1', kind: 'view', value: 1, at: Date.parse('2026-03-14T09:26:53Z') },
      { customer: 'r2', item: 'b2', kind: 'rating', value: 4, at: Date.parse('2026-03-15T10:00:00Z') },
      { customer: 'r2', item: 'b3', kind: 'read', value: 1, at: null },
    ]);
    expect(loadDataset(db).signals.length).toBe(4);
    // The index dropped for the bulk load of an empty table is back, with the migration's definition.
    const idx = db.prepare("SELECT sql FROM sqlite_master WHERE type = 'index' AND tbl_name = 'signal' ORDER BY name").pluck().all();
    expect(idx).toEqual(['CREATE UNIQUE INDEX signal_identity ON signal(item_id, customer_id, kind, ifnull(at, -1))']);
  });

  it('importing the same file twice: 0 added, 0 updated, N unchanged, same state', async () => {
    const db = await catalogue();
    const file = write(dir, 'again.csv', SIGNALS_CSV);
    await importFile(db, { target: 'signals', file });
    const before = snapshot(db);
    const r = await importFile(db, { target: 'signals', file });
    expect(r).toMatchObject({ added: 0, updated: 0, unchanged: 4 });
    expect(snapshot(db).signal).toEqual(before.signal);
  });

  it('upserts on (customer, item, kind, at) with the last row winning, in both the bulk and the upsert path', async () => {
    const db = await catalogue();
    const dup = 'customer,item,kind,value,at\nr1,b1,rating,2,1773480413\nr1,b1,rating,5,1773480413\nr1,b1,rating,5,1773480413\nr2,b1,view,1,\nr2,b1,view,1,\n';
    // Empty table: bulk path (indexes rebuilt, duplicates removed keeping the last).
    const r1 = await importFile(db, { target: 'signals', file: write(dir, 'dup.csv', dup) });
    expect(r1).toMatchObject({ rows: 5, added: 2, updated: 1, unchanged: 2 });
    expect(signals(db)).toEqual([
      { customer: 'r1', item: 'b1', kind: 'rating', value: 5, at: 1_773_480_413_000 },
      { customer: 'r2', item: 'b1', kind: 'view', value: 1, at: null },
    ]);
    // Non-empty table: upsert path, same counting rule.
    const r2 = await importFile(db, { target: 'signals', file: write(dir, 'dup2.csv', dup.replace('rating,2', 'rating,3')) });
    expect(r2).toMatchObject({ rows: 5, added: 0, updated: 2, unchanged: 3 });
    expect(signals(db)).toHaveLength(2);
    expect((signals(db)[0] as { value: number }).value).toBe(5);
  });

  it("creates unknown customers with unknown: 'create', and maps header and kind synonyms", async () => {
    const db = await catalogue();
    const file = write(dir, 'syn.csv', 'User ID,SKU,Action,Quantity,Timestamp\nnewbie,b2,cart,2,2026-03-20T08:00:00Z\nr1,b2,buy,1,2026-03-21\n');
    const r = await importFile(db, { target: 'signals', file, unknown: 'create' });
    expect(r).toMatchObject({ added: 2, customersCreated: 1, mapping: { customer: 'User ID', item: 'SKU', kind: 'Action', value: 'Quantity', at: 'Timestamp' } });
    expect(signals(db)).toEqual([
      { customer: 'newbie', item: 'b2', kind: 'basket', value: 2, at: Date.parse('2026-03-20T08:00:00Z') },
      { customer: 'r1', item: 'b2', kind: 'purchase', value: 1, at: Date.parse('2026-03-21') },
    ]);
  });

  it('reads d/m/y dates with dateOrder and JSON Lines signals with numeric times', async () => {
    const db = await catalogue();
    await importFile(db, { target: 'signals', file: write(dir, 'dmy.csv', 'customer,item,kind,date\nr1,b1,view,14/03/2026 09:26\n'), dateOrder: 'dmy' });
    const jl = write(dir, 'sig.ndjson', '{"customer":"r2","item":"b3","kind":"read","at":1773480413000}\n');
    expect(await importFile(db, { target: 'signals', file: jl })).toMatchObject({ format: 'jsonl', added: 1 });
    expect(signals(db).map((s) => (s as { at: number }).at)).toEqual([Date.UTC(2026, 2, 14, 9, 26), 1_773_480_413_000]);
  });

  it('a failed bulk load into an empty signal table restores the dropped indexes (rollback) and foreign keys', async () => {
    const db = await catalogue();
    const before = snapshot(db);
    const r = await importFile(db, { target: 'signals', file: write(dir, 'badbulk.csv', 'customer,item,kind\nr1,b1,view\nr1,b9,view\n') });
    expect(r.committed).toBe(false);
    expect(snapshot(db)).toEqual(before);
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
  });

  it('reports progress while writing', async () => {
    const db = await catalogue();
    const rows = Array.from({ length: 25_000 }, (_, i) => `r${1 + (i % 2)},b${1 + (i % 3)},view,1,${1_700_000_000 + i}`);
    const seen: number[] = [];
    const r = await importFile(db, { target: 'signals', file: write(dir, 'many.csv', 'customer,item,kind,value,at\n' + rows.join('\n')), onProgress: (p) => seen.push(p.rows) });
    expect(r.added).toBe(25_000);
    expect(seen).toEqual([10_000, 20_000]);
  });
});
