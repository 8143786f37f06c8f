import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import type { Csr } from '../../src-main/core/matrix/csr.ts';
import { checkHalfLife, decayedValue, recencyWeight, transformMatrix } from '../../src-main/core/matrix/values.ts';
import { DAY_MS } from '../../src-main/core/types.ts';
import { dataset, type Sig } from './sig-dataset.ts';

/** The matrix without its ages (as built from a log without times). */
const withoutAges = ({ ageDays: _, ...rest }: Csr): Csr => rest;

/** The age of entry (u, i), or undefined when the pair has no entry. */
function ageOf(m: Csr, u: number, i: number): number | undefined {
  for (let p = m.indptr[u]!; p < m.indptr[u + 1]!; p++) if (m.indices[p] === i) return m.ageDays![p];
  return undefined;
}

describe('interaction matrix ages (build.ts ageDays)', () => {
  const ds = dataset(3, 4, [
    [0, 2, 'view', 1, 10],
    [0, 1, 'purchase', 1, 4],
    [0, 2, 'view', 1, 16], // (0, 2) again, later: the entry's age is its latest signal's
    [1, 3, 'basket', 2, 20], // the latest signal: now = day 20
    [1, 0, 'view', 1, 12],
    [2, 0, 'click', 1, NaN], // untimed
    [2, 1, 'click', 1, 2],
    [2, 1, 'click', 1, NaN], // untimed beside a timed one: age 0 (never decayed)
  ]);

  it('is the days between the pair\'s latest signal and the latest signal used; untimed signals are age 0', () => {
    const m = buildInteractionMatrix(ds);
    expect(m.ageDays).toBeInstanceOf(Float32Array);
    expect(m.ageDays!.length).toBe(m.data.length);
    expect(ageOf(m, 0, 2)).toBe(4); // 20 − 16, not 20 − 10
    expect(ageOf(m, 0, 1)).toBe(16);
    expect(ageOf(m, 1, 3)).toBe(0);
    expect(ageOf(m, 1, 0)).toBe(8);
    expect(ageOf(m, 2, 0)).toBe(0);
    expect(ageOf(m, 2, 1)).toBe(0);
    // The values are as without ages (sums of weighted signals).
    expect(Array.from(m.data)).toEqual(Array.from(buildInteractionMatrix({ ...ds, signals: { ...ds.signals, at: ds.signals.at.map(() => NaN) } }).data));
  });

  it('counts from the latest signal of the rows used (never the clock), or from `now` when given', () => {
    const firstFive = buildInteractionMatrix(ds, { rows: Int32Array.of(0, 1, 2, 4) }); // latest: day 16
    expect(ageOf(firstFive, 0, 2)).toBe(0);
    expect(ageOf(firstFive, 0, 1)).toBe(12);
    expect(ageOf(firstFive, 1, 0)).toBe(4);
    const at30 = buildInteractionMatrix(ds, { now: 30 * DAY_MS });
    expect(ageOf(at30, 1, 3)).toBe(10);
  });

  it('has no age array when no signal used has a time', () => {
    const untimed = dataset(2, 2, [
      [0, 0, 'view', 1, NaN],
      [1, 1, 'view', 1, NaN],
    ]);
    expect(buildInteractionMatrix(untimed).ageDays).toBeUndefined();
    expect(buildInteractionMatrix(ds, { rows: Int32Array.of(5) }).ageDays).toBeUndefined();
  });

  it('matches a direct computation on random logs (latest signal per pair, duplicates and untimed ones included)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: 5 }), fc.option(fc.integer({ min: 0, max: 400 }), { nil: undefined })), {
          minLength: 1,
          maxLength: 60,
        }),
        (rows) => {
          const d = dataset(5, 6, rows.map(([c, i, day]) => [c, i, 'view', 1, day ?? NaN] as Sig));
          const m = buildInteractionMatrix(d);
          const days = rows.map((r) => r[2]).filter((x): x is number => x !== undefined);
          if (days.length === 0) return m.ageDays === undefined;
          const now = Math.max(...days);
          for (let u = 0; u < 5; u++) {
            for (let i = 0; i < 6; i++) {
              const mine = rows.filter((r) => r[0] === u && r[1] === i);
              if (mine.length === 0) continue;
              const expected = Math.min(...mine.map((r) => (r[2] === undefined ? 0 : now - r[2])));
              if (ageOf(m, u, i) !== expected) return false;
            }
          }
          return true;
        },
      ),
      { seed: 7, numRuns: 200 },
    );
  });
});

describe('recency weight (values.ts)', () => {
  it('is the half-life law 2^(−t/h): ½ after one half-life, ¼ after two, 1 at age 0', () => {
    // Source: the exponential-decay law with half-life t½, N(t) = N₀ · 2^(−t / t½) = N₀ · e^(−t·ln 2 / t½) (IUPAC
    // Gold Book, "half-life"), the form of time weight Ding & Li (2005), "Time weight collaborative filtering",
    // CIKM, parametrise by a half-life.
    expect(recencyWeight(30, 30)).toBe(0.5);
    expect(recencyWeight(60, 30)).toBe(0.25);
    expect(recencyWeight(0, 30)).toBe(1);
    expect(recencyWeight(45, 90)).toBeCloseTo(Math.exp((-Math.LN2 / 90) * 45), 15);
    expect(recencyWeight(1000, null)).toBe(1);
  });

  it('multiplies the transformed value, entry by entry; matrices without ages are left as they were', () => {
    const m: Csr = {
      rows: 1,
      cols: 3,
      indptr: Int32Array.of(0, 3),
      indices: Int32Array.of(0, 1, 2),
      data: Float32Array.of(3, 1, 7),
      ageDays: Float32Array.of(0, 90, 180),
    };
    // By hand: presence 1 × 2^0, 1 × 2^(−1), 1 × 2^(−2); log(1 + 7) × ¼ for the third under log.
    expect(Array.from(transformMatrix(m, 'presence', 90).data)).toEqual([1, 0.5, 0.25]);
    expect(decayedValue(m, 2, 'log', 90)).toBeCloseTo(Math.log(8) / 4, 12);
    expect(Array.from(transformMatrix(m, 'linear', 90).data)).toEqual([3, 0.5, 1.75]);
    expect(transformMatrix(m, 'linear', null)).toBe(m);
    const noAges = withoutAges(m);
    expect(Array.from(transformMatrix(noAges, 'presence', 90).data)).toEqual([1, 1, 1]);
  });

  it('refuses half-lives that are not a number of days > 0, naming the field', () => {
    expect(checkHalfLife(undefined, 'x')).toBeNull();
    expect(checkHalfLife(null, 'x')).toBeNull();
    expect(checkHalfLife(30, 'x')).toBe(30);
    for (const bad of [0, -5, Number.NaN, Number.POSITIVE_INFINITY, '30']) {
      expect(() => checkHalfLife(bad, 'EASE fitHalfLifeDays')).toThrow(/EASE fitHalfLifeDays must be a number of days > 0/);
    }
  });
});
