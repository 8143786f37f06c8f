import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { seededRng } from '../../src-main/core/rng.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

/**
 * A small workspace on disk: `items` items in 3 categories, `customers` customers, and per customer a few
 * views and purchases, mostly inside one category (so the models have structure to find).
 */
export function smallWorkspace(opts: { items?: number; customers?: number; seed?: number } = {}): { file: string; db: Db; dir: string } {
  const items = opts.items ?? 30;
  const customers = opts.customers ?? 60;
  const rng = seededRng(opts.seed ?? 1);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-models-'));
  const file = path.join(dir, 'shop.sqlite');
  const db = openWorkspace(file);
  db.transaction(() => {
    const item = db.prepare('INSERT INTO item (id, external_id, title, description, category, tags, supplier, price, added_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)');
    const cats = ['garden', 'kitchen', 'reading'];
    for (let i = 1; i <= items; i++) {
      const cat = cats[i % 3]!;
      item.run(i, `it-${i}`, `${cat} thing ${i}`, `a sturdy ${cat} thing, model ${i}`, cat, JSON.stringify([cat, `t${i % 5}`]), `maker-${i % 4}`, 5 + i, 1_700_000_000_000 + i * 86_400_000);
    }
    const cust = db.prepare('INSERT INTO customer (id, external_id) VALUES (?, ?)');
    const sig = db.prepare('INSERT OR IGNORE INTO signal (customer_id, item_id, kind, value, at) VALUES (?, ?, (SELECT code FROM signal_kind WHERE name = ?), 1, ?)');
    for (let c = 1; c <= customers; c++) {
      cust.run(c, `cu-${c}`);
      const home = c % 3;
      for (let s = 0; s < 8; s++) {
        const inHome = rng.next() < 0.85;
        let i = 1 + rng.int(items);
        if (inHome) while (i % 3 !== home) i = 1 + rng.int(items);
        sig.run(c, i, rng.next() < 0.3 ? 'purchase' : 'view', 1_710_000_000_000 + (c * 8 + s) * 3_600_000);
      }
    }
  })();
  return { file, db, dir };
}
