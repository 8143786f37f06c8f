/**
 * Chooses and runs a solver for a built plan. 'auto': the heuristic always (fast), then the exact MILP when the
 * program is small enough to finish quickly (at most EXACT_LIMIT 0-1 variables), keeping the better plan.
 * A plan the heuristic could not complete and the exact solver proves impossible is diagnosed
 * (core/planning/relax.ts): which rule families conflict and the least relaxation of each.
 */
import { compilePlan } from '../../core/planning/compile.ts';
import { solveHeuristic } from '../../core/planning/heuristic.ts';
import { solveExact } from '../../core/planning/milp.ts';
import { diagnose, type Diagnosis } from '../../core/planning/relax.ts';
import type { PlanInstance, SolveReport } from '../../core/planning/types.ts';
import { loadHighs } from './highs.ts';

export type SolveMethod = 'auto' | 'exact' | 'heuristic';

/** 0-1 variables up to which 'auto' also runs the exact solver (measured: a few seconds on the demo shop). */
export const EXACT_LIMIT = 6000;
/**
 * The exact solver's time limit; past it the better of its incumbent and the heuristic's plan is kept. On the
 * demo shop one 24-slot shelf over 6 weeks (1,728 variables) solved to optimal in about 6 s at load 14, 0.21%
 * above the heuristic's plan.
 */
const EXACT_SECONDS = 10;
const HEURISTIC_MS = 5000;
/** HiGHS's own default gap (1e-4): an 'optimal' plan is within 0.01% of the best possible. */
const RELATIVE_GAP = 1e-4;

export interface Solved {
  report: SolveReport;
  diagnosis: Diagnosis | null;
  variables: number;
}

export async function solvePlan(inst: PlanInstance, method: SolveMethod, now: () => number): Promise<Solved> {
  const c = compilePlan(inst);
  let variables = 0;
  for (const e of c.eligible) variables += e;
  let report: SolveReport | null = null;
  if (method !== 'exact') report = solveHeuristic(inst, { now, deadline: now() + HEURISTIC_MS });
  if (method === 'exact' || (method === 'auto' && (variables <= EXACT_LIMIT || report?.status === 'infeasible'))) {
    const highs = await loadHighs();
    const exact = solveExact(inst, highs, { timeLimitSeconds: EXACT_SECONDS, relativeGap: RELATIVE_GAP }, now);
    if (exact.plan && (!report || report.status === 'infeasible' || exact.objective >= report.objective - 1e-12)) report = exact;
    else if (!exact.plan && exact.status === 'infeasible') report = { ...(report ?? exact), status: 'infeasible' };
  }
  let diagnosis: Diagnosis | null = null;
  if (report!.status === 'infeasible') diagnosis = diagnose(inst, await loadHighs());
  return { report: report!, diagnosis, variables };
}
