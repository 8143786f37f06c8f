import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { confidence } from '../../src-main/core/models/ials-params.ts';
import { IALS_GRID } from '../../src-main/services/tune/grid.ts';
import { confidenceMeans, meanConfidence, ridgeMove, snapLog } from '../../src-main/services/tune/ials-ridge.ts';
import { halfDecades } from '../../src-main/services/tune/model-search.ts';
import { coordinateSearch, type Axis, type Point } from '../../src-main/services/tune/search.ts';

const LAMBDAS = halfDecades(IALS_GRID.regularization);

/** 3 customers × 4 items; observed values 1, 3, 2, 5, 1 (the zeros are unobserved). */
const M = csrFromDense(3, 4, [1, 0, 3, 0, 0, 2, 0, 0, 5, 0, 0, 1]);

describe('confidenceMeans and meanConfidence', () => {
  it('are the mean over observed entries of Hu, Koren & Volinsky\'s (2008) confidence: linear 1 + a*r, log 1 + a*log(1 + r/e)', () => {
    // Hand computation: mean value 12/5 = 2.4; mean ln(1 + r/2) over r = 1, 3, 2, 5, 1.
    const m = confidenceMeans(M, 2);
    expect(m.linear).toBeCloseTo(2.4, 12);
    expect(m.log).toBeCloseTo((2 * Math.log(1.5) + Math.log(2.5) + Math.log(2) + Math.log(3.5)) / 5, 12);
    // The confidence is affine in the value's transform, so its mean is the confidence of the mean: checked
    // against core's confidence(), itself checked against the paper (tune.test.ts).
    for (const scaling of ['linear', 'log'] as const) {
      for (const alpha of IALS_GRID.alpha) {
        const each = [1, 3, 2, 5, 1].map((r) => confidence({ alpha, scaling, epsilon: 2 }, r));
        expect(meanConfidence(m, alpha, scaling)).toBeCloseTo(each.reduce((a, b) => a + b, 0) / each.length, 9);
      }
    }
    expect(confidenceMeans(csrFromDense(2, 2, [0, 0, 0, 0]), 1)).toEqual({ linear: 0, log: 0 });
  });
});

describe('snapLog', () => {
  it('takes the grid value nearest on a log scale (ties to the smaller)', () => {
    expect(LAMBDAS).toEqual([0.01, 0.032, 0.1, 0.32, 1, 3.2, 10, 32, 100, 320, 1000]);
    expect(snapLog(51, LAMBDAS)).toBe(32); // ln(51/32) = 0.47 < ln(100/51) = 0.67
    expect(snapLog(71, LAMBDAS)).toBe(100); // ln(71/32) = 0.80 > ln(100/71) = 0.34
    expect(snapLog(1e6, LAMBDAS)).toBe(1000);
    expect(snapLog(1e-6, LAMBDAS)).toBe(0.01);
    expect(snapLog(Math.sqrt(10 * 100), [10, 100])).toBe(10);
  });
});

describe('ridgeMove (the α axis carries λ with the mean confidence)', () => {
  it('scales λ by the ratio of mean confidences and snaps it to the half-decade axis', () => {
    // The two validation splits' mean log(1 + v/ε) (bench/quality/README.md): MovieLens 100K 0.834, Online Retail 2.130.
    const movielens = ridgeMove({ linear: 1.426, log: 0.834 }, LAMBDAS);
    const retail = ridgeMove({ linear: 95.3, log: 2.13 }, LAMBDAS);
    const start = { scaling: 'log', alpha: 1, regularization: 10, factors: 64 };
    // 10 × (1 + 10·0.834) / (1 + 0.834) = 50.9 → 32; 10 × (1 + 10·2.13) / (1 + 2.13) = 71.2 → 100.
    expect(movielens(start, 10)).toEqual({ ...start, alpha: 10, regularization: 32 });
    expect(retail(start, 10)).toEqual({ ...start, alpha: 10, regularization: 100 });
    // 10 × 1.213 / 3.13 = 3.9 → 3.2; linear scaling reads the mean value: 10 × (1 + 10·1.426) / 2.426 = 62.9 → 100.
    expect(retail(start, 0.1)).toEqual({ ...start, alpha: 0.1, regularization: 3.2 });
    expect(movielens({ ...start, scaling: 'linear' }, 10)).toEqual({ ...start, scaling: 'linear', alpha: 10, regularization: 100 });
    // Back to where it came from: the same λ.
    expect(movielens(movielens(start, 10), 1)).toEqual(start);
  });
});

/**
 * A validation surface with a ridge: the best log λ for each α is log λ₀ + log(c̄(α)/c̄(1)), the direction the
 * measured surfaces follow (ials-ridge.ts), with a peak further along it at α 10; off the ridge it falls four
 * times faster than along it. Coordinate search moving one parameter at a time stalls in such a diagonal
 * valley (Nocedal & Wright, Numerical Optimization, 2nd ed., 2006, §9.3: it can "iterate infinitely without
 * approaching" or creep when the axes are not aligned with the valley); a step along the valley does not.
 */
const means = { linear: 1.426, log: 0.834 };
const ridgeLambda = (alpha: number) => 10 * (meanConfidence(means, alpha, 'log') / meanConfidence(means, 1, 'log'));
const surface = (p: Point) => {
  const a = Math.log10(p['alpha'] as number);
  const off = Math.log10(p['regularization'] as number) - Math.log10(ridgeLambda(p['alpha'] as number));
  return -((a - 1) ** 2) - 4 * off ** 2;
};
const axes = (coupled: boolean): Axis[] => [
  { name: 'alpha', values: IALS_GRID.alpha, ...(coupled && { move: ridgeMove(means, LAMBDAS) }) },
  { name: 'regularization', values: LAMBDAS },
];
const start = { scaling: 'log', alpha: 1, regularization: 10, factors: 64 };

describe('coordinate search with the coupled α axis', () => {
  it('reaches the peak of a diagonal ridge that one-axis steps never leave the start for, in as few trials', async () => {
    const plain = await coordinateSearch({ axes: axes(false), start, budget: 20, cost: () => 1, evaluate: surface });
    // Every single step scores lower: α 10 at λ 10 is off the ridge, λ alone leaves it.
    expect(plain.best).toEqual(start);
    const coupled = await coordinateSearch({ axes: axes(true), start, budget: 20, cost: () => 1, evaluate: surface });
    expect(coupled.best).toEqual({ ...start, alpha: 10, regularization: 32 });
    expect(coupled.score).toBeGreaterThan(plain.score);
    expect(coupled.trials.length).toBeLessThanOrEqual(plain.trials.length + 2);
    // The trials are the start, the coupled α steps and λ's line search around the new best, nothing twice.
    const keys = coupled.trials.map((t) => JSON.stringify(t.point));
    expect(new Set(keys).size).toBe(keys.length);
    expect(coupled.trials[1]!.point).toEqual({ ...start, alpha: 10, regularization: 32 });
  });

  it('spends within its budget, puts an off-grid value a move lands on into that axis, and stops when cancelled', async () => {
    for (const budget of [1, 2, 3, 5]) {
      let spent = 0;
      const r = await coordinateSearch({ axes: axes(true), start, budget, cost: () => 1, evaluate: (p) => ((spent += 1), surface(p)) });
      expect(spent).toBeLessThanOrEqual(Math.max(1, budget));
      expect(r.spent).toBe(spent);
    }
    // A move to a λ between the axis's values (no snapping here): the line search then steps from it.
    const loose: Axis[] = [
      { name: 'alpha', values: [1, 10], move: (from, v) => ({ ...from, alpha: v, regularization: (from['regularization'] as number) * (v === 10 ? 5 : 0.2) }) },
      { name: 'regularization', values: [10, 100] },
    ];
    const r = await coordinateSearch({
      axes: loose,
      start: { alpha: 1, regularization: 10 },
      budget: 10,
      cost: () => 1,
      evaluate: (p) => -Math.abs(Math.log10(p['regularization'] as number) - 1.7) - (p['alpha'] === 10 ? 0 : 1),
    });
    expect(r.trials.map((t) => t.point)).toEqual([
      { alpha: 1, regularization: 10 },
      { alpha: 10, regularization: 50 },
      { alpha: 10, regularization: 100 },
      { alpha: 10, regularization: 10 },
    ]);
    expect(r.best).toEqual({ alpha: 10, regularization: 50 });
    const ac = new AbortController();
    await expect(
      coordinateSearch({ axes: axes(true), start, budget: 20, cost: () => 1, signal: ac.signal, onTrial: (t) => t.trial === 2 && ac.abort(), evaluate: surface }),
    ).rejects.toThrow(/cancelled/);
  });
});
