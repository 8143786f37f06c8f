/**
 * The exact planner: the plan as a 0-1 integer program in CPLEX LP format, solved by whatever `LpSolver` the
 * caller passes (the services pass HiGHS compiled to WebAssembly, the `highs` package; core stays pure).
 *
 * Variables: x[s,w,c] = 1 when candidate c runs on shelf s in week w (only where compile.ts allows it);
 * y[w,c] = 1 when c runs in week w on any shelf (only when an item may sit on two shelves of a week; else
 * y = Σ_s x); t = the weakest week's value (a maximin objective linearised with t ≤ V_w for every w).
 * Constraints, one family per rule: fill, repeat in edition, rest windows (Σ over any rest + 1 consecutive
 * weeks ≤ 1), appearances, quota groups, promoted floor and cap per shelf-week, the sponsored cap per week,
 * supplier floors (min share and commitments) and cap; pins and locks as fixed bounds.
 */
import { compilePlan, at, type CompiledPlan } from './compile.ts';
import { orderPlan, scorePlan } from './objective.ts';
import type { Plan, PlanInstance, SolveReport } from './types.ts';

/** The slice of a MILP solver the planner needs: HiGHS's one-shot `solve(lpText, options)`. */
export interface LpSolver {
  solve(
    lp: string,
    options?: Record<string, string | number | boolean>,
  ): { Status: string; ObjectiveValue: number; Columns: Record<string, { Primal?: number }> };
}

export interface MilpOptions {
  /** Allow empty slots (the 'fill' family relaxed). */
  allowEmpty?: boolean;
  /** Only ask whether a plan exists (the relaxation search). */
  feasibilityOnly?: boolean;
  timeLimitSeconds?: number;
  /** Relative MIP gap at which HiGHS stops (default 1e-9: proven optimal for the tests' exactness checks). */
  relativeGap?: number;
}

const xName = (s: number, w: number, c: number) => `x${s}_${w}_${c}`;
const yName = (w: number, c: number) => `y${w}_${c}`;

/** Writes the terms of a linear expression, a few per line (LP format lets an expression span lines). */
function expr(terms: string[]): string {
  const lines: string[] = [];
  for (let k = 0; k < terms.length; k += 8) lines.push(terms.slice(k, k + 8).join(' '));
  return lines.join('\n ');
}

function num(v: number): string {
  // LP format reads exponents; 12 significant digits keep the objective exact enough for a 1e-6 gap.
  return Number(v.toPrecision(12)).toString();
}

export interface LpModel {
  text: string;
  compiled: CompiledPlan;
  /** Which week-presence expression each (w, c) uses: y[w,c] or the sum of x over shelves. */
  usesY: boolean;
}

export function buildLp(inst: PlanInstance, options: MilpOptions = {}): LpModel {
  const c = compilePlan(inst);
  const { P, N, S } = c;
  const beta = inst.objective.minWeekWeight;
  const usesY = c.repeatAllowed && S > 1;
  const rows: string[] = [];
  const obj: string[] = [];
  const bounds: string[] = [];
  const binaries: string[] = [];
  const prev = inst.previous;
  for (let s = 0; s < S; s++) {
    for (let w = 0; w < N; w++) {
      const before = prev?.slots[s]?.[w];
      for (let p = 0; p < P; p++) {
        if (!c.eligible[at(c, s, w, p)]) continue;
        const name = xName(s, w, p);
        binaries.push(name);
        if (c.forced[at(c, s, w, p)]) bounds.push(`${name} = 1`);
        if (options.feasibilityOnly) continue;
        const v = inst.value[at(c, s, w, p)]!;
        let coef = ((1 - beta) / N) * (Number.isNaN(v) ? 0 : v);
        if (before?.includes(p)) coef += inst.objective.keepWeight;
        if (coef !== 0) obj.push(`+ ${num(coef)} ${name}`);
      }
    }
  }
  if (!options.feasibilityOnly && beta > 0) obj.push(`+ ${num(beta)} t`);
  if (obj.length === 0) obj.push(binaries.length ? `0 ${binaries[0]}` : '0 t');

  // Fill: every slot of every shelf-week (a locked week keeps exactly its list).
  const locks = new Map(inst.edits.locks.map((l) => [l.shelf * N + l.week, l.items.length]));
  for (let s = 0; s < S; s++) {
    for (let w = 0; w < N; w++) {
      const terms: string[] = [];
      for (let p = 0; p < P; p++) if (c.eligible[at(c, s, w, p)]) terms.push(`+ ${xName(s, w, p)}`);
      const rhs = locks.get(s * N + w) ?? c.sizes[s]!;
      if (terms.length === 0) {
        if (rhs > 0 && !options.allowEmpty) rows.push(`fill_${s}_${w}: 0 t >= ${rhs}`); // nothing may run: infeasible
        continue;
      }
      rows.push(`fill_${s}_${w}: ${expr(terms)} ${options.allowEmpty && !locks.has(s * N + w) ? '<=' : '='} ${rhs}`);
    }
  }
  // Week presence per candidate: the terms that say "c runs in week w".
  const presence = (w: number, p: number): string[] => {
    if (usesY) return [`+ ${yName(w, p)}`];
    const t: string[] = [];
    for (let s = 0; s < S; s++) if (c.eligible[at(c, s, w, p)]) t.push(`+ ${xName(s, w, p)}`);
    return t;
  };
  const weeksOf = (p: number): number[] => {
    const ws: number[] = [];
    for (let w = 0; w < N; w++) {
      let any = false;
      for (let s = 0; s < S && !any; s++) any = c.eligible[at(c, s, w, p)] === 1;
      if (any) ws.push(w);
    }
    return ws;
  };
  const r = inst.horizon.restWeeks;
  const M = inst.horizon.maxAppearances;
  for (let p = 0; p < P; p++) {
    const ws = weeksOf(p);
    if (ws.length === 0) continue;
    for (const w of ws) {
      if (usesY) {
        binaries.push(yName(w, p));
        for (let s = 0; s < S; s++) if (c.eligible[at(c, s, w, p)]) rows.push(`ln_${s}_${w}_${p}: ${yName(w, p)} - ${xName(s, w, p)} >= 0`);
      } else if (S > 1 && presence(w, p).length > 1) {
        rows.push(`rep_${w}_${p}: ${expr(presence(w, p))} <= 1`);
      }
    }
    if (ws.length < 2) continue;
    if (r > 0) {
      for (let w0 = 0; w0 <= Math.max(0, N - 1 - r); w0++) {
        const inside = ws.filter((w) => w >= w0 && w <= w0 + r);
        if (inside.length < 2) continue;
        rows.push(`rest_${w0}_${p}: ${expr(inside.flatMap((w) => presence(w, p)))} <= 1`);
      }
    }
    if (ws.length > M) rows.push(`app_${p}: ${expr(ws.flatMap((w) => presence(w, p)))} <= ${M}`);
  }
  // Quotas per shelf-week.
  c.groups.forEach((g, k) => {
    for (let w = 0; w < N; w++) {
      const terms: string[] = [];
      for (const p of g.members) if (c.eligible[at(c, g.shelf, w, p)]) terms.push(`+ ${xName(g.shelf, w, p)}`);
      if (terms.length > g.max) rows.push(`q${k}_${w}: ${expr(terms)} <= ${g.max}`);
    }
  });
  // Promoted floor and cap per shelf-week; the sponsored cap per week over all shelves.
  const perWeek = c.sizes.reduce((a, b) => a + b, 0);
  for (let w = 0; w < N; w++) {
    const week: string[] = [];
    for (let s = 0; s < S; s++) {
      const terms: string[] = [];
      for (let p = 0; p < P; p++) if (c.promoted[p] && c.eligible[at(c, s, w, p)]) terms.push(`+ ${xName(s, w, p)}`);
      week.push(...terms);
      if (c.lockedWeek[s * N + w]) continue; // a locked week keeps its list whatever the shares say
      if (c.promotedMin[s]! > 0) rows.push(`pmin_${s}_${w}: ${terms.length ? expr(terms) : '0 t'} >= ${c.promotedMin[s]}`);
      if (terms.length > c.promotedMax[s]!) rows.push(`pmax_${s}_${w}: ${expr(terms)} <= ${c.promotedMax[s]}`);
    }
    if (c.sponsoredCap < perWeek && week.length > c.sponsoredCap) rows.push(`spon_${w}: ${expr(week)} <= ${c.sponsoredCap}`);
  }
  // Suppliers over the horizon.
  const bySupplier = new Map<number, string[]>();
  for (let s = 0; s < S; s++) {
    for (let w = 0; w < N; w++) {
      for (let p = 0; p < P; p++) {
        if (!c.eligible[at(c, s, w, p)]) continue;
        const g = c.supplier[p]!;
        let t = bySupplier.get(g);
        if (!t) bySupplier.set(g, (t = []));
        t.push(`+ ${xName(s, w, p)}`);
      }
    }
  }
  for (const [g, min] of c.supplierFloor) rows.push(`smin_${g}: ${bySupplier.get(g)?.length ? expr(bySupplier.get(g)!) : '0 t'} >= ${min}`);
  for (const [g, terms] of bySupplier) if (terms.length > c.supplierCap) rows.push(`smax_${g}: ${expr(terms)} <= ${c.supplierCap}`);
  // The weakest week: t ≤ V_w.
  if (!options.feasibilityOnly && beta > 0) {
    for (let w = 0; w < N; w++) {
      const terms: string[] = ['t'];
      for (let s = 0; s < S; s++) {
        for (let p = 0; p < P; p++) {
          if (!c.eligible[at(c, s, w, p)]) continue;
          const v = inst.value[at(c, s, w, p)]!;
          if (!Number.isNaN(v) && v !== 0) terms.push(`- ${num(v)} ${xName(s, w, p)}`);
        }
      }
      rows.push(`min_${w}: ${expr(terms)} <= 0`);
    }
  }
  const text = [
    'Maximize',
    ` obj: ${expr(obj)}`,
    'Subject To',
    ...rows.map((row) => ` ${row}`),
    'Bounds',
    ' t >= 0',
    ...bounds.map((b) => ` ${b}`),
    'Binary',
    ...binaries.map((b) => ` ${b}`),
    'End',
    '',
  ].join('\n');
  return { text, compiled: c, usesY };
}

/** Solves the instance exactly. A time limit returns the best plan found, marked 'timeLimit'. */
export function solveExact(inst: PlanInstance, solver: LpSolver, options: MilpOptions = {}, now: () => number = () => 0): SolveReport {
  const t0 = now();
  const model = buildLp(inst, options);
  const r = solver.solve(model.text, {
    output_flag: false,
    mip_rel_gap: options.relativeGap ?? 1e-9,
    ...(options.timeLimitSeconds !== undefined && { time_limit: options.timeLimitSeconds }),
  });
  const ms = now() - t0;
  const solved = r.Status === 'Optimal' || (r.Status === 'Time limit reached' && Object.values(r.Columns).some((col) => col.Primal !== undefined));
  if (!solved) return { plan: null, method: 'exact', status: r.Status === 'Time limit reached' ? 'timeLimit' : 'infeasible', objective: NaN, ms };
  const { P, N, S, sizes } = model.compiled;
  const plan: Plan = { slots: [] };
  for (let s = 0; s < S; s++) {
    const weeks: Int32Array[] = [];
    for (let w = 0; w < N; w++) {
      const list = new Int32Array(sizes[s]!).fill(-1);
      let k = 0;
      for (let p = 0; p < P && k < list.length; p++) {
        if (!model.compiled.eligible[at(model.compiled, s, w, p)]) continue;
        if ((r.Columns[xName(s, w, p)]?.Primal ?? 0) > 0.5) list[k++] = p;
      }
      weeks.push(list);
    }
    plan.slots.push(weeks);
  }
  const ordered = orderPlan(inst, plan);
  return {
    plan: ordered,
    method: 'exact',
    status: r.Status === 'Optimal' ? 'optimal' : 'timeLimit',
    objective: scorePlan(inst, ordered).objective,
    ms,
  };
}
