import { describe, expect, it, beforeAll } from 'vitest';
import { checkPlan } from '../../src-main/core/planning/check.ts';
import { solveExact, type LpSolver } from '../../src-main/core/planning/milp.ts';
import { solveHeuristic } from '../../src-main/core/planning/heuristic.ts';
import { scorePlan } from '../../src-main/core/planning/objective.ts';
import { bruteForce } from './brute.ts';
import { randomInstance, type RandomSpec } from './instances.ts';

let highs: LpSolver;
beforeAll(async () => {
  highs = (await (await import('highs')).default()) as unknown as LpSolver;
});

// Tiny instances with every rule family switched on in turn; the optimum by exhaustive enumeration
// (the definition of an optimum) must equal HiGHS's MILP optimum (Huangfu & Hall 2018, HiGHS).
const tiny: [string, RandomSpec][] = [
  ['rest and appearances', { seed: 1, items: 7, weeks: 3, shelves: 1, size: 2, horizon: { restWeeks: 1, maxAppearances: 1 } }],
  ['a category quota', { seed: 2, items: 6, weeks: 3, shelves: 1, size: 2, rules: { quotas: [{ facet: 'category', max: 1 }] } }],
  ['a promoted floor and cap', { seed: 3, items: 6, weeks: 3, shelves: 1, size: 2, promotedShare: 0.4, rules: { promoted: { minCount: 0.5, maxCount: 0.5 } } }],
  ['two shelves, no repeat in a week', { seed: 4, items: 5, weeks: 2, shelves: 2, size: 2, horizon: { restWeeks: 0, maxAppearances: 2 } }],
  ['a supplier commitment', { seed: 5, items: 6, weeks: 3, shelves: 1, size: 2, horizon: { commitments: [{ supplier: 'sup1', minSlots: 3 }], restWeeks: 0, maxAppearances: 3 } }],
  ['supplier shares and the sponsored cap', { seed: 6, items: 6, weeks: 3, shelves: 1, size: 2, suppliers: 3, horizon: { supplierMinShare: 0.15, supplierMaxShare: 0.5, sponsoredMaxShare: 0.5 } }],
  ['the sum alone (β = 0)', { seed: 7, items: 5, weeks: 3, shelves: 1, size: 2, minWeekWeight: 0 }],
  ['the weakest week alone (β = 1)', { seed: 8, items: 5, weeks: 3, shelves: 1, size: 2, minWeekWeight: 1 }],
  ['cells outside a shelf\'s filters', { seed: 9, items: 6, weeks: 3, shelves: 1, size: 2, holes: 0.3 }],
];

describe('the exact planner', () => {
  it.each(tiny)('equals exhaustive search on a tiny case: %s', (_name, spec) => {
    const inst = randomInstance(spec);
    const ref = bruteForce(inst);
    const r = solveExact(inst, highs);
    if (ref.plan === null) {
      expect(r.status).toBe('infeasible');
      return;
    }
    expect(ref.plans).toBeGreaterThan(0);
    expect(r.status).toBe('optimal');
    expect(checkPlan(inst, r.plan!)).toEqual([]);
    expect(r.objective).toBeCloseTo(ref.objective, 6);
  });

  it('keeps pins, locks and bans', () => {
    const inst = randomInstance({ seed: 11, items: 8, weeks: 3, shelves: 1, size: 2 });
    inst.edits = { pins: [{ candidate: 7, shelf: 0, week: 1 }], bans: [0, 1], locks: [{ shelf: 0, week: 2, items: [2, 3] }] };
    const ref = bruteForce(inst);
    const r = solveExact(inst, highs);
    expect(checkPlan(inst, r.plan!)).toEqual([]);
    expect(r.objective).toBeCloseTo(ref.objective, 6);
    expect(Array.from(r.plan!.slots[0]![1]!)).toContain(7);
    expect(Array.from(r.plan!.slots[0]![2]!).sort()).toEqual([2, 3]);
  });

  it('re-solving with a keep weight keeps the previous plan where it costs little', () => {
    const inst = randomInstance({ seed: 12, items: 10, weeks: 3, shelves: 1, size: 2 });
    const first = solveExact(inst, highs).plan!;
    // Values move a little (new signals); a large keep weight holds the plan, none lets it move freely.
    const moved = { ...inst, value: inst.value.map((v, k) => v * (1 + 0.05 * Math.sin(k))) };
    const held = solveExact({ ...moved, previous: first, objective: { minWeekWeight: 0.3, keepWeight: 1 } }, highs).plan!;
    expect(scorePlan({ ...moved, previous: first }, held).kept).toBe(6);
    const ref = bruteForce({ ...moved, previous: first, objective: { minWeekWeight: 0.3, keepWeight: 0.01 } });
    const light = solveExact({ ...moved, previous: first, objective: { minWeekWeight: 0.3, keepWeight: 0.01 } }, highs);
    expect(light.objective).toBeCloseTo(ref.objective, 6);
  });

  it('says infeasible when the rules cannot all hold', () => {
    // 3 weeks × 2 slots from 3 items, each at most once: 6 slots, 3 appearances.
    const inst = randomInstance({ seed: 13, items: 3, weeks: 3, shelves: 1, size: 2, horizon: { maxAppearances: 1 } });
    expect(bruteForce(inst).plan).toBeNull();
    expect(solveExact(inst, highs).status).toBe('infeasible');
  });
});

describe('the heuristic planner', () => {
  it.each(tiny)('gives a plan every rule holds for on a tiny case: %s', (_name, spec) => {
    const inst = randomInstance(spec);
    const r = solveHeuristic(inst);
    const ref = bruteForce(inst);
    expect(ref.plan).not.toBeNull();
    // It may miss a tight plan (and says so), but a plan it calls feasible must hold and cannot beat the optimum.
    if (r.status === 'feasible') {
      expect(checkPlan(inst, r.plan!)).toEqual([]);
      expect(r.objective).toBeLessThanOrEqual(ref.objective + 1e-9);
    }
  });
});

describe('a locked week with an empty slot', () => {
  it('keeps the empty slot and still counts as a complete plan for both solvers', () => {
    const inst = randomInstance({ seed: 31, items: 8, weeks: 3, shelves: 1, size: 2, horizon: { restWeeks: 0, maxAppearances: 3 } });
    inst.edits = { pins: [], bans: [], locks: [{ shelf: 0, week: 1, items: [4] }] };
    const fast = solveHeuristic(inst);
    expect(fast.status).toBe('feasible');
    expect(Array.from(fast.plan!.slots[0]![1]!)).toEqual([4, -1]);
    expect(checkPlan(inst, fast.plan!)).toEqual([]);
    const exact = solveExact(inst, highs);
    expect(Array.from(exact.plan!.slots[0]![1]!)).toEqual([4, -1]);
  });
});
