/**
 * Backtest of the planner on history (DESIGN.md "backtest"): the last N whole weeks of signals are replayed.
 * The planner plans those weeks with the seasonal profile of the signals before them (so no week's own demand
 * picks its items by season), and a popularity plan fills each shelf-week with the shelf's pool ranked by
 * distinct customers in the 28 days before the week (the usual floor a recommender must beat; common
 * practice, no source). Reported: of the shelves' audience active each week, the share who engaged with an
 * item planned for that week, per week and pooled over the horizon (core/planning/replay.ts).
 */
import { buildCandidatePool } from '../../core/curation/candidates.ts';
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
  weeks: { week: number; date: string; active: number; plan: number; popularity: number }[];
  share: { plan: number; popularity: number };
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
  if (!Number.isFinite(latest)) throw new InputError('the workspace has no dated signals to replay');
  const end = Math.floor(latest / DAY_MS) * DAY_MS + DAY_MS;
  const start = end - weeks * 7 * DAY_MS;
  const starts = Array.from({ length: weeks }, (_, w) => start + w * 7 * DAY_MS);
  const built = buildPlan(db, world, { shelves, start: isoDay(start), weeks, horizon, objective, pins: [], bans: [], locks: [], historyBefore: start });
  const solved = await solvePlan(built.inst, 'auto', now);
  const plan = solved.report.plan;
  const planned = starts.map((_, w) => {
    const out: number[] = [];
    plan?.slots.forEach((weeksOf) => {
      for (const c of weeksOf[w]!) if (c >= 0) out.push(built.inst.candidates[c]!);
    });
    return Int32Array.from(out);
  });
  // The popularity plan: distinct customers per item in the 28 days before each week.
  const nC = ds.customerIds.length;
  const popular = starts.map((t0) => {
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
    const used = new Set<number>();
    const out: number[] = [];
    for (const sh of shelves) {
      const pool = buildCandidatePool(ctx, sh.brief, { bans: new Set(), banRules: [], resting: new Set(), usedInEdition: used, pins: new Map() }, t0).items;
      const ranked = Array.from(pool).sort((a, b) => count[b]! - count[a]! || a - b).slice(0, sh.size);
      for (const i of ranked) {
        used.add(i);
        out.push(i);
      }
    }
    return Int32Array.from(out);
  });
  const member = new Uint8Array(nC);
  for (const sh of shelves) for (const u of resolveAudience(ds, sh.brief.audience, start, world.groups, world.groupNames)) member[u] = 1;
  const a = replayPlan(s, nC, member, starts, planned, ctx.n);
  const b = replayPlan(s, nC, member, starts, popular, ctx.n);
  const notes = [
    'relevance comes from the models trained now, which saw the replayed weeks unless trained before them, so the plan\'s share may read high; the seasonal profile saw only the weeks before',
    ...built.notes,
  ];
  if (solved.report.status === 'infeasible') notes.push('the rules could not all hold over the replayed weeks; the plan shown breaks some');
  return {
    weeks: a.weeks.map((x, w) => ({ week: w + 1, date: isoDay(x.start), active: x.active, plan: x.engaged, popularity: b.weeks[w]!.engaged })),
    share: { plan: a.share, popularity: b.share },
    method: solved.report.method,
    notes,
  };
}
