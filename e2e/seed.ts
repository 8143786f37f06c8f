import type { Db } from '../src-main/store/workspace.ts';

/** Invented catalogue (project rule: invented names only). 12 items, 2 promoted; 6 customers; 30 signals. */
export const SHOP = {
  items: 12,
  customers: 6,
  signals: 30,
  titles: [
    'Lanterns of Ferrow Bay',
    'Quiet Gardens',
    'The Copper Kettle Atlas',
    'Moss and Mortar',
    'Paper Harbours',
    'A Year of Small Soups',
    'Ridgeline Notes',
    'The Glass Orchard',
    'Tin Whistle Mornings',
    'Salt Road Sketches',
    'Umber Hours',
    'Wicker and Wool',
  ],
} as const;

/**
 * Written straight through SQL: this is setup for the quick screen tests, not the thing under test.
 * Importing through the page is what journey.spec.ts does, on a fresh workspace of its own.
 */
export function seedSmallShop(db: Db): void {
  const categories = ['fiction', 'home', 'travel', 'food'];
  const suppliers = ['Brackwater Press', 'Olmsby & Tait', 'Fernhollow Books'];
  const day = 86_400_000;
  const t0 = Date.UTC(2026, 9, 1);
  db.transaction(() => {
    const item = db.prepare('INSERT INTO item (external_id, title, category, supplier, promoted, added_at) VALUES (?, ?, ?, ?, ?, ?)');
    SHOP.titles.forEach((t, i) => item.run(`i-${i + 1}`, t, categories[i % 4], suppliers[i % 3], i === 1 || i === 6 ? 1 : 0, t0 + i * day));
    const customer = db.prepare('INSERT INTO customer (external_id) VALUES (?)');
    for (let c = 1; c <= SHOP.customers; c++) customer.run(`c-${c}`);
    const signal = db.prepare('INSERT INTO signal (customer_id, item_id, kind, at) VALUES (?, ?, (SELECT code FROM signal_kind WHERE name = ?), ?)');
    for (let k = 0; k < SHOP.signals; k++) signal.run((k % 6) + 1, ((k * 5) % 12) + 1, k % 3 === 0 ? 'purchase' : 'view', t0 + (20 + k) * day);
  })();
}
