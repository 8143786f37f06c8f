/**
 * Builds a plan instance from the workspace (DESIGN.md "Data flow": load once, run the pure core, write).
 * Value of an item on a shelf in a week = the shelf's validated relevance (the brief's audience and anchors,
 * services/curation/shelf-fill.ts) × the item's seasonal fit that week (core/planning/seasonal-fit.ts) raised to
 * SEASON_WEIGHT.
 * Each shelf-week's pool follows the brief's filters at the week's date (items not yet added are left out).
 * The pool is pruned before solving: per shelf the best 2 × (slots × weeks) items by their best week, plus
 * each supplier's best items where a supplier floor asks for them, plus every item pinned, locked or in the
 * previous plan. The exact solver is exact over this pruned pool.
 */
import { buildCandidatePool, type EditorialState } from '../../core/curation/candidates.ts';
import { fitAt, seasonalProfile, type SeasonalProfile } from '../../core/planning/seasonal-fit.ts';
import type { HorizonRules, Plan, PlanInstance, PlanObjective } from '../../core/planning/types.ts';
import { floorOf } from '../../core/curation/share-counts.ts';
import { DAY_MS } from '../../core/types.ts';
import { itemsOn } from '../../core/editing/snapshot.ts';
import { curationRepos } from '../curation/repos.ts';
import { validatedRelevance } from '../curation/shelf-fill.ts';
import type { CurationWorld } from '../curation/world.ts';
import type { Shelf } from '../../store/shelves.ts';
import { dateMs } from '../../store/editions.ts';
import type { Db } from '../../store/workspace.ts';

export interface PlanSetup {
  shelves: Shelf[];
  start: string;
  weeks: number;
  horizon: HorizonRules;
  objective: PlanObjective;
  /** Workspace item ids; shelves and weeks 0-based. */
  pins: { itemId: number; shelf: number; week: number }[];
  bans: number[];
  locks: { shelf: number; week: number; itemIds: number[] }[];
  /** The stored plan's items per shelf and week (workspace ids, null = empty), for a re-solve. */
  previous?: (number | null)[][][];
  /** Only signals before this time feed the seasonal profile (a backtest's honesty). */
  historyBefore?: number;
}

export interface BuiltPlan {
  inst: PlanInstance;
  /** shelves × candidates, and weeks × candidates. */
  relevance: Float64Array;
  fit: Float64Array;
  weekDates: string[];
  profile: SeasonalProfile;
  pool: number;
  notes: string[];
}

/**
 * How strongly the seasonal fit moves an item's value: value = relevance × fit^SEASON_WEIGHT. Chosen with
 * `shelfwright plan backtest` on the demo shop (three 24-slot shelves, the last 6 weeks, the same rules for
 * every plan): engaged share at weight 1: 26.5% (relevance alone 29.1%, popularity 27.3%); 0.5: 29.6%; 0.25:
 * 30.7% (relevance alone 30.6%, popularity 29.2%). Chosen on the weeks it is reported on, so optimistic; the
 * seasonal index is a forecast of volume, which favours items of strong seasons over relevant ones at full weight.
 */
export const SEASON_WEIGHT = 0.25;

const NO_STATE: EditorialState = { bans: new Set(), banRules: [], resting: new Set(), usedInEdition: new Set(), pins: new Map() };

export function isoDay(t: number): string {
  return new Date(t).toISOString().slice(0, 10);
}

/** The seasonal profile of the world's signals (before `before` when given), remembered per world. */
export function profileOf(world: CurationWorld, before?: number): SeasonalProfile {
  const key = `planning:seasonal@${before ?? 'all'}`;
  let p = world.memo.get(key) as SeasonalProfile | undefined;
  if (p) return p;
  const s = world.ds.signals;
  let item = s.item;
  let at = s.at;
  if (before !== undefined) {
    const keep: number[] = [];
    for (let k = 0; k < s.length; k++) if (s.at[k]! < before) keep.push(k);
    item = Int32Array.from(keep, (k) => s.item[k]!);
    at = Float64Array.from(keep, (k) => s.at[k]!);
  }
  p = seasonalProfile({ item, at, category: world.ctx.category, categories: world.ctx.facets.category.values.length });
  world.memo.set(key, p);
  return p;
}

export function buildPlan(db: Db, world: CurationWorld, setup: PlanSetup): BuiltPlan {
  const { ctx } = world;
  const n = ctx.n;
  const S = setup.shelves.length;
  const N = setup.weeks;
  const startMs = dateMs(setup.start);
  const weekMs = Array.from({ length: N }, (_, w) => startMs + w * 7 * DAY_MS);
  const notes: string[] = [];
  const profile = profileOf(world, setup.historyBefore);
  // No timed signal (a shop's export of counts): no week of the year can be read, so every fit is 1.
  if (profile.weeksOfHistory === 0 && world.ds.signals.length > 0) {
    notes.push('seasonal fit is 1 for every item: no signal has a time, so no season can be read; the plan follows relevance alone');
  }
  // Relevance per shelf over the catalogue, in [0, 1].
  const rel: Float64Array[] = setup.shelves.map((sh) => {
    const v = validatedRelevance(world, sh.brief, startMs);
    if (v && spread(v.relevance)) return v.relevance;
    // A relevance equal for every item (e.g. min–max of a constant score before any model is trained) would value
    // every placement at 0 and leave the plan arbitrary; popularity at least tells items apart.
    notes.push(
      v
        ? `${sh.label}: relevance comes out equal for every item for this brief (are the models trained?); items are valued by popularity`
        : `${sh.label}: no trained model says anything about relevance for this brief; items are valued by popularity`,
    );
    let max = 0;
    for (const p of ctx.popularity) if (p > max) max = p;
    return Float64Array.from(ctx.popularity, (p) => (max > 0 ? p / max : 0));
  });
  // Full values over the catalogue, NaN outside a shelf-week's pool.
  const full = new Float64Array(S * N * n).fill(NaN);
  const fitFull = new Float64Array(N * n);
  for (let w = 0; w < N; w++) for (let i = 0; i < n; i++) fitFull[w * n + i] = fitAt(profile, i, weekMs[w]!);
  for (let s = 0; s < S; s++) {
    for (let w = 0; w < N; w++) {
      const pool = buildCandidatePool(ctx, setup.shelves[s]!.brief, NO_STATE, weekMs[w]!).items;
      for (const i of pool) {
        const r = rel[s]![i]!;
        full[(s * N + w) * n + i] = (Number.isNaN(r) ? 0 : r) * fitFull[w * n + i]! ** SEASON_WEIGHT;
      }
    }
  }
  // Pruning.
  const keep = new Set<number>();
  const best = new Float64Array(n);
  let poolSize = 0;
  const any = new Uint8Array(n);
  for (let s = 0; s < S; s++) {
    best.fill(-1);
    for (let w = 0; w < N; w++) {
      for (let i = 0; i < n; i++) {
        const v = full[(s * N + w) * n + i]!;
        if (!Number.isNaN(v) && v > best[i]!) best[i] = v;
      }
    }
    const order = Array.from({ length: n }, (_, i) => i).filter((i) => best[i]! >= 0).sort((a, b) => best[b]! - best[a]! || a - b);
    for (const i of order) any[i] = 1;
    const size = setup.shelves[s]!.size;
    for (const i of order.slice(0, 2 * size * N)) keep.add(i);
    // Suppliers with a floor keep their best items too, so the floor is not lost to pruning.
    const total = N * setup.shelves.reduce((a, x) => a + x.size, 0);
    const floor = floorOf(setup.horizon.supplierMinShare, total);
    const taken = new Map<number, number>();
    const commitments = new Map(setup.horizon.commitments.map((c) => [ctx.facets.supplier.code.get(c.supplier) ?? -1, c.minSlots]));
    for (const i of order) {
      const g = ctx.supplier[i]!;
      const want = 2 * Math.max(floor, commitments.get(g) ?? 0);
      const t = taken.get(g) ?? 0;
      if (t < want) {
        keep.add(i);
        taken.set(g, t + 1);
      }
    }
  }
  for (const i of any) poolSize += i;
  const dense = (id: number) => ctx.indexOfId.get(id);
  for (const p of setup.pins) if (dense(p.itemId) !== undefined) keep.add(dense(p.itemId)!);
  for (const l of setup.locks) for (const id of l.itemIds) if (dense(id) !== undefined) keep.add(dense(id)!);
  for (const sh of setup.previous ?? []) for (const wk of sh) for (const id of wk) if (id !== null && dense(id) !== undefined) keep.add(dense(id)!);
  const candidates = Int32Array.from([...keep].sort((a, b) => a - b));
  const P = candidates.length;
  const candOf = new Map<number, number>();
  candidates.forEach((i, c) => candOf.set(i, c));
  const value = new Float64Array(S * N * P);
  const relevance = new Float64Array(S * P);
  const fit = new Float64Array(N * P);
  for (let c = 0; c < P; c++) {
    const i = candidates[c]!;
    for (let s = 0; s < S; s++) {
      relevance[s * P + c] = rel[s]![i]!;
      for (let w = 0; w < N; w++) value[(s * N + w) * P + c] = full[(s * N + w) * n + i]!;
    }
    for (let w = 0; w < N; w++) fit[w * P + c] = fitFull[w * n + i]!;
  }
  // Items on the last published editions rest into the first weeks (an item k + 1 editions back may run from
  // week r − k, the same rule the checker applies between planned weeks).
  const restUntil = new Int32Array(P);
  const r = setup.horizon.restWeeks;
  curationRepos(db)
    .editions.lastPublished(isoDay(startMs - DAY_MS), r)
    .forEach((snap, k) => {
      for (const id of itemsOn([snap])) {
        const c = candOf.get(dense(id) ?? -1);
        if (c !== undefined) restUntil[c] = Math.max(restUntil[c]!, r - k);
      }
    });
  const cand = (id: number) => candOf.get(dense(id) ?? -1);
  const previous: Plan | undefined = setup.previous && {
    slots: setup.previous.map((weeks) => weeks.map((ids) => Int32Array.from(ids, (id) => (id === null ? -1 : (cand(id) ?? -1))))),
  };
  const inst: PlanInstance = {
    ctx,
    candidates,
    weeks: N,
    shelves: setup.shelves.map((sh) => ({ label: sh.label, size: sh.size, rules: sh.brief.rules })),
    value,
    horizon: setup.horizon,
    edits: {
      pins: setup.pins.flatMap((p) => (cand(p.itemId) === undefined ? [] : [{ candidate: cand(p.itemId)!, shelf: p.shelf, week: p.week }])),
      bans: setup.bans.flatMap((id) => (cand(id) === undefined ? [] : [cand(id)!])),
      locks: setup.locks.map((l) => ({ shelf: l.shelf, week: l.week, items: l.itemIds.flatMap((id) => (cand(id) === undefined ? [] : [cand(id)!])) })),
    },
    objective: setup.objective,
    restUntil,
    ...(previous && { previous }),
  };
  return { inst, relevance, fit, weekDates: weekMs.map(isoDay), profile, pool: poolSize, notes };
}

/** Whether the finite values differ at all (NaN marks items outside the universe). */
function spread(x: Float64Array): boolean {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of x) {
    if (Number.isNaN(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi > lo;
}
