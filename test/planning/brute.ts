/**
 * Exhaustive search over every plan of a tiny instance: the optimum by definition, the reference the MILP
 * must equal. Each shelf-week takes any K of the candidates (or K − e of them plus e empty slots when
 * empty slots are allowed); a plan counts when the independent checker finds nothing wrong.
 */
import { checkPlan } from '../../src-main/core/planning/check.ts';
import { scorePlan } from '../../src-main/core/planning/objective.ts';
import type { Plan, PlanInstance } from '../../src-main/core/planning/types.ts';

function subsets(P: number, k: number): Int32Array[] {
  const out: Int32Array[] = [];
  const pick: number[] = [];
  const go = (from: number) => {
    if (pick.length === k) {
      out.push(Int32Array.from(pick));
      return;
    }
    for (let p = from; p < P; p++) {
      pick.push(p);
      go(p + 1);
      pick.pop();
    }
  };
  go(0);
  return out;
}

export function bruteForce(inst: PlanInstance): { objective: number; plan: Plan | null; plans: number } {
  const P = inst.candidates.length;
  const cells: { s: number; w: number; options: Int32Array[] }[] = [];
  inst.shelves.forEach((sh, s) => {
    for (let w = 0; w < inst.weeks; w++) cells.push({ s, w, options: subsets(P, sh.size) });
  });
  let best = -Infinity;
  let bestPlan: Plan | null = null;
  let plans = 0;
  const choice = new Int32Array(cells.length);
  const go = (k: number) => {
    if (k === cells.length) {
      const plan: Plan = { slots: inst.shelves.map(() => new Array<Int32Array>(inst.weeks)) };
      cells.forEach((cell, j) => (plan.slots[cell.s]![cell.w] = cell.options[choice[j]!]!));
      if (checkPlan(inst, plan).length > 0) return;
      plans++;
      const o = scorePlan(inst, plan).objective;
      if (o > best) {
        best = o;
        bestPlan = plan;
      }
      return;
    }
    for (let j = 0; j < cells[k]!.options.length; j++) {
      choice[k] = j;
      go(k + 1);
    }
  };
  go(0);
  return { objective: best, plan: bestPlan, plans };
}
