/** Seeded random plan instances for the planner's tests and bench (invented items, no real names). */
import { buildCurationContext } from '../../src-main/core/curation/context.ts';
import type { Rules } from '../../src-main/core/curation/types.ts';
import type { PlanInstance, HorizonRules } from '../../src-main/core/planning/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Item } from '../../src-main/core/types.ts';

export interface RandomSpec {
  seed: number;
  items: number;
  weeks: number;
  shelves: number;
  size: number;
  suppliers?: number;
  categories?: number;
  promotedShare?: number;
  rules?: Partial<Rules>;
  horizon?: Partial<HorizonRules>;
  minWeekWeight?: number;
  /** Share of (shelf, week, item) cells left out of a shelf's filters. */
  holes?: number;
}

export function plainRules(over: Partial<Rules> = {}): Rules {
  return { quotas: [], promoted: {}, restPeriod: 0, allowRepeatInEdition: false, ...over };
}

export function randomInstance(spec: RandomSpec): PlanInstance {
  const rng = seededRng(spec.seed);
  const G = spec.suppliers ?? 4;
  const C = spec.categories ?? 3;
  const items: Item[] = Array.from({ length: spec.items }, (_, k) => ({
    id: k + 1,
    externalId: `I${k + 1}`,
    title: `item ${k + 1}`,
    description: '',
    category: `cat${rng.int(C)}`,
    tags: [],
    supplier: `sup${rng.int(G)}`,
    price: null,
    addedAt: null,
    promoted: rng.next() < (spec.promotedShare ?? 0.2),
    available: true,
    attributes: {},
  }));
  const ctx = buildCurationContext(items, { vectors: new Float32Array(items.length).fill(1), dim: 1, popularity: new Float64Array(items.length) });
  const P = spec.items;
  const value = new Float64Array(spec.shelves * spec.weeks * P);
  // Relevance per (shelf, item) times a seasonal bump per (item, week): weeks differ as they do in a shop.
  const base = Float64Array.from({ length: spec.shelves * P }, () => rng.next());
  const peak = Int32Array.from({ length: P }, () => rng.int(spec.weeks));
  for (let s = 0; s < spec.shelves; s++) {
    for (let w = 0; w < spec.weeks; w++) {
      for (let p = 0; p < P; p++) {
        const fit = 0.6 + 0.8 * Math.exp(-((w - peak[p]!) ** 2) / 2);
        value[(s * spec.weeks + w) * P + p] = rng.next() < (spec.holes ?? 0) ? NaN : Number((base[s * P + p]! * fit).toFixed(6));
      }
    }
  }
  return {
    ctx,
    candidates: Int32Array.from({ length: P }, (_, k) => k),
    weeks: spec.weeks,
    shelves: Array.from({ length: spec.shelves }, (_, s) => ({ label: `shelf ${s + 1}`, size: spec.size, rules: plainRules(spec.rules) })),
    value,
    horizon: { restWeeks: 1, maxAppearances: 2, supplierMinShare: 0, supplierMaxShare: 1, commitments: [], sponsoredMaxShare: 1, ...spec.horizon },
    edits: { pins: [], bans: [], locks: [] },
    objective: { minWeekWeight: spec.minWeekWeight ?? 0.3, keepWeight: 0 },
  };
}
