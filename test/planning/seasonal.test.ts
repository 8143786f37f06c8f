import { describe, expect, it } from 'vitest';
import { forecastError, forecastSeasonalNaive, mase, seasonalIndex, seasonOf, weeklySeries } from '../../src-main/core/planning/seasonal.ts';
import { fitAt, seasonalProfile } from '../../src-main/core/planning/seasonal-fit.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { DAY_MS } from '../../src-main/core/types.ts';

/** Poisson draw by inversion (Knuth, TAOCP vol. 2, 3.4.1). */
function poisson(rng: { next(): number }, lambda: number): number {
  const l = Math.exp(-lambda);
  let k = 0;
  let p = 1;
  do {
    k++;
    p *= rng.next();
  } while (p > l);
  return k - 1;
}

describe('MASE', () => {
  it('scales the forecast error by the in-sample one-step naive error (Hyndman & Koehler 2006, eq. for q_t)', () => {
    // In-sample 1 3 2 4: naive errors 2 1 2, scale 5/3. Held out 3 5 forecast 2 2: MAE 2. MASE = 2 / (5/3) = 1.2.
    expect(mase([3, 5], [2, 2], [1, 3, 2, 4])).toBeCloseTo(1.2, 12);
    // A flat history has no naive error to scale by: NaN, never a division by zero.
    expect(mase([1], [0], [2, 2, 2])).toBeNaN();
  });
});

describe('week of year', () => {
  it('counts 7-day weeks from 1 January and folds the last partial week into week 52', () => {
    expect(seasonOf(Date.UTC(2025, 0, 1))).toBe(0);
    expect(seasonOf(Date.UTC(2025, 0, 8))).toBe(1);
    expect(seasonOf(Date.UTC(2024, 11, 31))).toBe(51); // leap year, day 366
  });
});

describe('the smoothed seasonal index', () => {
  // Two years and a quarter of weekly demand with a summer peak (level 20, amplitude 0.6), Poisson noise.
  const origin = Date.UTC(2024, 0, 1);
  const weeks = 104 + 12;
  const shape = (w: number) => 1 + 0.6 * Math.cos((2 * Math.PI * (seasonOf(origin + w * 7 * DAY_MS + 3 * DAY_MS) - 26)) / 52);
  const series = (seed: number) => {
    const rng = seededRng(seed);
    const item: number[] = [];
    const at: number[] = [];
    for (let w = 0; w < weeks; w++) {
      const n = poisson(rng, 20 * shape(w));
      for (let k = 0; k < n; k++) {
        item.push(0);
        at.push(origin + w * 7 * DAY_MS + ((k * 3600_000) % (6 * DAY_MS)));
      }
    }
    return weeklySeries(Int32Array.from(item), Float64Array.from(at), new Int32Array([0]), 1, origin, weeks);
  };

  it('recovers a known seasonal shape', () => {
    const s = series(1);
    const index = seasonalIndex(s, 104);
    // Summer (week 26) near 1.6, winter (week 0) near 0.4: the shape the data was drawn from.
    expect(index[26]!).toBeGreaterThan(1.4);
    expect(index[0]!).toBeLessThan(0.6);
  });

  it('beats seasonal naive on held-out weeks of noisy seasonal demand (MASE, Hyndman & Koehler 2006)', () => {
    // Seasonal naive copies last year's noise; the index averages two years and the neighbouring weeks.
    let ours = 0;
    let naive = 0;
    for (let seed = 1; seed <= 10; seed++) {
      const s = series(seed);
      const e = forecastError(s, seasonalIndex(s, weeks - 12), [0], 12);
      expect(e.series).toBe(1);
      ours += e.mase;
      naive += e.baselineMase;
    }
    expect(ours / 10).toBeLessThan(naive / 10);
  });

  it('seasonal naive is the same week a year before, NaN where the history does not reach', () => {
    const s = series(3);
    const f = forecastSeasonalNaive(s, 0, 104, 12);
    expect(f[0]).toBe(s.y[104 - 52]);
    expect(Number.isNaN(forecastSeasonalNaive(s, 0, 40, 2)[0]!)).toBe(true);
  });
});

describe('the seasonal profile of a shop', () => {
  it('shrinks a sparse item towards its category and reports both errors', () => {
    // Category 0: a busy summer item 0 and a sparse item 1 with two winter signals; category 1: flat item 2.
    const rng = seededRng(5);
    const origin = Date.UTC(2024, 0, 1);
    const item: number[] = [];
    const at: number[] = [];
    for (let w = 0; w < 116; w++) {
      const t = origin + w * 7 * DAY_MS + DAY_MS;
      const summer = 1 + 0.8 * Math.cos((2 * Math.PI * (seasonOf(t) - 26)) / 52);
      for (let k = poisson(rng, 15 * summer); k > 0; k--) {
        item.push(0);
        at.push(t);
      }
      for (let k = poisson(rng, 10); k > 0; k--) {
        item.push(2);
        at.push(t);
      }
    }
    item.push(1, 1);
    at.push(origin + DAY_MS, origin + 8 * DAY_MS);
    const p = seasonalProfile({ item: Int32Array.from(item), at: Float64Array.from(at), category: new Int32Array([0, 0, 1]), categories: 2 });
    // Two winter signals alone would make item 1 a winter item; its category says summer, and 2 ≪ 50 pseudo-signals.
    expect(fitAt(p, 1, Date.UTC(2025, 6, 1))).toBeGreaterThan(fitAt(p, 1, Date.UTC(2025, 0, 1)));
    expect(fitAt(p, 0, Date.UTC(2025, 6, 1))).toBeGreaterThan(1.3);
    expect(p.error?.categories.series).toBe(2);
    expect(p.error?.items.series).toBe(2);
  });
});
