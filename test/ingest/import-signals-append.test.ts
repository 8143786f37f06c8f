import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { seededRng } from '../../src-main/core/rng.ts';
import { SignalIdentityTable } from '../../src-main/core/util/signal-identity-table.ts';
import { runImport, type ImportReport } from '../../src-main/ingest/run.ts';
import { importFile } from '../../src-main/services/import.ts';
import { SIGNAL_BATCH } from '../../src-main/store/catalogue-writes.ts';
import { freshWorkspace, snapshot, tempDir, write } from './helpers.ts';

/**
 * Issue 11 part 5: a big file appended to a table that has signals drops the identity index, resolves
 * repeats in memory and rebuilds the index ('rebuild'). The reference is the row-by-row path ('upsert'),
 * whose rule is SQLite's own upsert (sqlite.org/lang_upsert.html: ON CONFLICT(identity) DO UPDATE SET
 * value = excluded.value WHERE signal.value IS NOT excluded.value): both must leave the same rows, row ids
 * and values, and report the same counts.
 */
const dir = tempDir();
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const ITEMS = 'id,title\n' + Array.from({ length: 40 }, (_, i) => `b${i},Book ${i}`).join('\n') + '\n';
const CUSTOMERS = 'id\n' + Array.from({ length: 30 }, (_, i) => `r${i}`).join('\n') + '\n';
const KINDS = ['view', 'purchase', 'rating', 'click'];

/** Random signals over few identities, so repeats of stored rows and within the file are frequent; some without a time. */
function signals(seed: number, n: number): string {
  const rng = seededRng(seed);
  const rows = ['customer,item,kind,value,at'];
  for (let i = 0; i < n; i++) {
    const at = rng.int(6) === 0 ? '' : String(1_700_000_000 + rng.int(40));
    rows.push(`r${rng.int(30)},b${rng.int(40)},${KINDS[rng.int(4)]},${rng.int(3)},${at}`);
  }
  return rows.join('\n') + '\n';
}

async function appended(name: string, base: string, extra: string, appendPath: 'upsert' | 'rebuild', parseThread = false) {
  const db = freshWorkspace(dir, `${name}-${appendPath}-${parseThread}.shelf`);
  await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS) });
  await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS) });
  await importFile(db, { target: 'signals', file: base });
  const report = await runImport(db, { target: 'signals', file: extra, appendPath, parseThread });
  const rows = db.prepare('SELECT id, customer_id, item_id, kind, value, at FROM signal ORDER BY id').raw().all();
  const indexes = snapshot(db).indexes;
  db.close();
  return { report, rows, indexes };
}
const counts = (r: ImportReport) => ({ rows: r.rows, added: r.added, updated: r.updated, unchanged: r.unchanged, committed: r.committed });

describe('appending signals: the rebuild path equals the upsert path', () => {
  it.each([
    ['few stored, many repeats', 1, 300, 3 * SIGNAL_BATCH + 17],
    ['more stored than appended', 2, 5000, 800],
  ])('%s: same rows, row ids, values and counts', async (name, seed, stored, appendedRows) => {
    const base = write(dir, `base-${seed}.csv`, signals(seed, stored));
    const extra = write(dir, `extra-${seed}.csv`, signals(seed + 100, appendedRows));
    const upsert = await appended(name, base, extra, 'upsert');
    const rebuild = await appended(name, base, extra, 'rebuild');
    expect(counts(rebuild.report)).toEqual(counts(upsert.report));
    expect(rebuild.report.updated).toBeGreaterThan(0); // the data did exercise repeats
    expect(rebuild.rows).toEqual(upsert.rows);
    expect(rebuild.indexes).toEqual(upsert.indexes);
    const threaded = await appended(name, base, extra, 'rebuild', true);
    expect(counts(threaded.report)).toEqual(counts(upsert.report));
    expect(threaded.rows).toEqual(upsert.rows);
  });

  it('new days first (stored rows not read yet), then repeats of stored rows: still the upsert\'s result', async () => {
    const stored = signals(21, 2000);
    const base = write(dir, 'base-late.csv', stored);
    const later = Array.from({ length: 2 * SIGNAL_BATCH + 5 }, (_, i) => `r${i % 30},b${i % 40},view,1,${1_800_000_000 + i}`);
    // The stored rows again, every value bumped by one, some twice: repeats of stored rows, after the new days.
    const again = stored.trim().split('\n').slice(1).map((l) => l.replace(/,(\d),/, (_m, v: string) => `,${Number(v) + 1},`));
    const extra = write(dir, 'extra-late.csv', ['customer,item,kind,value,at', ...later, ...again, ...again.slice(0, 300)].join('\n') + '\n');
    const upsert = await appended('late', base, extra, 'upsert');
    const rebuild = await appended('late', base, extra, 'rebuild');
    expect(counts(rebuild.report)).toEqual(counts(upsert.report));
    expect(rebuild.report.updated).toBeGreaterThan(1000);
    expect(rebuild.rows).toEqual(upsert.rows);
  });

  it('a time-ordered log with repeats inside runs of equal times, a run longer than the group, then disorder', async () => {
    const base = write(dir, 'base-ordered.csv', signals(31, 1500));
    const rng = seededRng(32);
    const lines = ['customer,item,kind,value,at'];
    // Runs of 1-4 rows per second over few identities, so repeats fall inside a run (the ordered mode's group).
    for (let t = 0; t < 3000; t++) for (let k = rng.int(4); k >= 0; k--) lines.push(`r${rng.int(3)},b${rng.int(3)},view,${rng.int(3)},${1_800_000_000 + t}`);
    // One second holding 100 distinct identities and repeats of them: longer than the group (64).
    for (let k = 0; k < 130; k++) lines.push(`r${k % 30},b${Math.floor((k % 100) / 30)},click,${k % 4},1800005000`);
    for (let t = 0; t < 500; t++) lines.push(`r${rng.int(30)},b${rng.int(40)},rating,${rng.int(3)},${1_800_006_000 + t}`);
    lines.push('r1,b1,view,2,1800000001'); // back in time: a repeat of an earlier row of the file
    const extra = write(dir, 'extra-ordered.csv', lines.join('\n') + '\n');
    const upsert = await appended('ordered', base, extra, 'upsert');
    const rebuild = await appended('ordered', base, extra, 'rebuild');
    expect(counts(rebuild.report)).toEqual(counts(upsert.report));
    expect(rebuild.report.updated).toBeGreaterThan(100);
    expect(rebuild.rows).toEqual(upsert.rows);
    // Ordered to the end (no run too long, no disorder): the group alone resolves the repeats.
    const sorted = write(dir, 'extra-sorted.csv', lines.slice(0, 2000).join('\n') + '\n');
    const a = await appended('sorted', base, sorted, 'upsert');
    const b = await appended('sorted', base, sorted, 'rebuild');
    expect(counts(b.report)).toEqual(counts(a.report));
    expect(b.report.updated).toBeGreaterThan(50);
    expect(b.rows).toEqual(a.rows);
  });

  it('rolls back everything, the dropped index included, when a row is rejected', async () => {
    const db = freshWorkspace(dir, 'rejected.shelf');
    await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS) });
    await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS) });
    await importFile(db, { target: 'signals', file: write(dir, 'base-r.csv', signals(5, 200)) });
    const before = snapshot(db);
    const bad = signals(6, 500) + 'r1,b999,view,1,\n';
    const r = await runImport(db, { target: 'signals', file: write(dir, 'bad-append.csv', bad), appendPath: 'rebuild' });
    expect(r.committed).toBe(false);
    expect(snapshot(db)).toEqual(before);
  });

  it('is the path taken by default when the file is large against the table', async () => {
    const db = freshWorkspace(dir, 'default.shelf');
    await importFile(db, { target: 'items', file: write(dir, 'items.csv', ITEMS) });
    await importFile(db, { target: 'customers', file: write(dir, 'customers.csv', CUSTOMERS) });
    await importFile(db, { target: 'signals', file: write(dir, 'base-d.csv', signals(8, 100)) });
    // Watch for the index being dropped: the rebuild path's mark inside the import's transaction.
    const dropped: string[] = [];
    const exec = db.exec.bind(db);
    db.exec = (sql: string) => {
      if (/^DROP INDEX/.test(sql)) dropped.push(sql);
      return exec(sql);
    };
    await runImport(db, { target: 'signals', file: write(dir, 'small.csv', signals(9, 20)) });
    expect(dropped).toEqual([]);
    await runImport(db, { target: 'signals', file: write(dir, 'large.csv', signals(10, 400)) });
    expect(dropped).toEqual(['DROP INDEX IF EXISTS signal_identity']);
  });
});

describe('SignalIdentityTable', () => {
  it('finds what it holds across growth and rehashing, keys a missing time as -1, and lists changed values', () => {
    const t = new SignalIdentityTable(4);
    const rng = seededRng(3);
    const reference = new Map<string, number>(); // the obvious reference: a Map keyed by the joined key
    for (let i = 0; i < 20_000; i++) {
      const key = [rng.int(50), rng.int(60), rng.int(7), rng.int(5) === 0 ? Number.NaN : 1e12 + rng.int(100)] as const;
      const e = t.find(...key);
      const name = `${key[0]}|${key[1]}|${key[2]}|${key[3] === key[3] ? key[3] : -1}`;
      expect(e >= 0).toBe(reference.has(name));
      if (e < 0) {
        t.add(...key, reference.size + 1, i);
        reference.set(name, reference.size + 1);
      } else {
        expect(t.rowId(e)).toBe(reference.get(name));
        t.setValue(e, i);
      }
    }
    expect(t.size).toBe(reference.size);
    if (t.find(99, 2, 3, Number.NaN) < 0) t.add(99, 2, 3, Number.NaN, 123_456, 1);
    expect(t.rowId(t.find(99, 2, 3, -1))).toBe(123_456); // the index's ifnull(at, -1)
    let changed = 0;
    t.eachChanged(() => changed++);
    expect(changed).toBeGreaterThan(0);
    expect(changed).toBeLessThanOrEqual(t.size);
  });
});
