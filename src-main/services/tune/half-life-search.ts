/**
 * The half-life searches of popularity (fit side: recent popularity) and content (profile side), the two models
 * with no other tuned parameter (issue 10; DEVELOPERS.md "Recency"). Each is the one recency axis of item-kNN and
 * EASE (grid.ts HALF_LIFE_GRID, refined at the midpoints), walked by the same coordinate search from 'off', and
 * leaves 'off' only for a paired gain of two standard errors on the validation customers (model-search.ts
 * `significantlyBetter`): a log where age says nothing keeps both off. Every trial is charged its predicted cost
 * (trial-cost.ts popularityCost, contentScoreCost): a measurement, a pass over the entries for popularity, no refit
 * for content (its item vectors do not depend on the profile's half-life).
 */
import type { EvalResult } from '../../core/eval/index.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import { HALF_LIFE_GRID, halfLifeParam } from './grid.ts';
import { significantlyBetter } from './model-search.ts';
import { coordinateSearch, type Point } from './search.ts';

export type HalfLifeModel = 'popularity' | 'content';

export interface HalfLifeSearcher {
  model: HalfLifeModel;
  /** The training parameter searched. */
  param: 'fitHalfLifeDays' | 'profileHalfLifeDays';
  /** The model at half-life h (null: off). */
  fit: (h: number | null) => Scorer;
  /** Predicted cost of one trial (its start at 'off' included), trial-cost.ts units. */
  cost: number;
  /** Predicted cost of the model's plain fit and measurement (what the budget is counted in). */
  plain: number;
}

export interface HalfLifeTuning {
  model: HalfLifeModel;
  param: HalfLifeSearcher['param'];
  /** Every half-life measured (start first), validation NDCG@K. */
  trials: { halfLife: number | 'off'; ndcg: number }[];
  /** The half-life chosen, null for off. */
  best: number | null;
  ndcg: number;
  /** Predicted cost spent (the start included) and its budget, trial-cost.ts units. */
  spentMs: number;
  budgetMs: number;
  stopped: 'converged' | 'budget';
}

export async function searchHalfLife(
  s: HalfLifeSearcher,
  o: { budget: number; customers: number; measure: (name: string, m: Scorer, perCustomer?: Float64Array) => EvalResult; signal?: AbortSignal },
): Promise<HalfLifeTuning> {
  const per = new Map<string, Float64Array>();
  const trials: HalfLifeTuning['trials'] = [];
  const keyOf = (p: Point) => String(p[s.param]);
  const found = await coordinateSearch({
    axes: [{ name: s.param, values: HALF_LIFE_GRID, ordered: true, refine: true, simplest: 'off' }],
    start: { [s.param]: 'off' },
    budget: o.budget,
    cost: () => s.cost,
    ...(o.signal && { signal: o.signal }),
    evaluate: (p) => {
      const h = halfLifeParam(p[s.param]);
      const perCustomer = new Float64Array(o.customers);
      const r = o.measure(s.model, s.fit(h), perCustomer);
      per.set(keyOf(p), perCustomer);
      trials.push({ halfLife: h ?? 'off', ndcg: r.ndcg });
      return r.ndcg;
    },
    significant: (a, b) => {
      const x = per.get(keyOf(a));
      const y = per.get(keyOf(b));
      return x !== undefined && y !== undefined && significantlyBetter(x, y);
    },
  });
  return {
    model: s.model,
    param: s.param,
    trials,
    best: halfLifeParam(found.best[s.param]),
    ndcg: found.score,
    spentMs: found.spent,
    budgetMs: o.budget,
    stopped: found.stopped,
  };
}
