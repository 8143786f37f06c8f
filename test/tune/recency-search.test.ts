import { describe, expect, it } from 'vitest';
import type { Dataset } from '../../src-main/core/types.ts';
import { HALF_LIFE_GRID } from '../../src-main/services/tune/grid.ts';
import { tuneDataset } from '../../src-main/services/tune/tune.ts';
import { driftShop } from './drift-shop.ts';

/** The synthetic shop of drift-shop.ts: customers turn from one taste to another, or (drift false) do not. */
function shop(drift: boolean, seed: number, timed = true): Dataset {
  return driftShop({ drift, seed, timed });
}

// Budget 10: room for both recency walks beside the other axes; iALS (not under test) at 2 sweeps.
const opts = { k: 10, seed: 2, iterations: 2, threads: 1, sampleCustomers: 300, budget: 10 } as const;

/** Each model's chosen half-lives on logs of seeds 1–8 (a statistical property is checked over several draws). */
async function choices(drift: boolean): Promise<{ model: string; fit: unknown; profile: unknown; gain: number }[]> {
  const out: { model: string; fit: unknown; profile: unknown; gain: number }[] = [];
  for (let seed = 1; seed <= 8; seed++) {
    const r = await tuneDataset(shop(drift, seed), opts);
    for (const model of ['ease', 'itemknn'] as const) {
      const t = r.models.find((m) => m.model === model)!;
      expect(t.search!.axes['profileHalfLifeDays']).toEqual([...HALF_LIFE_GRID]);
      expect(t.trials[0]!.params['profileHalfLifeDays']).toBe('off');
      // What training is given: the chosen half-lives, 'off' as null.
      expect(r.params[model]).toMatchObject({
        fitHalfLifeDays: t.best['fitHalfLifeDays'] === 'off' ? null : t.best['fitHalfLifeDays'],
        profileHalfLifeDays: t.best['profileHalfLifeDays'] === 'off' ? null : t.best['profileHalfLifeDays'],
      });
      out.push({ model, fit: t.best['fitHalfLifeDays'], profile: t.best['profileHalfLifeDays'], gain: t.ndcg - t.trials[0]!.ndcg });
    }
  }
  return out;
}

describe('tuning the recency half-lives', () => {
  it('keeps them off where recency carries no information (a stationary log), but for rare chance wins', async () => {
    const c = await choices(false);
    // 8 seeds × 2 models × 2 sides = 32 choices; a decayed side must beat off by two standard errors (a paired
    // z-test at about 5%, model-search.ts SIGNIFICANT_SE), after trying several half-lives, so a few chance wins
    // are expected; at most 4 of 32 (2 on these seeds).
    const decayed = c.reduce((n, x) => n + Number(x.fit !== 'off') + Number(x.profile !== 'off'), 0);
    expect(decayed).toBeLessThanOrEqual(4);
    expect(c.filter((x) => x.fit === 'off' && x.profile === 'off').length).toBeGreaterThanOrEqual(13);
  }, 120_000);

  it('chooses a profile half-life where tastes drift, every time, and it beats off on validation', async () => {
    const c = await choices(true);
    for (const x of c) {
      expect(typeof x.profile).toBe('number');
      expect(x.profile as number).toBeLessThanOrEqual(180); // tastes turn within a year: a short half-life
      expect(x.gain).toBeGreaterThan(0);
    }
  }, 120_000);

  it('leaves the axes out, saying why, when the log has no times', async () => {
    const r = await tuneDataset(shop(true, 17, false), opts);
    expect(r.split.method).toBe('random');
    for (const model of ['ease', 'itemknn'] as const) {
      const t = r.models.find((m) => m.model === model)!;
      expect(Object.keys(t.search!.axes)).not.toContain('profileHalfLifeDays');
      expect(Object.keys(t.search!.axes)).not.toContain('fitHalfLifeDays');
      for (const x of t.trials) expect(x.params['profileHalfLifeDays']).toBeUndefined();
      expect(r.params[model]).not.toHaveProperty('profileHalfLifeDays');
    }
    expect(r.notes.map((n) => n.text).join(' ')).toMatch(/recency half-lives not searched: .*no times/);
  }, 120_000);
});
