import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { runImport } from '../../src-main/ingest/run.ts';
import { importFile, previewImport } from '../../src-main/services/import.ts';
import { CUSTOMERS_CSV, ITEMS_CSV, freshWorkspace, snapshot, tempDir, write } from './helpers.ts';

/** Issue 10 item 7: shops export one file per kind (customer, item, count) with no kind column at all. */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let k = 0;
async function catalogue() {
  const db = freshWorkspace(dir, `k${++k}.shelf`);
  await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS_CSV) });
  await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS_CSV) });
  return db;
}
const stored = (db: ReturnType<typeof freshWorkspace>) =>
  db.prepare('SELECT c.external_id AS customer, i.external_id AS item, k.name AS kind, s.value FROM signal s JOIN signal_kind k ON k.code = s.kind ' +
    'JOIN customer c ON c.id = s.customer_id JOIN item i ON i.id = s.item_id ORDER BY customer, item').all();
const PLAYS = 'customer,item,count\nr1,b1,3\nr2,b2,1\n';

describe('a kind for every row of a file without a kind column', () => {
  it('imports (customer, item, count) as purchases, the count as the value', async () => {
    const db = await catalogue();
    const r = await importFile(db, { target: 'signals', file: write(dir, 'plays.csv', PLAYS), kind: 'purchase' });
    expect(r).toMatchObject({ rows: 2, added: 2, committed: true, mapping: { customer: 'customer', item: 'item', value: 'count' } });
    expect(stored(db)).toEqual([
      { customer: 'r1', item: 'b1', kind: 'purchase', value: 3 },
      { customer: 'r2', item: 'b2', kind: 'purchase', value: 1 },
    ]);
  });

  it('gives the same table whether the file is parsed in this thread or the parsing thread', async () => {
    const file = write(dir, 'plays-thread.csv', PLAYS);
    const a = await catalogue();
    const b = await catalogue();
    await runImport(a, { target: 'signals', file, kind: 'view', parseThread: false });
    await runImport(b, { target: 'signals', file, kind: 'view', parseThread: true });
    expect(stored(b)).toEqual(stored(a));
    expect(stored(a).map((s) => (s as { kind: string }).kind)).toEqual(['view', 'view']);
  });

  it('works for JSON Lines too', async () => {
    const db = await catalogue();
    const file = write(dir, 'plays.jsonl', '{"customer":"r1","item":"b3"}\n{"customer":"r2","item":"b3"}\n');
    expect(await importFile(db, { target: 'signals', file, kind: 'read' })).toMatchObject({ added: 2, committed: true });
    expect(stored(db).map((s) => (s as { kind: string }).kind)).toEqual(['read', 'read']);
  });

  it('refuses a file that has a kind column as well, naming the column, and changes nothing', async () => {
    const db = await catalogue();
    const before = snapshot(db);
    const file = write(dir, 'both.csv', 'customer,item,event\nr1,b1,view\n');
    await expect(importFile(db, { target: 'signals', file, kind: 'purchase' })).rejects.toThrow(
      /^the file has a kind column \('event'\), and every row was also given the kind purchase \(--kind on the command line\); that is only for files without one/,
    );
    expect(snapshot(db)).toEqual(before);
  });

  it('is for signals only, and an unknown kind is refused naming the valid ones', async () => {
    const db = await catalogue();
    await expect(importFile(db, { target: 'items', file: write(dir, 'i.csv', ITEMS_CSV), kind: 'view' })).rejects.toThrow(/a kind for every row is for signals only, not items/);
    await expect(importFile(db, { target: 'signals', file: write(dir, 'p.csv', PLAYS), kind: 'listen' as never })).rejects.toThrow(
      /import option kind: .*"view"\|"basket"\|"purchase"\|"rating"\|"read"\|"click"\|"other"/,
    );
  });

  it('without a kind, the missing column is refused with the way out named', async () => {
    const db = await catalogue();
    await expect(importFile(db, { target: 'signals', file: write(dir, 'nokind.csv', PLAYS) })).rejects.toThrow(
      /missing required column kind for signals \(columns: customer, item, count\); rename them or pass a mapping, or give every row one kind \(--kind on the command line\)/,
    );
  });

  it('previews with the kind: mapping detected, no problems', async () => {
    const file = write(dir, 'preview.csv', PLAYS);
    expect((await previewImport(file, 'signals')).problems).toEqual([expect.stringMatching(/missing required column kind/)]);
    const p = await previewImport(file, 'signals', { kind: 'purchase' });
    expect(p).toMatchObject({ mapping: { customer: 'customer', item: 'item', value: 'count' }, problems: [] });
  });
});
