/**
 * The tuning grids (issue 10 item 2): log grids over decades, wide enough for real data, searched by coordinate
 * search under a budget (search.ts, model-search.ts) rather than tried in full.
 *
 * iALS: `regularization` is λ of Hu, Koren & Volinsky (2008) eq. (3) as it stands, unscaled:
 *   min Σ_u,i c_ui (p_ui − x_uᵀy_i)² + λ (Σ_u ‖x_u‖² + Σ_i ‖y_i‖²),  c_ui = 1 + α·r_ui (or 1 + α·log(1 + r_ui/ε)).
 * Nothing divides λ by the number of customers, items or interactions, so the λ that balances the data term
 * grows with the confidences (α and the values) and with the number of observations per row: on large,
 * heavy-tailed logs it lies orders of magnitude above the 0.01 default, hence 10⁻² to 10³.
 * item-kNN: neighbours up to 400 and "all" (every item, k = the catalogue size), shrinkage 0 to 200, the
 * value transform, and Deshpande & Karypis's (2004) similarity normalisation (core/models/itemknn.ts). EASE: λ from 10 to 10⁴ (Steck 2019 tunes λ over such decades) and the value transform.
 * Both: the recency half-lives of the fit and of the profile side (core/matrix/values.ts "Recency"), HALF_LIFE_GRID,
 * when the log has times.
 */
import { VALUE_TRANSFORMS } from '../../core/matrix/values.ts';
import { KNN_NORMALIZE } from '../../core/models/itemknn.ts';

export const IALS_GRID = {
  regularization: [0.01, 0.1, 1, 10, 100, 1000],
  alpha: [0.1, 1, 10, 100],
  scaling: ['linear', 'log'],
  factors: [32, 64, 128, 256],
} as const;

/** 'all' keeps every item as a neighbour: k is set to the catalogue size when the grid is laid out. */
export const ITEMKNN_GRID = { k: [10, 25, 50, 100, 200, 400, 'all'], shrink: [0, 10, 30, 100, 200], values: VALUE_TRANSFORMS, normalize: KNN_NORMALIZE } as const;

export const EASE_GRID = { lambda: [10, 30, 100, 300, 1000, 3000, 10_000], values: VALUE_TRANSFORMS } as const;

/**
 * Half-lives in days searched for recency (fit and profile side alike), in the order a line search walks them:
 * "off" (no decay, the start), then ever faster decay. Steps of ×4, so a search from "off" reaches half a year in
 * two trials and the grid spans two years (a log rarely holds more that still matters) to a week and a half
 * (shorter forgets nearly all of a typical customer's history); the search refines the best by the geometric
 * midpoints of its neighbours (360, 90, 22 days), so the resolution near the optimum is ×2. Measured with the
 * reference's own EASE (Online Retail and MovieLens 100K, validation NDCG@20), the best half-lives lay at 30–180
 * days, and "off" must stay a choice: on MovieLens the fit side at 180 days lowered validation NDCG.
 */
export const HALF_LIFE_GRID = ['off', 730, 180, 45, 11] as const;

/**
 * Whether tuning searches popularity's fit half-life (recent popularity, half-life-search.ts) by default. Off:
 * measured with it on (bench/quality/README.md "Recency"), recent popularity alone beat all-time popularity on
 * every data set (test NDCG@20 Online Retail 0.0889 against 0.0399, MovieLens 0.2388 against 0.1502; demo NDCG@10
 * 0.082 against 0.059) and made the MovieLens hybrid 0.2388 (against 0.2043), but the Online Retail hybrid fell
 * to 0.1293 from 0.1375 (about 3 paired SE): the blend learned on validation leaned on recent popularity where
 * the test window did not. Until the blend can tell the two apart it is not forced on every shop; a training
 * parameter (popularity fitHalfLifeDays) or TuneOptions.popularityHalfLife turns it on.
 */
export const POPULARITY_HALF_LIFE_SEARCHED = false;

/** The recency axes (left out of the search when no signal has a time: there is no age to decay by). */
export const RECENCY_PARAMS = ['fitHalfLifeDays', 'profileHalfLifeDays'] as const;

/** A half-life axis value as a model parameter: 'off' (or nothing) is null. */
export function halfLifeParam(v: number | string | null | undefined): number | null {
  return typeof v === 'number' ? v : null;
}

export { TUNE_BUDGET } from '../../core/models/tune-budget.ts';

/**
 * iALS trials run this many sweeps instead of the training's 15: a cheaper, lower-fidelity fit that ranks
 * settings well, since iALS's loss falls most in its first sweeps (common practice, no source; the idea of
 * judging many settings on a small budget first is that of successive halving, Jamieson & Talwalkar 2016).
 * 3, not 5: on Online Retail three sweeps kept the order of the settings that 5 and 15 give (validation
 * NDCG@20, 64 factors λ 10 log α 1 against 256 factors λ 100 log α 10: 0.090 < 0.093 at 3 sweeps, 0.093 < 0.095
 * at 5, 0.095 < 0.098 at 15) for 60% of the cost, so the same budget tries more settings.
 */
export const IALS_SEARCH_ITERATIONS = 3;

/** The parameters each model's grid varies (the hybrid is the validated blend, learned at training: no grid here). */
export const GRID_PARAMS = {
  itemknn: ['k', 'shrink', 'values', 'normalize', ...RECENCY_PARAMS],
  ials: ['regularization', 'alpha', 'scaling', 'factors'],
  ease: ['lambda', 'values', ...RECENCY_PARAMS],
} as const;

export type GridModel = keyof typeof GRID_PARAMS;

/**
 * Grid parameters the caller fixed (train.start's own values): the search holds each at the caller's value and
 * varies only the rest of that model's grid, so the settings chosen beside it are chosen for the value trained.
 */
export type FixedParams = { [M in GridModel]?: Partial<Record<(typeof GRID_PARAMS)[M][number], number | string>> };

/** The grid parameters among training parameters (iterations, seed and the like are not searched, so not "fixed"). */
export function fixedParams(params: { [M in GridModel]?: object } | undefined): FixedParams {
  const out: Record<string, Record<string, number | string>> = {};
  for (const model of Object.keys(GRID_PARAMS) as GridModel[]) {
    const given = params?.[model] as Record<string, unknown> | undefined;
    const held: Record<string, number | string> = {};
    for (const param of GRID_PARAMS[model]) {
      const v = given?.[param];
      if (typeof v === 'number' || typeof v === 'string') held[param] = v;
      // A half-life given as null is "off", held as the grid's 'off'.
      else if (v === null && (RECENCY_PARAMS as readonly string[]).includes(param)) held[param] = 'off';
    }
    if (Object.keys(held).length) out[model] = held;
  }
  return out as FixedParams;
}

/**
 * True when the caller fixed every parameter the model's grid varies: there is nothing to search. Without times
 * (`timed` false) the recency half-lives are not searched, so they need not be fixed.
 */
export function fullyFixed(model: GridModel, fixed: FixedParams, timed = true): boolean {
  const held = (fixed[model] ?? {}) as Record<string, unknown>;
  return (GRID_PARAMS[model] as readonly string[]).every((p) => held[p] !== undefined || (!timed && (RECENCY_PARAMS as readonly string[]).includes(p)));
}

/**
 * The share of iALS's budget its screening (the search at IALS_SEARCH_ITERATIONS sweeps) may spend; the rest
 * refits the best third of the screened settings at the training's sweeps (model-search.ts, promote.ts).
 * At least one half: successive halving gives each rung about the same budget (Li et al. 2018, Hyperband, §3).
 * At most the default budget's worth of the whole: a budget up to the default (`train` without --tune, bounded
 * by 3 plain fits, issue 10 item 5) all goes to the screening as before, since a full-fidelity refit (a plain fit
 * at 64 factors, 5 screening trials) would cost the screening the refinement the demo shop's λ needs (32 against
 * 10: validation NDCG@10 0.167 against 0.143 at 3 sweeps; with half the budget the search stopped at 10, whose
 * 15-sweep refit scored 0.124); a larger budget buys the promotion rung first.
 */
export function ialsScreenShare(budget: number, defaultBudget: number): number {
  return Math.max(0.5, Math.min(1, defaultBudget / budget));
}
