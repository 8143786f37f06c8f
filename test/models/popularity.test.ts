import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import {
  decayedCounts,
  fitPopularity,
  loadPopularity,
  loadRandom,
  randomScorer,
  trendRatios,
} from '../../src-main/core/models/popularity.ts';
import { DAY_MS, type Dataset, type Item } from '../../src-main/core/types.ts';
import { describeScorerContract, plantedBlocks } from './contract.ts';

describeScorerContract('popularity', () => {
  const p = plantedBlocks();
  return { ...p, scorer: fitPopularity(p.history).model, load: loadPopularity };
});

describeScorerContract('random baseline', () => {
  const p = plantedBlocks();
  return { ...p, scorer: randomScorer(42, p.history.cols), load: loadRandom, planted: false };
});

/** A dataset of one customer's signals on `nItems` items at the given (item, day) pairs. */
function dataset(nItems: number, signals: [item: number, day: number][]): Dataset {
  const items = Array.from({ length: nItems }, (_, i) => ({ id: i }) as Item);
  const n = signals.length;
  return {
    items,
    customerIds: Int32Array.of(1),
    customerExternalIds: ['c1'],
    signals: {
      length: n,
      customer: new Int32Array(n),
      item: Int32Array.from(signals.map((s) => s[0])),
      kind: new Uint8Array(n),
      value: new Float32Array(n).fill(1),
      at: Float64Array.from(signals.map((s) => (Number.isNaN(s[1]) ? NaN : s[1] * DAY_MS))),
    },
  };
}

describe('decayedCounts', () => {
  it('halves a signal’s weight per half-life before now; untimed signals count fully', () => {
    const ds = dataset(3, [
      [0, 100],
      [0, 90],
      [1, 80],
      [2, NaN],
    ]);
    const c = decayedCounts(ds, { halfLifeDays: 10 });
    // now = day 100 (latest signal): 1 + 2^-1 ; 2^-2 ; 1
    expect(c[0]).toBeCloseTo(1.5, 12);
    expect(c[1]).toBeCloseTo(0.25, 12);
    expect(c[2]).toBe(1);
    expect(decayedCounts(ds, { halfLifeDays: 10, now: 110 * DAY_MS })[0]).toBeCloseTo(0.5 + 0.25, 12);
    expect(() => decayedCounts(ds, { halfLifeDays: 0 })).toThrow(/halfLifeDays/);
  });
});

describe('trendRatios', () => {
  it('is (recent + a) / (previous + b) over two windows ending at now', () => {
    // Window 14 days, now = day 28: recent [14, 28), previous [0, 14).
    const ds = dataset(3, [
      [0, 20],
      [0, 21],
      [0, 22],
      [0, 5],
      [1, 3],
      [1, 4],
      [2, 27.9],
    ]);
    const t = trendRatios(ds, { now: 28 * DAY_MS, windowDays: 14, a: 5, b: 5 });
    expect(t[0]).toBeCloseTo((3 + 5) / (1 + 5), 12);
    expect(t[1]).toBeCloseTo((0 + 5) / (2 + 5), 12);
    expect(t[2]).toBeCloseTo((1 + 5) / (0 + 5), 12);
  });

  it('gives 1 to an item without signals when a = b, and rejects b = 0', () => {
    const ds = dataset(2, [[0, 1]]);
    expect(trendRatios(ds)[1]).toBe(1);
    expect(() => trendRatios(ds, { b: 0 })).toThrow(/b > 0/);
  });
});

describe('PopularityModel', () => {
  it('ranks every customer alike by the number of customers per item (presence), whatever the quantities', () => {
    // Column 2 has the largest sum (5) but only two customers; columns 0 and 2 tie on customers.
    const x = csrFromDense(3, 3, [1, 0, 2, 0, 0, 3, 1, 1, 0]);
    const counted = fitPopularity(x).model;
    const c = new Float32Array(3);
    counted.scoreInto(0, x, c);
    expect(Array.from(c)).toEqual([2, 1, 2]);
  });

  it('ranks by column sums with linear values (decayed popularity when the matrix is built with a half-life)', () => {
    const x = csrFromDense(3, 3, [1, 0, 2, 0, 0, 3, 1, 1, 0]);
    const m = fitPopularity(x, 'linear').model;
    const a = new Float32Array(3);
    const b = new Float32Array(3);
    m.scoreInto(0, x, a);
    m.scoreInto(2, x, b);
    expect(Array.from(a)).toEqual([2, 1, 5]);
    expect(b).toEqual(a);
    expect(Array.from(m.similarItems(2, 2).items)).toEqual([0, 1]);
  });
});

describe('randomScorer', () => {
  it('is reproducible per seed and customer, and differs between customers and seeds', () => {
    const a = new Float32Array(50);
    const b = new Float32Array(50);
    randomScorer(1, 50).scoreInto(3, csrFromDense(0, 0, []), a);
    randomScorer(1, 50).scoreInto(3, csrFromDense(0, 0, []), b);
    expect(b).toEqual(a);
    randomScorer(1, 50).scoreInto(4, csrFromDense(0, 0, []), b);
    expect(b).not.toEqual(a);
    randomScorer(2, 50).scoreInto(3, csrFromDense(0, 0, []), b);
    expect(b).not.toEqual(a);
    for (const v of a) expect(v >= 0 && v < 1).toBe(true);
  });
});
