/**
 * A small invented workspace for the curation tests: 40 items in 4 categories from 5 suppliers (every
 * fifth promoted), 30 customers in three taste camps, and signals over the 120 days before 2026-03-01.
 * All names are invented. Inserted with plain SQL, as an import would leave them.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { seededRng } from '../../src-main/core/rng.ts';
import { MIGRATIONS } from '../../src-main/store/migrations/index.ts';
import { curation } from '../../src-main/store/migrations/003-curation.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

export const DAY = 86_400_000;
export const END = Date.parse('2026-03-01T00:00:00Z');
export const CATEGORIES = ['teapots', 'lanterns', 'notebooks', 'kites'];
export const SUPPLIERS = ['Brindle Works', 'Oxlip & Co', 'Quarry Lane', 'Mossgate', 'Tallow Row'];

/** The migrations up to curation, whether or not the list has been wired yet. */
export function migrations() {
  return MIGRATIONS.includes(curation) ? MIGRATIONS : [...MIGRATIONS, curation];
}

export function tempFile(name: string): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-curation-'));
  return path.join(dir, name);
}

export function seedWorkspace(db: Db, seed = 3): void {
  const rng = seededRng(seed);
  db.transaction(() => {
    const item = db.prepare(
      `INSERT INTO item (id, external_id, title, description, category, tags, supplier, price, added_at, promoted, available)
       VALUES (?, ?, ?, '', ?, ?, ?, ?, ?, ?, 1)`,
    );
    for (let i = 1; i <= 40; i++) {
      const cat = CATEGORIES[(i - 1) % 4]!;
      const tags = JSON.stringify([i % 3 === 0 ? 'gift' : 'everyday', i % 2 === 0 ? 'small' : 'large']);
      item.run(i, `SKU-${String(i).padStart(3, '0')}`, `${cat.slice(0, -1)} no. ${i}`, cat, tags, SUPPLIERS[i % 5]!, 5 + i, END - (i * 3 + 1) * DAY, i % 5 === 0 ? 1 : 0);
    }
    const customer = db.prepare('INSERT INTO customer (id, external_id) VALUES (?, ?)');
    const signal = db.prepare('INSERT OR IGNORE INTO signal (customer_id, item_id, kind, value, at) VALUES (?, ?, (SELECT code FROM signal_kind WHERE name = ?), 1, ?)');
    for (let u = 1; u <= 30; u++) {
      customer.run(u, `C-${u}`);
      const camp = u % 3; // camp c prefers category c
      for (let k = 0; k < 12; k++) {
        const fav = rng.next() < 0.8;
        const cat = fav ? camp : rng.int(4);
        const i = 1 + cat + 4 * rng.int(10);
        const at = END - (1 + rng.int(119)) * DAY;
        signal.run(u, i, rng.next() < 0.3 ? 'purchase' : 'view', at);
      }
    }
  })();
}

export function openSeeded(name = 'w.sqlite'): { db: Db; file: string } {
  const file = tempFile(name);
  const db = openWorkspace(file, { migrations: migrations() });
  seedWorkspace(db);
  return { db, file };
}
