import { beforeAll, describe, expect, it } from 'vitest';
import { checkPlan } from '../../src-main/core/planning/check.ts';
import { solveHeuristic } from '../../src-main/core/planning/heuristic.ts';
import { solveExact, type LpSolver } from '../../src-main/core/planning/milp.ts';
import { diagnose } from '../../src-main/core/planning/relax.ts';
import { randomInstance } from './instances.ts';

let highs: LpSolver;
beforeAll(async () => {
  highs = (await (await import('highs')).default()) as unknown as LpSolver;
});

describe('infeasible rules', () => {
  it('names the rest period and the empty slots, each with its least relaxation', () => {
    // 3 items, 3 weeks of 2 slots, one week of rest: whichever two items run in week 2 cannot run in weeks 1
    // or 3, so weeks 1 and 3 need 4 slots from the one item left, or week 2 runs one item and weeks 1 and 3 the
    // other two. Counted by hand: rest 1 → 0 fixes it (each item may then run every week), or 1 slot left
    // empty (weeks 1 and 3 hold {a, b}, week 2 holds {c}).
    const inst = randomInstance({ seed: 21, items: 3, weeks: 3, shelves: 1, size: 2, horizon: { restWeeks: 1, maxAppearances: 3 } });
    const d = diagnose(inst, highs);
    expect(d.feasible).toBe(false);
    expect(d.relaxations).toEqual([
      { family: 'fill', amount: 1, description: 'leave 1 slot empty' },
      { family: 'restWeeks', amount: 1, description: 'rest period 1 → 0 weeks' },
    ]);
  });

  it('finds a commitment that a supplier cap forbids, and the smallest change to either', () => {
    // Two suppliers share 12 slots; sup1 is promised 7, but no supplier may take more than 0.5 × 12 = 6: one
    // slot either way (the promise down to 6, or the cap up to 7 with sup0 taking the other 5).
    const inst = randomInstance({ seed: 22, items: 12, weeks: 3, shelves: 1, size: 4, suppliers: 2, horizon: { restWeeks: 0, maxAppearances: 3, supplierMaxShare: 0.5, commitments: [{ supplier: 'sup1', minSlots: 7 }] } });
    const d = diagnose(inst, highs);
    expect(d.relaxations.map((r) => [r.family, r.amount])).toEqual([
      ['commitments', 1],
      ['supplierMaxShare', 1],
    ]);
    expect(d.relaxations[1]!.description).toBe("a supplier's cap 6 → 7 of 12 slots");
  });

  it('says a feasible plan is feasible', () => {
    expect(diagnose(randomInstance({ seed: 23, items: 10, weeks: 3, shelves: 1, size: 2 }), highs)).toEqual({ feasible: true, relaxations: [], allTogether: null });
  });
});

describe('the heuristic against the exact optimum', () => {
  it('stays within a measured gap on seeded random instances, and every rule holds', () => {
    // 12 seeded instances: 30 candidates, 4 weeks × 2 shelves × 3 slots, a category quota, a promoted cap, a
    // sponsored cap, rest, appearances and a supplier commitment. Measured when written (everything here is
    // deterministic): mean gap 0.88%, worst 2.17%. The bounds leave room for small changes to the local search
    // and to HiGHS's choice among tied optima, not for a broken heuristic (a plain greedy measured 3% mean).
    const gaps: number[] = [];
    for (let seed = 1; seed <= 12; seed++) {
      const inst = randomInstance({
        seed: 100 + seed,
        items: 30,
        weeks: 4,
        shelves: 2,
        size: 3,
        suppliers: 5,
        rules: { quotas: [{ facet: 'category', max: 2 }], promoted: { maxCount: 0.5 } },
        minWeekWeight: 0.3,
        horizon: { restWeeks: 1, maxAppearances: 2, commitments: [{ supplier: 'sup2', minSlots: 4 }], sponsoredMaxShare: 0.25 },
      });
      const exact = solveExact(inst, highs);
      const fast = solveHeuristic(inst);
      expect(exact.status).toBe('optimal');
      expect(fast.status).toBe('feasible');
      expect(checkPlan(inst, exact.plan!)).toEqual([]);
      expect(checkPlan(inst, fast.plan!)).toEqual([]);
      gaps.push((exact.objective - fast.objective) / exact.objective);
    }
    const mean = gaps.reduce((a, b) => a + b, 0) / gaps.length;
    const worst = Math.max(...gaps);
    console.log(`heuristic gap to the MILP optimum over 12 instances: mean ${(mean * 100).toFixed(2)}%, worst ${(worst * 100).toFixed(2)}%`);
    expect(Math.min(...gaps)).toBeGreaterThanOrEqual(-1e-9);
    expect(mean).toBeLessThan(0.015);
    expect(worst).toBeLessThan(0.03);
  }, 120_000);
});
