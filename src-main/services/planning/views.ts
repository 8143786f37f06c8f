/** A plan as shells show it: items by external id, weeks 1-based, readings with no data as NaN (the api nulls them). */
import type { PlanMeter, PlanWeekMeter } from '../../core/planning/meter.ts';
import type { Relaxation } from '../../core/planning/relax.ts';
import type { ForecastError } from '../../core/planning/seasonal.ts';
import type { PlanEditRow } from '../../store/rotation-plans.ts';
import type { CurationWorld } from '../curation/world.ts';
import type { BuiltPlan } from './build.ts';
import type { Solved } from './solve.ts';

export interface PlanSlotView {
  slot: number;
  item: string | null;
  title: string | null;
  category: string | null;
  supplier: string | null;
  promoted: boolean;
  relevance: number;
  fit: number;
  value: number;
  pinned: boolean;
}

export interface PlanView {
  name: string;
  edition: string;
  shelves: string[];
  start: string;
  method: 'exact' | 'heuristic';
  status: 'optimal' | 'feasible' | 'timeLimit' | 'infeasible';
  objective: number;
  /** 0-1 variables of the program, candidates after pruning, and the shelves' pools before it. */
  variables: number;
  candidates: number;
  pool: number;
  ms: number;
  /** Placements that differ from the stored plan (null for a first plan). */
  changed: number | null;
  weeks: { week: number; date: string; locked: string[]; shelves: { label: string; slots: PlanSlotView[] }[]; meter: PlanWeekMeter }[];
  horizon: (PlanWeekMeter & { weakestWeekValue: number }) | null;
  forecast: { method: string; baseline: string; heldOutWeeks: number; categories: ForecastError; items: ForecastError } | null;
  diagnosis: { relaxations: Relaxation[]; allTogether: boolean | null } | null;
  edits: { pins: { item: string; week: number; shelf: string }[]; bans: string[]; locks: { week: number; shelf: string }[] };
  drafts: { week: number; edition: string }[];
  notes: string[];
}

const EMPTY_METER: PlanWeekMeter = { distinctItems: 0, supplierGini: NaN, relevance: NaN, seasonalFit: NaN, value: 0 };

export function planView(a: {
  world: CurationWorld;
  name: string;
  edition: string;
  built: BuiltPlan;
  solved: Solved;
  meter: PlanMeter | null;
  changed: number | null;
  ms: number;
  edits: PlanEditRow[];
  drafts: { week: number; edition: string }[];
}): PlanView {
  const { world, built } = a;
  const { inst } = built;
  const P = inst.candidates.length;
  const N = inst.weeks;
  const ext = (id: number) => world.ds.items[world.ctx.indexOfId.get(id) ?? -1]?.externalId ?? String(id);
  const plan = a.solved.report.plan;
  const labels = inst.shelves.map((s) => s.label);
  const weeks = built.weekDates.map((date, w) => ({
    week: w + 1,
    date,
    locked: inst.edits.locks.filter((l) => l.week === w).map((l) => labels[l.shelf]!),
    shelves: inst.shelves.map((sh, s) => ({
      label: sh.label,
      slots: Array.from(plan?.slots[s]?.[w] ?? new Int32Array(sh.size).fill(-1), (c, slot): PlanSlotView => {
        if (c < 0) return { slot: slot + 1, item: null, title: null, category: null, supplier: null, promoted: false, relevance: NaN, fit: NaN, value: NaN, pinned: false };
        const it = world.ds.items[inst.candidates[c]!]!;
        return {
          slot: slot + 1,
          item: it.externalId,
          title: it.title,
          category: it.category,
          supplier: it.supplier,
          promoted: it.promoted,
          relevance: built.relevance[s * P + c]!,
          fit: built.fit[w * P + c]!,
          value: inst.value[(s * N + w) * P + c]!,
          pinned: inst.edits.pins.some((p) => p.candidate === c && p.shelf === s && p.week === w),
        };
      }),
    })),
    meter: a.meter?.weeks[w] ?? EMPTY_METER,
  }));
  const err = built.profile.error;
  return {
    name: a.name,
    edition: a.edition,
    shelves: labels,
    start: built.weekDates[0]!,
    method: a.solved.report.method,
    status: a.solved.report.status,
    objective: a.solved.report.objective,
    variables: a.solved.variables,
    candidates: P,
    pool: built.pool,
    ms: a.ms,
    changed: a.changed,
    weeks,
    horizon: a.meter?.horizon ?? null,
    forecast: err && { method: err.categories.method, baseline: err.categories.baseline, heldOutWeeks: err.categories.heldOutWeeks, categories: err.categories, items: err.items },
    diagnosis: a.solved.diagnosis && { relaxations: a.solved.diagnosis.relaxations, allTogether: a.solved.diagnosis.allTogether },
    edits: {
      pins: a.edits.flatMap((e) => (e.kind === 'pin' ? [{ item: ext(e.itemId), week: e.week + 1, shelf: labels[e.shelf] ?? '?' }] : [])),
      bans: a.edits.flatMap((e) => (e.kind === 'ban' ? [ext(e.itemId)] : [])),
      locks: a.edits.flatMap((e) => (e.kind === 'lock' ? [{ week: e.week + 1, shelf: labels[e.shelf] ?? '?' }] : [])),
    },
    drafts: a.drafts,
    notes: built.notes,
  };
}
