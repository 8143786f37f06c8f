import { describe, expect, it } from 'vitest';
import { seededRng } from '../../src-main/core/rng.ts';
import { DAY_MS, SIGNAL_KIND_CODE, type Dataset, type Item } from '../../src-main/core/types.ts';
import { tuneDataset } from '../../src-main/services/tune/tune.ts';

/**
 * The synthetic shop of test/tune/recency-search.test.ts (6 taste clusters × 20 items, every customer likes two
 * clusters A and B, 16 purchases at uniform random days over two years), with two changes so that popularity and
 * content have something to find: each item is tagged with its cluster (content's text), and under `drift` the
 * items in fashion rotate (within a cluster, the purchase falls on one of 4 items of a window that moves on every
 * 73 days), besides each customer's turn from A to B. Stationary: cluster and item uniform whatever the day, so
 * age says nothing. Seeded, deterministic.
 */
function shop(drift: boolean, seed: number, timed = true): Dataset {
  const rng = seededRng(seed);
  const clusters = 6;
  const per = 20;
  const customers = 500;
  const rows: [number, number, number][] = [];
  for (let u = 0; u < customers; u++) {
    const a = rng.int(clusters);
    const b = (a + 1 + rng.int(clusters - 1)) % clusters;
    const turn = 180 + rng.int(365);
    for (let s = 0; s < 16; s++) {
      const day = rng.int(730);
      const cluster = drift ? (day < turn ? a : b) : rng.next() < 0.5 ? a : b;
      const item = drift ? (Math.floor(day / 73) * 2 + rng.int(4)) % per : rng.int(per);
      rows.push([u, cluster * per + item, day]);
    }
  }
  return {
    items: Array.from({ length: clusters * per }, (_, i) => ({ id: i + 1, title: `item ${i}`, description: '', tags: [`cluster${Math.floor(i / per)}`], category: '', supplier: '', price: null, addedAt: null }) as unknown as Item),
    customerIds: Int32Array.from({ length: customers }, (_, i) => i + 1),
    customerExternalIds: Array.from({ length: customers }, (_, i) => `c${i}`),
    signals: {
      length: rows.length,
      customer: Int32Array.from(rows, (r) => r[0]),
      item: Int32Array.from(rows, (r) => r[1]),
      kind: new Uint8Array(rows.length).fill(SIGNAL_KIND_CODE.purchase),
      value: new Float32Array(rows.length).fill(1),
      at: Float64Array.from(rows, (r) => (timed ? Date.UTC(2024, 0, 1) + r[2] * DAY_MS : Number.NaN)),
    },
  };
}

// The default budget (3 plain fits): the half-lives must be found within what `train` spends; iALS (not under
// test) at 2 sweeps.
const opts = { k: 10, seed: 2, iterations: 2, threads: 1, sampleCustomers: 300, popularityHalfLife: true } as const;

async function chosen(drift: boolean, seeds: number[]) {
  const out: { popularity: unknown; content: unknown }[] = [];
  for (const seed of seeds) {
    const r = await tuneDataset(shop(drift, seed), opts);
    const pop = r.halfLives.find((h) => h.model === 'popularity')!;
    const content = r.halfLives.find((h) => h.model === 'content')!;
    // Both start at off, and training is given what was chosen.
    expect(pop.trials[0]!.halfLife).toBe('off');
    expect(content.trials[0]!.halfLife).toBe('off');
    expect(r.params.popularity).toEqual({ fitHalfLifeDays: pop.best });
    expect(r.params.content).toEqual({ profileHalfLifeDays: content.best });
    // The searches spent from the budget: within it, all told.
    expect(r.budget.spentMs).toBeLessThanOrEqual(r.budget.plainFits * r.budget.plainMs + 1e-6);
    out.push({ popularity: pop.best, content: content.best });
  }
  return out;
}

describe('popularity and content half-lives in tuning', () => {
  it('keep off on a stationary log (age says nothing) and find a half-life on a drifting one', async () => {
    const seeds = [1, 2, 3, 4];
    const still = await chosen(false, seeds);
    const moving = await chosen(true, seeds);
    // Stationary: leaving off needs a paired gain of two standard errors, which chance gives rarely (≤ 1 of 8).
    const offStill = still.flatMap((c) => [c.popularity, c.content]).filter((h) => h === null).length;
    expect(offStill).toBeGreaterThanOrEqual(7);
    // Drifting: both sides find a half-life on every log.
    for (const c of moving) {
      expect(typeof c.popularity).toBe('number');
      expect(typeof c.content).toBe('number');
    }
  }, 240_000);

  it('searches only content by default (popularity on request: grid.ts POPULARITY_HALF_LIFE_SEARCHED)', async () => {
    const { popularityHalfLife: _, ...byDefault } = opts;
    const r = await tuneDataset(shop(true, 1), byDefault);
    expect(r.halfLives.map((h) => h.model)).toEqual(['content']);
    expect(r.params.popularity).toBeUndefined();
    expect(typeof r.params.content?.profileHalfLifeDays).toBe('number');
  }, 60_000);

  it('leaves both axes out on a log without times', async () => {
    const r = await tuneDataset(shop(true, 1, false), opts);
    expect(r.halfLives).toEqual([]);
    expect(r.params.popularity).toBeUndefined();
    expect(r.params.content).toBeUndefined();
  }, 60_000);
});
