import { describe, expect, it } from 'vitest';
import { coordinateSearch, type Point } from '../../src-main/services/tune/search.ts';

const REG = [0.01, 0.1, 1, 10, 100, 1000];
const FACTORS = [32, 64, 128, 256];
const axes = [
  { name: 'regularization', values: REG },
  { name: 'scaling', values: ['linear', 'log'] },
  { name: 'factors', values: FACTORS },
];

/**
 * A known objective: separable and unimodal along every axis, maximal at regularization 100, scaling log,
 * factors 128. On a separable unimodal function one cycle of coordinate search reaches the optimum and the
 * next cycle confirms it (Nocedal & Wright, Numerical Optimization, 2nd ed., 2006, §9.3).
 */
const objective = (p: Point) =>
  -((Math.log10(p['regularization'] as number) - 2) ** 2) - Math.log2((p['factors'] as number) / 128) ** 2 + (p['scaling'] === 'log' ? 0.5 : 0);

/** Cost model of the test: one unit per fit at 64 factors, proportional to factors. */
const cost = (p: Point) => (p['factors'] as number) / 64;

describe('coordinateSearch', () => {
  it('finds the optimum of a separable objective from the defaults, fitting far fewer points than the grid', async () => {
    const fitted: Point[] = [];
    const r = await coordinateSearch({
      axes,
      start: { regularization: 0.01, scaling: 'linear', factors: 64 },
      budget: 100,
      cost,
      evaluate: (p) => (fitted.push(p), objective(p)),
    });
    expect(r.best).toEqual({ regularization: 100, scaling: 'log', factors: 128 });
    expect(r.score).toBeCloseTo(0.5, 12);
    expect(r.stopped).toBe('converged');
    // Each point is fitted once, and the trials are what evaluate saw.
    expect(new Set(fitted.map((p) => JSON.stringify(p))).size).toBe(fitted.length);
    expect(r.trials.map((t) => t.point)).toEqual(fitted);
    expect(fitted.length).toBeLessThan(REG.length * 2 * FACTORS.length);
    expect(r.spent).toBeCloseTo(fitted.reduce((s, p) => s + cost(p), 0), 12);
  });

  it('never spends more than its budget (counted fits × cost) and keeps the best point it could afford', async () => {
    for (const budget of [1, 2.5, 4, 7]) {
      let units = 0;
      const r = await coordinateSearch({
        axes,
        start: { regularization: 0.01, scaling: 'linear', factors: 64 },
        budget,
        cost,
        evaluate: (p) => ((units += cost(p)), objective(p)),
      });
      expect(units).toBeLessThanOrEqual(budget + 1e-9);
      expect(r.spent).toBeCloseTo(units, 12);
      expect(r.stopped).toBe('budget');
      const top = Math.max(...r.trials.map((t) => t.score));
      expect(r.score).toBe(top);
    }
  });

  it('always fits the start point, even over budget, so a model is never left unfitted', async () => {
    const r = await coordinateSearch({ axes, start: { regularization: 1, scaling: 'log', factors: 256 }, budget: 0, cost, evaluate: objective });
    expect(r.trials).toHaveLength(1);
    expect(r.best).toEqual({ regularization: 1, scaling: 'log', factors: 256 });
  });

  it('puts a start value that is not on the grid into its axis', async () => {
    const r = await coordinateSearch({
      axes: [{ name: 'lambda', values: [10, 100, 1000, 10_000] }],
      start: { lambda: 500 },
      budget: 10,
      cost: () => 1,
      evaluate: (p) => -Math.abs(Math.log10(p['lambda'] as number) - 1.5),
    });
    expect(r.trials.map((t) => t.point['lambda'])).toEqual([500, 1000, 100, 10]);
    expect(r.best).toEqual({ lambda: 100 });
  });

  it('refines a marked log axis at the geometric midpoints next to its best, within the budget', async () => {
    // A unimodal objective peaking at λ = 10^2.3 ≈ 200 on a half-decade grid: the grid's best is 300 (10^2.48);
    // the quarter-decade midpoints next to it are √(100·300) ≈ 170 and √(300·1000) ≈ 550 (two significant
    // digits), and 170 (10^2.23) lies nearer the peak than 300 (hand computation).
    const grid = [10, 30, 100, 300, 1000, 3000, 10_000];
    const objective1 = (p: Point) => -Math.abs(Math.log10(p['lambda'] as number) - 2.3);
    const run = (refine: boolean, budget: number) =>
      coordinateSearch({ axes: [{ name: 'lambda', values: grid, refine }], start: { lambda: 1000 }, budget, cost: () => 1, evaluate: objective1 });
    const plain = await run(false, 20);
    expect(plain.best).toEqual({ lambda: 300 }); // |2.477 − 2.3| < |2 − 2.3|
    const refined = await run(true, 20);
    expect(refined.trials.slice(plain.trials.length).map((t) => t.point['lambda'])).toEqual([170, 550]);
    expect(refined.best).toEqual({ lambda: 170 }); // |2.230 − 2.3| = 0.07 < 0.177
    // With no budget left after the line search, the refinement is skipped and the search says so.
    const short = await run(true, plain.spent);
    expect(short.best).toEqual({ lambda: 300 });
    expect(short.stopped).toBe('budget');
  });

  it('stops with CancelledError between trials once cancelled, and reports each trial before it runs', async () => {
    const ac = new AbortController();
    const seen: number[] = [];
    await expect(
      coordinateSearch({
        axes,
        start: { regularization: 0.01, scaling: 'linear', factors: 64 },
        budget: 100,
        cost,
        signal: ac.signal,
        onTrial: (t) => seen.push(t.trial),
        evaluate: (p) => {
          if (seen.length === 3) ac.abort();
          return objective(p);
        },
      }),
    ).rejects.toThrow(/cancelled/);
    expect(seen).toEqual([1, 2, 3]);
  });

  it('refuses a negative budget', async () => {
    await expect(coordinateSearch({ axes, start: { regularization: 1, scaling: 'log', factors: 64 }, budget: -1, cost, evaluate: objective })).rejects.toThrow(
      /budget must be a finite number >= 0, got -1/,
    );
  });
});

describe('coordinateSearch on an axis with a simplest value (a half-life with "off")', () => {
  const half = { name: 'h', values: ['off', 730, 180, 45, 11], ordered: true, simplest: 'off' };
  // Peak at 180 days with 730 below off: a walk from off would stop at 730; the scan must not (common practice,
  // no source: a known objective).
  const score: Record<string, number> = { off: 0.1, 730: 0.099, 180: 0.12, 45: 0.11, 11: 0.09 };
  const run = (significant: (a: Point, b: Point) => boolean) =>
    coordinateSearch({ axes: [half], start: { h: 'off' }, budget: 100, cost: () => 1, evaluate: (p) => score[String(p['h'])]!, significant });

  it('tries every other value, and moves to the best when that is significantly better', async () => {
    const asked: [unknown, unknown][] = [];
    const r = await run((a, b) => (asked.push([a['h'], b['h']]), true));
    expect(r.best).toEqual({ h: 180 });
    // Every half-life, then the refinement's midpoints beside 180 (360 and 90, unscored here: NaN is a loss).
    expect(r.trials.map((t) => t.point['h']).slice(0, 5)).toEqual(['off', 730, 180, 45, 11]);
    // Asked once after the walk, and once more at the end (is the final best still significantly above off?).
    expect(asked).toEqual([
      [180, 'off'],
      [180, 'off'],
    ]);
  });

  it('stays at the simplest value when the best of the walk is not significantly better', async () => {
    const r = await run(() => false);
    expect(r.best).toEqual({ h: 'off' });
    expect(r.score).toBe(0.1);
  });

  it('returns to the simplest value when the best, after later moves, is no longer significantly better than it', async () => {
    // Two axes: the half-life walk passes at first, then the other axis moves, after which 180 days is only a
    // hair above off (that point is evaluated at the end); the choice falls back to off.
    const table: Record<string, number> = { 'off|a': 0.1, '730|a': 0.1, '180|a': 0.2, '45|a': 0.15, '11|a': 0.1, 'off|b': 0.3, '180|b': 0.30001, '730|b': 0.3, '45|b': 0.29, '11|b': 0.28, '360|a': 0.19, '90|a': 0.18, '360|b': 0.29, '90|b': 0.29 };
    const r = await coordinateSearch({
      axes: [half, { name: 'x', values: ['a', 'b'] }],
      start: { h: 'off', x: 'a' },
      budget: 100,
      cost: () => 1,
      evaluate: (p) => table[`${String(p['h'])}|${String(p['x'])}`]!,
      significant: (a, b) => table[`${String(a['h'])}|${String(a['x'])}`]! - table[`${String(b['h'])}|${String(b['x'])}`]! > 0.01,
    });
    expect(r.best).toEqual({ h: 'off', x: 'b' });
    expect(r.score).toBe(0.3);
  });

  it('refines on the side of the better neighbour first, so a budget for one midpoint tries that one', async () => {
    // λ on a half-decade grid, best at 10 with neighbours 1 (0.091) and 100 (0.093): 32 before 3.2 (a known
    // unimodal objective peaking near 30; common practice, no source).
    const f: Record<number, number> = { 1: 0.091, 3.2: 0.099, 10: 0.143, 32: 0.167, 100: 0.093 };
    const r = await coordinateSearch({
      axes: [{ name: 'lambda', values: [1, 10, 100], refine: true }],
      start: { lambda: 10 },
      budget: 4, // the start, 100 and 1, then one midpoint
      cost: () => 1,
      evaluate: (p) => f[p['lambda'] as number]!,
    });
    expect(r.trials.map((t) => t.point['lambda'])).toEqual([10, 100, 1, 32]);
    expect(r.best).toEqual({ lambda: 32 });
  });
});
