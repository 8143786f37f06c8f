/**
 * HiGHS (Huangfu & Hall 2018) compiled to WebAssembly, the `highs` package: the exact planner's MILP solver.
 * Loaded once per process on first use (the module instantiates its WebAssembly, ~0.1 s).
 */
import type { LpSolver } from '../../core/planning/milp.ts';

let solver: Promise<LpSolver> | undefined;

export function loadHighs(): Promise<LpSolver> {
  solver ??= import('highs').then(async (m) => (await m.default()) as unknown as LpSolver);
  return solver;
}
