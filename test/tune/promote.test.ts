import { describe, expect, it } from 'vitest';
import { CancelledError, InputError } from '../../src-main/core/errors.ts';
import { promoteTop, rankScreened, type Screened } from '../../src-main/services/tune/promote.ts';
import type { Point } from '../../src-main/services/tune/search.ts';
import { ialsScreenShare } from '../../src-main/services/tune/grid.ts';

/** Nine screened settings of λ, scored at low fidelity; the full-fidelity score is a different function. */
const LAMBDAS = [0.1, 1, 3.2, 10, 32, 100, 320, 1000, 3200];
const low = (l: number) => -Math.abs(Math.log10(l) - 0.5); // best at λ ≈ 3.2 when judged by a few sweeps
const full = (l: number) => -Math.abs(Math.log10(l) - 1.5); // best at λ ≈ 32 when trained to the end
const screened: Screened[] = LAMBDAS.map((l) => ({ point: { lambda: l }, score: low(l) }));
const cost = (p: Point) => (p['lambda'] as number) >= 100 ? 5 : 2;

describe('promoteTop (successive halving, second rung)', () => {
  it('refits the top ceil(n/eta) screened settings and chooses among them by the full-fidelity score alone', async () => {
    const fitted: number[] = [];
    const r = await promoteTop({ screened, budget: 100, cost, evaluate: (p) => (fitted.push(p['lambda'] as number), full(p['lambda'] as number)) });
    // Jamieson & Talwalkar (2016), Algorithm 1, and Li et al. (2018), Hyperband's inner loop: after a rung,
    // keep the best 1/η of the configurations by that rung's loss and evaluate only those with the larger
    // resource; the final pick is the best of the last rung. Here η = 3 of 9 settings: the three best at low
    // fidelity (λ 3.2, then the tie 1 and 10 in screening order), refitted best-screened first.
    expect(r.wanted).toBe(3);
    expect(fitted).toEqual([3.2, 1, 10]);
    // The full-fidelity score reverses the order: λ 10 wins although it was screened third.
    expect(r.best!.point).toEqual({ lambda: 10 });
    expect(r.best!.score).toBe(full(10));
    expect(r.best!.screenScore).toBe(low(10));
    expect(r.spent).toBe(6);
    expect(r.skipped).toBe(0);
  });

  it('keeps the better-screened setting when two promoted ones tie at full fidelity', async () => {
    const r = await promoteTop({ screened, budget: 100, cost, evaluate: () => 0.5 });
    expect(r.best!.point).toEqual({ lambda: 3.2 });
  });

  it('ranks repeats once, NaN last, ties in evaluation order', () => {
    const ranked = rankScreened([
      { point: { a: 1 }, score: Number.NaN },
      { point: { a: 2 }, score: 0.2 },
      { point: { a: 3 }, score: 0.3 },
      { point: { a: 2 }, score: 0.9 }, // a repeat of a point counts once, with its first score
      { point: { a: 4 }, score: 0.2 },
    ]);
    expect(ranked.map((s) => s.point['a'])).toEqual([3, 2, 4, 1]);
  });

  it('never spends past its budget: an unaffordable promotion is skipped and a cheaper one below it still runs', async () => {
    const s: Screened[] = [
      { point: { lambda: 320 }, score: 0.9 }, // costs 5
      { point: { lambda: 10 }, score: 0.8 }, // costs 2
      { point: { lambda: 1 }, score: 0.7 },
      { point: { lambda: 0.1 }, score: 0.1 },
      { point: { lambda: 0.2 }, score: 0.1 },
      { point: { lambda: 0.3 }, score: 0.1 },
    ];
    const fitted: number[] = [];
    const r = await promoteTop({ screened: s, budget: 4, cost, evaluate: (p) => (fitted.push(p['lambda'] as number), 1) });
    expect(r.wanted).toBe(2);
    expect(fitted).toEqual([10]);
    expect(r.skipped).toBe(1);
    expect(r.spent).toBeLessThanOrEqual(4);
    const none = await promoteTop({ screened: s, budget: 1, cost, evaluate: () => 1 });
    expect(none.best).toBeNull();
    expect(none.promoted).toEqual([]);
    expect(none.spent).toBe(0);
  });

  it('stops when cancelled and refuses a bad eta or budget by name', async () => {
    const ctl = new AbortController();
    ctl.abort();
    let fits = 0;
    await expect(promoteTop({ screened, budget: 100, cost, signal: ctl.signal, evaluate: () => ++fits })).rejects.toBeInstanceOf(CancelledError);
    expect(fits).toBe(0);
    await expect(promoteTop({ screened, budget: 100, cost, eta: 1, evaluate: () => 0 })).rejects.toThrow(InputError);
    await expect(promoteTop({ screened, budget: -1, cost, evaluate: () => 0 })).rejects.toThrow(/budget/);
  });
});

describe('ialsScreenShare', () => {
  it('gives the screening the whole budget up to the default, and never less than half above it', () => {
    // Up to the default budget nothing is held back for the refits (the default training's search is unchanged).
    expect(ialsScreenShare(0.5, 3)).toBe(1);
    expect(ialsScreenShare(3, 3)).toBe(1);
    // Above it the screening keeps the default's worth until it reaches one half; successive halving gives each
    // rung about the same budget (Li et al. 2018, Hyperband, section 3), so half is the floor.
    expect(ialsScreenShare(4, 3)).toBeCloseTo(0.75, 12);
    expect(ialsScreenShare(6, 3)).toBe(0.5);
    expect(ialsScreenShare(20, 3)).toBe(0.5);
  });
});
