import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import type { Brief } from '../../src-main/core/curation/types.ts';
import { COMPONENTS } from '../../src-main/core/scoring/index.ts';
import { importFile } from '../../src-main/services/import.ts';
import { propose } from '../../src-main/services/propose.ts';
import { ItemRepo } from '../../src-main/store/items.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

let dir: string;
let db: Db;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-propose-'));
  const shop = await generateDemoShop({ seed: 3, items: 200, customers: 800, signals: 15_000, outDir: dir });
  db = openWorkspace(path.join(dir, 'w.sqlite'));
  for (const target of ['items', 'customers', 'signals'] as const) await importFile(db, { target, file: shop.files[target] });
});

afterAll(() => {
  db?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

function brief(anchors: number[], weights: Partial<Brief['weights']> = {}): Brief {
  return {
    size: 8,
    anchors,
    audience: { kind: 'everyone' },
    include: { categories: [], tags: [], suppliers: [] },
    exclude: { categories: [], tags: [], suppliers: [] },
    priceBand: {},
    weights: { content: 1, collaborative: 1, audience: 1, popularity: 0.5, trend: 0.25, freshness: 0.25, ...weights },
    lambda: 0.7,
    rules: { quotas: [], promoted: {}, restPeriod: 0, allowRepeatInEdition: false },
  };
}

describe('propose', () => {
  const editionDate = Date.UTC(2026, 11, 1);

  it('ranks the pool best first with percentiles, contributions and anchor evidence', () => {
    const items = new ItemRepo(db).all();
    const anchor = items[10]!.id;
    const r = propose(db, brief([anchor]), { editionDate, n: 20 });
    expect(r.items).toHaveLength(20);
    expect(r.poolSize).toBeGreaterThan(20);
    for (let q = 1; q < r.items.length; q++) expect(r.items[q]!.score).toBeLessThanOrEqual(r.items[q - 1]!.score);
    expect(r.items[0]!.percentile).toBe(100);
    for (const it of r.items) {
      const sum = COMPONENTS.reduce((s, c) => s + it.contributions[c], 0);
      expect(it.blended).toBeCloseTo(sum, 5);
      for (const e of [...it.evidence.content, ...(it.coldStart ? [] : it.evidence.collaborative)]) expect(e.itemId).toBe(anchor);
    }
    // Ranks count the candidates scoring higher, so the twenty best read 1, 2, 3... where their percentiles
    // all round to the top 1% of the pool; a reason names the anchor only when it is this brief's anchor.
    for (let q = 0; q < r.items.length; q++) {
      const higher = r.items.filter((x) => x.score > r.items[q]!.score).length;
      expect(r.items[q]!.rank).toBe(1 + higher);
    }
    const anchorExt = items[10]!.externalId;
    for (const it of r.items) if (it.reason?.kind === 'anchor') expect(it.reason.anchor.item).toBe(anchorExt);
    expect(r.items.some((x) => x.reason !== null)).toBe(true);
    // An audience reason names items and head counts the store confirms: distinct customers with that kind of
    // signal on the item (the audience here is every customer).
    const wide = propose(db, brief([], { content: 0, collaborative: 0, audience: 1, popularity: 0, trend: 0, freshness: 0 }), { editionDate, n: 10 });
    const said = wide.items.flatMap((x) => (x.reason?.kind === 'audience' ? [x.reason] : []));
    expect(said.length).toBeGreaterThan(0);
    const held = db.prepare(
      `SELECT count(DISTINCT s.customer_id) AS n FROM signal s JOIN item i ON i.id = s.item_id
       WHERE i.external_id = ? AND s.kind = (SELECT code FROM signal_kind WHERE name = ?)`,
    );
    for (const reason of said) {
      expect(reason.everyone).toBe(true);
      for (const h of reason.held) expect((held.get(h.item, h.did) as { n: number }).n).toBe(h.people);
    }
    // No trained models in this workspace: content and item-kNN are fitted in memory, and it says so.
    expect(r.notes.join(' ')).toMatch(/fitted in memory/);
    expect(r.available.content && r.available.collaborative && r.available.audience).toBe(true);
    expect(r.audience.customers).toBe(800);
  });

  it('puts a boosted item first when only its multiplier differs', () => {
    const items = new ItemRepo(db).all();
    const plain = propose(db, brief([items[10]!.id]), { editionDate, n: 200 });
    const last = plain.items[plain.items.length - 1]!;
    const boosted = propose(db, brief([items[10]!.id]), { editionDate, n: 5, multipliers: new Map([[last.itemId, 1000]]) });
    expect(boosted.items[0]!.itemId).toBe(last.itemId);
  });

  it('names an unknown anchor and a bad n', () => {
    expect(() => propose(db, brief([987654]), { editionDate })).toThrow(/anchor item 987654 is not in the catalogue/);
    expect(() => propose(db, brief([]), { editionDate, n: 0 })).toThrow(/n must be a whole number/);
  });
});
