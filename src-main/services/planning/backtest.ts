/**
 * Backtest of the planner on history (DESIGN.md "backtest"): the last N whole weeks of signals are replayed.
 * The planner plans those weeks with the seasonal profile of the signals before them (so no week's own demand
 * picks its items by season), and a popularity plan fills each shelf-week with the shelf's pool ranked by
 * distinct customers in the 28 days before the week under the same rules and solver (the usual floor a
 * recommender must beat; common practice, no source), and a third plan values relevance alone (no seasonal fit). Reported: of the shelves' audience active each week, the share who engaged with an
 * item planned for that week, per week and pooled over the horizon (core/planning/replay.ts).
 */
import { InputError } from '../../core/errors.ts';
import { replayPlan } from '../../core/planning/replay.ts';
import { resolveAudience } from '../../core/scoring/index.ts';
import { DAY_MS } from '../../core/types.ts';
import type { HorizonRules, PlanObjective } from '../../core/planning/types.ts';
import type { Shelf } from '../../store/shelves.ts';
import type { Db } from '../../store/workspace.ts';
import type { CurationWorld } from '../curation/world.ts';
import { buildPlan, isoDay } from './build.ts';
import { solvePlan } from './solve.ts';

export interface PlanBacktest {
  weeks: { week: number; date: string; active: number; plan: number; popularity: number; withoutSeason: number }[];
  share: { plan: number; popularity: number; withoutSeason: number };
  method: string;
  notes: string[];
}

const POPULARITY_DAYS = 28;

export async function backtestPlan(
  db: Db,
  world: CurationWorld,
  shelves: Shelf[],
  weeks: number,
  horizon: HorizonRules,
  objective: PlanObjective,
  now: () => number,
): Promise<PlanBacktest> {
  const { ds, ctx } = world;
  const s = ds.signals;
  let latest = -Infinity;
  for (let k = 0; k < s.length; k++) if (s.at[k]! > latest) latest = s.at[k]!;
  if (!Number.isFinite(latest)) {
    throw new InputError(
      s.length === 0
        ? 'the workspace has no signals to replay'
        : `a plan backtest replays the latest weeks of signals, and none of the ${s.length.toLocaleString('en')} signals has a time: there are no past weeks to replay`,
    );
  }
  const end = Math.floor(latest / DAY_MS) * DAY_MS + DAY_MS;
  const start = end - weeks * 7 * DAY_MS;
  const starts = Array.from({ length: weeks }, (_, w) => start + w * 7 * DAY_MS);
  const built = buildPlan(db, world, { shelves, start: isoDay(start), weeks, horizon, objective, pins: [], bans: [], locks: [], historyBefore: start });
  const solved = await solvePlan(built.inst, 'auto', now);
  const plan = solved.report.plan;
  // The popularity plan: the same rules and solver, each item valued by its distinct customers in the 28 days
  // before the week (so the comparison is of what is valued, not of the rules); and the plan without seasonal
  // fit (relevance alone), which shows what the seasonal part adds.
  const nC = ds.customerIds.length;
  const { inst } = built;
  const P = inst.candidates.length;
  const popValue = new Float64Array(inst.value.length);
  starts.forEach((t0, w) => {
    const count = new Int32Array(ctx.n);
    const seen = new Set<number>();
    for (let k = 0; k < s.length; k++) {
      const t = s.at[k]!;
      if (!(t >= t0 - POPULARITY_DAYS * DAY_MS && t < t0)) continue;
      const key = s.item[k]! * nC + s.customer[k]!;
      if (seen.has(key)) continue;
      seen.add(key);
      count[s.item[k]!]!++;
    }
    for (let sh = 0; sh < shelves.length; sh++) {
      for (let c = 0; c < P; c++) {
        const at = (sh * weeks + w) * P + c;
        popValue[at] = Number.isNaN(inst.value[at]!) ? NaN : count[inst.candidates[c]!]!;
      }
    }
  });
  const relOnly = inst.value.map((v, at) => {
    const c = at % P;
    const sh = Math.floor(at / P / weeks);
    return Number.isNaN(v) ? NaN : Math.max(0, built.relevance[sh * P + c]!) || 0;
  });
  const itemsOf = (plan: { slots: Int32Array[][] } | null) =>
    starts.map((_, w) => {
      const out: number[] = [];
      plan?.slots.forEach((weeksOf) => {
        for (const c of weeksOf[w]!) if (c >= 0) out.push(inst.candidates[c]!);
      });
      return Int32Array.from(out);
    });
  const popular = itemsOf((await solvePlan({ ...inst, value: popValue }, 'heuristic', now)).report.plan);
  const noSeason = itemsOf((await solvePlan({ ...inst, value: relOnly }, 'heuristic', now)).report.plan);
  const member = new Uint8Array(nC);
  for (const sh of shelves) for (const u of resolveAudience(ds, sh.brief.audience, start, world.groups, world.groupNames)) member[u] = 1;
  const a = replayPlan(s, nC, member, starts, itemsOf(plan), ctx.n);
  const b = replayPlan(s, nC, member, starts, popular, ctx.n);
  const c = replayPlan(s, nC, member, starts, noSeason, ctx.n);
  const notes = [
    'relevance comes from the models trained now, which saw the replayed weeks unless trained before them, so the plan\'s share may read high; the seasonal profile saw only the weeks before',
    ...built.notes,
  ];
  if (solved.report.status === 'infeasible') notes.push('the rules could not all hold over the replayed weeks; the plan shown breaks some');
  return {
    weeks: a.weeks.map((x, w) => ({ week: w + 1, date: isoDay(x.start), active: x.active, plan: x.engaged, popularity: b.weeks[w]!.engaged, withoutSeason: c.weeks[w]!.engaged })),
    share: { plan: a.share, popularity: b.share, withoutSeason: c.share },
    method: solved.report.method,
    notes,
  };
}
