/**
 * The plan's meter, per week and for the horizon: distinct items, supplier exposure Gini (the edition meter's
 * own reading, core/curation/edition-meter.ts, over the week's shelves, and over every shelf-week of the
 * horizon), predicted relevance (mean validated relevance of the planned items), seasonal fit (mean fit) and
 * the week's predicted value (what the objective adds up).
 */
import { meterEdition } from '../curation/edition-meter.ts';
import { valueAt } from './objective.ts';
import type { Plan, PlanInstance } from './types.ts';

export interface PlanWeekMeter {
  distinctItems: number;
  supplierGini: number;
  relevance: number;
  seasonalFit: number;
  value: number;
}

export interface PlanMeter {
  weeks: PlanWeekMeter[];
  horizon: PlanWeekMeter & { weakestWeekValue: number };
}

/** relevance: shelves × candidates; fit: weeks × candidates. */
export function meterPlan(inst: PlanInstance, plan: Plan, relevance: Float64Array, fit: Float64Array): PlanMeter {
  const P = inst.candidates.length;
  const dense = (list: Int32Array) => Int32Array.from(list, (c) => (c < 0 ? -1 : inst.candidates[c]!));
  const read = (cells: { s: number; w: number; list: Int32Array }[]): PlanWeekMeter => {
    const items = new Set<number>();
    let rel = 0;
    let fits = 0;
    let value = 0;
    let n = 0;
    for (const { s, w, list } of cells) {
      for (const c of list) {
        if (c < 0) continue;
        items.add(c);
        const r = relevance[s * P + c]!;
        const f = fit[w * P + c]!;
        const rr = Number.isNaN(r) ? 0 : r;
        rel += rr;
        fits += f;
        value += valueAt(inst, s, w, c);
        n++;
      }
    }
    const g = meterEdition(inst.ctx, cells.map((x) => dense(x.list))).supplierExposureGini;
    return { distinctItems: items.size, supplierGini: g, relevance: n ? rel / n : NaN, seasonalFit: n ? fits / n : NaN, value };
  };
  const weeks: PlanWeekMeter[] = [];
  const all: { s: number; w: number; list: Int32Array }[] = [];
  for (let w = 0; w < inst.weeks; w++) {
    const cells = plan.slots.map((weeksOf, s) => ({ s, w, list: weeksOf[w]! }));
    all.push(...cells);
    weeks.push(read(cells));
  }
  const horizon = read(all);
  return { weeks, horizon: { ...horizon, weakestWeekValue: Math.min(...weeks.map((x) => x.value)) } };
}
