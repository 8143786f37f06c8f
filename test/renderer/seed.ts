import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { createClient, type Client } from '../../src-renderer/client/client.ts';
import type { AppStore } from '../../src-renderer/state/store.ts';

/** Invented catalogue for renderer tests: names are made up, as the project rules ask. */
export const TITLES = ['Lanterns of Ferrow Bay', 'Quiet Gardens', 'The Copper Kettle Atlas', 'Moss and Mortar', 'Paper Harbours', 'A Year of Small Soups', 'Ridgeline Notes', 'The Glass Orchard', 'Tin Whistle Mornings', 'Salt Road Sketches', 'Umber Hours', 'Wicker and Wool'];
const CATEGORIES = ['fiction', 'home', 'travel', 'food'];
const SUPPLIERS = ['Brackwater Press', 'Olmsby & Tait', 'Fernhollow Books'];

export interface Harness {
  ctx: AppContext;
  client: Client;
  dir: string;
  file: string;
  close(): void;
}

/** A temp workspace with 12 items (2 promoted), 6 customers, 30 signals, and a client that goes through invoke(). */
export function seededHarness(): Harness {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-renderer-'));
  const file = path.join(dir, 'w.sqlite');
  const ctx = new AppContext();
  ctx.open(file, { create: true });
  const db = ctx.db;
  const day = 86_400_000;
  const t0 = Date.UTC(2026, 9, 1);
  db.transaction(() => {
    const item = db.prepare('INSERT INTO item (external_id, title, category, supplier, promoted, added_at, tags) VALUES (?, ?, ?, ?, ?, ?, ?)');
    TITLES.forEach((t, i) => item.run(`i-${i + 1}`, t, CATEGORIES[i % 4], SUPPLIERS[i % 3], i === 1 || i === 6 ? 1 : 0, t0 + i * day, '[]'));
    const customer = db.prepare('INSERT INTO customer (external_id) VALUES (?)');
    for (let c = 1; c <= 6; c++) customer.run(`c-${c}`);
    const signal = db.prepare('INSERT INTO signal (customer_id, item_id, kind, at) VALUES (?, ?, (SELECT code FROM signal_kind WHERE name = ?), ?)');
    for (let k = 0; k < 30; k++) signal.run((k % 6) + 1, ((k * 5) % 12) + 1, k % 3 === 0 ? 'purchase' : 'view', t0 + (20 + k) * day);
  })();
  const table = createHandlerTable(ctx);
  // Like Electron's main process: invoke() with its default, which takes paths (the open form is tested here).
  const client = createClient((m, p) => invoke(table, m, p), undefined, { serverPaths: true });
  return {
    ctx,
    client,
    dir,
    file,
    close() {
      ctx.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A draft edition on `date` with one shelf 'Row' of `size` slots, open in the shelf editor. */
export async function openRowInEditor(store: AppStore, date: string, size: number, edition = 'Week 49'): Promise<void> {
  await store.getState().newEdition(edition, date);
  await store.getState().addShelf('Row', { size });
  store.getState().openShelf('Row');
  store.getState().go('shelf');
}
