import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { getWorkspaceStats } from '../../src-main/services/stats.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-stats-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('workspaceStats on a small hand-built workspace', () => {
  it('counts, ranges, density, kinds, top categories, long tail and cold items', () => {
    const db = openWorkspace(path.join(dir, 's.shelf'));
    expect(getWorkspaceStats(db)).toMatchObject({ items: 0, signals: 0, density: 0, longTailShare: null, lastImportAt: null, firstSignalAt: null });
    // 10 items: 6 fiction, 3 maps, 1 poetry; item 1 promoted; item 10 unavailable.
    const cat = ['fiction', 'fiction', 'fiction', 'fiction', 'fiction', 'fiction', 'maps', 'maps', 'maps', 'poetry'];
    const addItem = db.prepare('INSERT INTO item (external_id, title, category, promoted, available) VALUES (?, ?, ?, ?, ?)');
    cat.forEach((c, i) => addItem.run(`b${i + 1}`, `Title ${i + 1}`, c, i === 0 ? 1 : 0, i === 9 ? 0 : 1));
    const addCustomer = db.prepare('INSERT INTO customer (external_id) VALUES (?)');
    for (const c of ['r1', 'r2', 'r3', 'r4']) addCustomer.run(c);
    // 20 signals: item 7 (maps) gets 8, item 8 (maps) gets 4, items 1-4 get 2 each; items 5, 6, 9, 10 none.
    const addSignal = db.prepare('INSERT INTO signal (customer_id, item_id, kind, at) VALUES (?, ?, (SELECT code FROM signal_kind WHERE name = ?), ?)');
    let t = 1_000;
    const give = (item: number, n: number, kind: string) => {
      for (let k = 0; k < n; k++) addSignal.run(1 + (k % 4), item, kind, (t += 1000));
    };
    give(7, 8, 'view');
    give(8, 4, 'purchase');
    for (const i of [1, 2, 3, 4]) give(i, 2, 'read');
    db.prepare("INSERT INTO import_log (at, target, file, report) VALUES (42, 'signals', 'x.csv', '{}'), (77, 'items', 'y.csv', '{}')").run();

    const s = getWorkspaceStats(db);
    expect(s).toMatchObject({ items: 10, customers: 4, signals: 20, availableItems: 9, promotedItems: 1, coldItems: 4, lastImportAt: 77 });
    expect(s.firstSignalAt).toBe(2_000);
    expect(s.lastSignalAt).toBe(21_000);
    expect(s.density).toBeCloseTo(20 / (4 * 10), 12);
    expect(s.signalsByKind).toEqual({ purchase: 4, read: 8, view: 8 });
    expect(s.topCategoriesByItems).toEqual([{ category: 'fiction', items: 6 }, { category: 'maps', items: 3 }, { category: 'poetry', items: 1 }]);
    expect(s.topCategoriesBySignals).toEqual([{ category: 'maps', signals: 12 }, { category: 'fiction', signals: 8 }]);
    // Head = ceil(20% of 10) = 2 items: item 7 (8) and item 8 (4) hold 12 of 20 signals; the tail holds 8/20.
    expect(s.longTailShare).toBeCloseTo(8 / 20, 12);
    db.close();
  });
});
