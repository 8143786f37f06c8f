import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { importFile } from '../../src-main/services/import.ts';
import { SIGNAL_BATCH } from '../../src-main/store/catalogue-writes.ts';
import { CUSTOMERS_CSV, freshWorkspace, tempDir, write } from './helpers.ts';

/**
 * Signals go to SQLite in typed-array batches of SIGNAL_BATCH rows. These files span several batches and
 * check the counts and stored rows against expectations computed here, row by row, from the file itself.
 */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const ITEMS = 'id,title\n' + Array.from({ length: 50 }, (_, i) => `b${i},Book ${i}`).join('\n') + '\n';
let k = 0;
async function workspace() {
  const db = freshWorkspace(dir, `b${++k}.shelf`);
  await importFile(db, { target: 'items', file: write(dir, `items${k}.csv`, ITEMS) });
  await importFile(db, { target: 'customers', file: write(dir, `customers${k}.csv`, CUSTOMERS_CSV) });
  return db;
}
const N = 2 * SIGNAL_BATCH + 1234;
const KINDS = ['view', 'purchase', 'rating', 'click'];
const row = (i: number, value = 1 + (i % 5)) => `r${1 + (i % 2)},b${i % 50},${KINDS[i % 4]},${value},${1_700_000_000 + i}`;
const file = (name: string, rows: string[]) => write(dir, name, 'customer,item,kind,value,at\n' + rows.join('\n') + '\n');
const stored = (db: ReturnType<typeof freshWorkspace>) =>
  db.prepare('SELECT c.external_id AS c, i.external_id AS i, k.name AS kind, s.value, s.at FROM signal s JOIN signal_kind k ON k.code = s.kind JOIN customer c ON c.id = s.customer_id JOIN item i ON i.id = s.item_id ORDER BY s.at').raw().all() as unknown[][];

describe('signal import across several batches', () => {
  it('bulk load, then an upsert into the non-empty table reports added / updated / unchanged exactly', async () => {
    const db = await workspace();
    const first = Array.from({ length: N }, (_, i) => row(i));
    const r1 = await importFile(db, { target: 'signals', file: file('first.csv', first) });
    expect(r1).toMatchObject({ rows: N, added: N, updated: 0, unchanged: 0, rejected: 0, committed: true });
    // Second file: rows 0..N-1 again, every 7th with a new value, plus 900 new rows after them.
    const second = Array.from({ length: N + 900 }, (_, i) => (i < N && i % 7 === 0 ? row(i, 9) : row(i)));
    const changed = Math.ceil(N / 7);
    const r2 = await importFile(db, { target: 'signals', file: file('second.csv', second) });
    expect(r2).toMatchObject({ rows: N + 900, added: 900, updated: changed, unchanged: N - changed, committed: true });
    const expected = second.map((line) => {
      const [c, i, kind, v, at] = line.split(',');
      return [c, i, kind, Number(v), Number(at) * 1000];
    });
    expect(stored(db)).toEqual(expected);
  });

  it('rejects rows deep in a big file with their own line and column, and keeps the rest with acceptPartial', async () => {
    const db = await workspace();
    const rows = Array.from({ length: N }, (_, i) => row(i));
    rows[SIGNAL_BATCH + 10] = 'r1,ghost,view,1,1700000000'; // file line SIGNAL_BATCH + 12
    rows[N - 5] = 'r2,b1,wink,1,1700000001'; // file line N - 3
    const r = await importFile(db, { target: 'signals', file: file('partial.csv', rows), acceptPartial: true });
    expect(r).toMatchObject({ rows: N, rejected: 2, errorCount: 2, added: N - 2, committed: true });
    expect(r.errors.map((e) => [e.line, e.column])).toEqual([[SIGNAL_BATCH + 12, 2], [N - 3, 3]]);
    expect(r.errors[1]!.reason).toMatch(/^kind: unknown kind 'wink'/);
    expect(stored(db)).toHaveLength(N - 2);
  });

  it("creates unknown customers with the row ids a plain INSERT would give, in order of first appearance", async () => {
    const db = await workspace();
    const rows = Array.from({ length: N }, (_, i) => (i % 1000 === 999 ? row(i).replace(/^r\d/, `new${i}`) : row(i)));
    const r = await importFile(db, { target: 'signals', file: file('create.csv', rows), unknown: 'create' });
    const made = Math.floor(N / 1000);
    expect(r).toMatchObject({ added: N, customersCreated: made });
    const customers = db.prepare('SELECT id, external_id FROM customer ORDER BY id').raw().all() as unknown[][];
    expect(customers).toEqual([[1, 'r1'], [2, 'r2'], ...Array.from({ length: made }, (_, j) => [3 + j, `new${1000 * j + 999}`])]);
    expect(stored(db).filter((s) => String(s[0]).startsWith('new'))).toHaveLength(made);
  });
});
