/**
 * The plan's objective, one formula for both solvers, the tests and the meter:
 *   objective = (1 − β) · mean_w V_w + β · min_w V_w + keepWeight · (placements kept from the previous plan),
 * V_w = Σ over shelves and chosen items of value(s, w, item). A pinned item outside the brief's filters has no
 * value (NaN) and counts 0.
 */
import type { Plan, PlanInstance } from './types.ts';

export interface PlanScore {
  weekValues: Float64Array;
  mean: number;
  min: number;
  kept: number;
  objective: number;
}

export function valueAt(inst: PlanInstance, s: number, w: number, c: number): number {
  const v = inst.value[(s * inst.weeks + w) * inst.candidates.length + c]!;
  return Number.isNaN(v) ? 0 : v;
}

/** Placements of `plan` that `previous` also has (same candidate, shelf and week). */
export function keptCount(plan: Plan, previous: Plan | undefined): number {
  if (!previous) return 0;
  let kept = 0;
  plan.slots.forEach((weeks, s) =>
    weeks.forEach((list, w) => {
      const before = previous.slots[s]?.[w];
      if (!before) return;
      for (const c of list) if (c >= 0 && before.includes(c)) kept++;
    }),
  );
  return kept;
}

export function scorePlan(inst: PlanInstance, plan: Plan): PlanScore {
  const N = inst.weeks;
  const weekValues = new Float64Array(N);
  plan.slots.forEach((weeks, s) =>
    weeks.forEach((list, w) => {
      for (const c of list) if (c >= 0) weekValues[w]! += valueAt(inst, s, w, c);
    }),
  );
  let sum = 0;
  let min = Infinity;
  for (const v of weekValues) {
    sum += v;
    if (v < min) min = v;
  }
  const beta = inst.objective.minWeekWeight;
  const kept = keptCount(plan, inst.previous);
  const mean = sum / N;
  return { weekValues, mean, min, kept, objective: (1 - beta) * mean + beta * min + inst.objective.keepWeight * kept };
}

/** Orders each shelf-week best value first (how a plan is shown and how a draft's slots are seeded). */
export function orderPlan(inst: PlanInstance, plan: Plan): Plan {
  return {
    slots: plan.slots.map((weeks, s) =>
      weeks.map((list, w) => {
        const filled = Array.from(list).filter((c) => c >= 0);
        filled.sort((a, b) => valueAt(inst, s, w, b) - valueAt(inst, s, w, a) || a - b);
        const out = new Int32Array(list.length).fill(-1);
        out.set(filled);
        return out;
      }),
    ),
  };
}
