import { describe, expect, it } from 'vitest';
import type { Dataset } from '../../src-main/core/types.ts';
import { tuneDataset } from '../../src-main/services/tune/tune.ts';
import { driftShop } from './drift-shop.ts';

/** The recency search's synthetic shop (drift-shop.ts) with fashion and cluster tags. */
function shop(drift: boolean, seed: number, timed = true): Dataset {
  return driftShop({ drift, seed, timed, fashion: true, tagged: true });
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
