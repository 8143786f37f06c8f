import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { orderInto } from '../../src-main/core/scoring/normalise.ts';
import { freshnessInto, minMaxInto, percentileInto } from '../../src-main/core/scoring/index.ts';
import { DAY_MS } from '../../src-main/core/types.ts';

describe('percentileInto', () => {
  // External check: scipy.stats.rankdata's documented example, rankdata([0, 2, 3, 2]) = [1, 2.5, 4, 2.5]
  // with method='average' (recalled from memory of the SciPy reference page); our mid-rank percentile
  // is (rank − 1) / (n − 1) = [0, 0.5, 1, 0.5].
  it('gives average-rank percentiles, ties sharing their mean rank (scipy rankdata "average")', () => {
    const out = new Float32Array(4);
    percentileInto(Float32Array.of(0, 2, 3, 2), 4, out, new Float64Array(4));
    expect(Array.from(out)).toEqual([0, 0.5, 1, 0.5]);
  });
  it('ranks NaN lowest, gives a single item 1 and a constant column 0.5', () => {
    const out = new Float32Array(3);
    percentileInto(Float32Array.of(Number.NaN, 1, 2), 3, out, new Float64Array(3));
    expect(Array.from(out)).toEqual([0, 0.5, 1]);
    percentileInto(Float32Array.of(7), 1, out, new Float64Array(1));
    expect(out[0]).toBe(1);
    percentileInto(Float32Array.of(4, 4, 4), 3, out, new Float64Array(3));
    expect(Array.from(out)).toEqual([0.5, 0.5, 0.5]);
  });
});

describe('packed-key sorting', () => {
  // Property: the comparator-free sort agrees with a plain definition — percentile = (number below +
  // (number equal − 1) / 2) / (n − 1), and the order = comparator sort by value desc, then position.
  it('agrees with the definitions on random values with ties, negatives and −0 (fast-check)', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom(-2.5, -1, -0, 0, 0.125, 1, 3e9, -Infinity, Infinity), { minLength: 2, maxLength: 40 }), (xs) => {
        const v = Float32Array.from(xs);
        const n = v.length;
        const out = new Float32Array(n);
        percentileInto(v, n, out, new Float64Array(n));
        for (let p = 0; p < n; p++) {
          let below = 0;
          let equal = 0;
          for (let q = 0; q < n; q++) {
            if (v[q]! < v[p]!) below++;
            else if (v[q] === v[p]) equal++;
          }
          expect(out[p]).toBeCloseTo((below + (equal - 1) / 2) / (n - 1), 6);
        }
        const order = new Int32Array(n);
        orderInto(v, n, order, new Float64Array(n), true);
        const ref = Array.from({ length: n }, (_, p) => p).sort((a, b) => (v[b]! > v[a]! ? 1 : v[b]! < v[a]! ? -1 : a - b));
        expect(Array.from(order)).toEqual(ref);
      }),
    );
  });
});

describe('minMaxInto', () => {
  it('maps to [0, 1] and a constant column to 0', () => {
    const out = new Float32Array(3);
    minMaxInto(Float32Array.of(2, 4, 3), 3, out);
    expect(Array.from(out)).toEqual([0, 1, 0.5]);
    minMaxInto(Float32Array.of(5, 5, 5), 3, out);
    expect(Array.from(out)).toEqual([0, 0, 0]);
  });
});

describe('freshnessInto', () => {
  // Definition of a half-life: after one half-life the value halves, after two it quarters.
  it('halves per half-life, counts future items as new and unknown dates as 0', () => {
    const ed = Date.UTC(2026, 5, 1);
    const out = new Float32Array(5);
    freshnessInto(Float64Array.of(ed, ed - 30 * DAY_MS, ed - 60 * DAY_MS, ed + DAY_MS, Number.NaN), ed, 30, out);
    expect(out[0]).toBe(1);
    expect(out[1]).toBeCloseTo(0.5, 6);
    expect(out[2]).toBeCloseTo(0.25, 6);
    expect(out[3]).toBe(1);
    expect(out[4]).toBe(0);
    expect(() => freshnessInto(Float64Array.of(ed), ed, 0, out)).toThrow(/half-life/);
  });
});
