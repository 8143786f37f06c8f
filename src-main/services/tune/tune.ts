/**
 * Tuning (issue 6 item 4, issue 10 item 2): each model's log grid (grid.ts) is searched by coordinate search
 * under a budget of plain fits (model-search.ts, search.ts), every trial fitted on the train part of a seeded
 * validation split (split.ts) and measured by NDCG@K on the validation part; the best setting of each model
 * is what `train` then refits on all signals. What the hybrid serves is the validated blend, learned after
 * the refit on the same split (blend.ts); tuning no longer searches a content weight of its own (that
 * search's result was never served).
 *
 * Parameters the caller fixed (TuneOptions.fixed, the user's own training values) are held at the caller's
 * value: the grid varies only the rest of that model's parameters (grid points de-duplicated after fixing),
 * and a model whose every grid parameter is fixed is not searched (its record has no trials and
 * `searched: false`; it is still fitted once at its start point).
 *
 * Choice rule: the highest NDCG@K; a later trial must beat the best so far by more than 1e-9, so ties keep
 * the earlier (grid-order) setting and the outcome does not depend on floating-point noise.
 */
import { InputError } from '../../core/errors.ts';
import { evalTruth, RankingEvaluator, sampleTruth, type EvalResult } from '../../core/eval/index.ts';
import { buildInteractionMatrix } from '../../core/matrix/build.ts';
import { signalUnit } from '../../core/matrix/signal-unit.ts';
import type { ValueTransform } from '../../core/matrix/values.ts';
import { ContentModel, contentVectors } from '../../core/models/content.ts';
import { fitPopularity } from '../../core/models/popularity.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import { transpose } from '../../core/matrix/csr.ts';
import type { KnnNormalize } from '../../core/models/itemknn.ts';
import { seededRng } from '../../core/rng.ts';
import type { Dataset } from '../../core/types.ts';
import { TRAIN_EASE_DEFAULTS, type TrainOptions } from '../train/train-models.ts';
import { halfLifeParam, POPULARITY_HALF_LIFE_SEARCHED, TUNE_BUDGET, type FixedParams, type GridModel } from './grid.ts';
import type { HalfLifeSearcher, HalfLifeTuning } from './half-life-search.ts';
import { hasAges, searchModels } from './model-search.ts';
import { contentCost, contentScoreCost, costSizes, popularityCost } from './trial-cost.ts';
import type { AxisValue } from './search.ts';
import { TOO_LITTLE_TO_TUNE, validationSplit } from './split.ts';

/** Largest catalogue whose EASE λ is searched (each fit costs n³/2: seconds here, minutes at 20,000). */
const EASE_TUNE_MAX_ITEMS = 5000;

export type TrialParams = Record<string, number | string>;

export interface GridTrial {
  params: TrialParams;
  ndcg: number;
  /** Recall@K with denominator min(K, |truth|) (Liang et al. 2018). */
  recall: number;
  elapsedMs: number;
}

export interface ModelTuning {
  model: 'itemknn' | 'ials' | 'ease';
  /** Grid order; empty when the model was not searched. */
  trials: GridTrial[];
  /** The best trial's setting; when not searched, the caller's fixed setting. */
  best: TrialParams;
  /** NDCG@K of the best trial; NaN when not searched. */
  ndcg: number;
  /** The grid parameters held at the caller's value in every trial (empty when none). */
  fixed: TrialParams;
  /** False when the caller fixed every parameter of the model's grid, so no grid point was tried. */
  searched: boolean;
  /** What the coordinate search covered: each axis's values, its budget and spend in plain fits, why it stopped. */
  search?: { axes: Record<string, AxisValue[]>; budgetPlainFits: number; spentPlainFits: number; stopped: 'converged' | 'budget' };
}

export interface TuneResult {
  k: number;
  seed: number;
  split: { method: 'time' | 'random'; train: number; validation: number; customers: number; from: number | null };
  models: ModelTuning[];
  /** The best settings as training parameters. */
  params: NonNullable<TrainOptions['params']>;
  /** The budget in plain fits, and the predicted cost (services/tune/trial-cost.ts) of one plain fit of the searched models and of the searches. */
  budget: { plainFits: number; plainMs: number; spentMs: number };
  elapsedMs: number;
  /** What the search left out or decided by a rule, each about one model (stored with that model: train-tuned.ts). */
  notes: TunerNote[];
  /** Popularity's fit and content's profile half-life searches (half-life-search.ts); empty on a log without times. */
  halfLives: HalfLifeTuning[];
}

/** One of the tuner's notes, and the model it is about. */
export interface TunerNote {
  model: GridModel;
  text: string;
}

export interface TuneOptions {
  /** K of NDCG@K. Default 10. */
  k?: number;
  seed?: number;
  /** Validation customers measured (seeded sample). Default 1,000. */
  sampleCustomers?: number;
  /** iALS sweeps of the final training (trials run fewer: grid.ts IALS_SEARCH_ITERATIONS). Default 15. */
  iterations?: number;
  /**
   * Search popularity's fit half-life (recent popularity) too. Default false (grid.ts
   * POPULARITY_HALF_LIFE_SEARCHED): measured, it lifts popularity and the MovieLens hybrid but lowers the Online
   * Retail hybrid beyond noise, so it is not forced on every shop.
   */
  popularityHalfLife?: boolean;
  /** Search content's profile half-life (default true; false when the caller gave it: it is held, not searched). */
  contentHalfLife?: boolean;
  /** Plain fits the per-model searches may spend (grid.ts TUNE_BUDGET). Default 3. */
  budget?: number;
  threads?: number;
  /** Grid parameters held at these values (the caller's own training parameters); the rest is searched. */
  fixed?: FixedParams;
  signal?: AbortSignal;
  /** The clock trials are timed by, for the record only (default performance.now): the search never reads it. */
  now?: () => number;
  onProgress?: (p: { model: string; trial: number; trials: number; fraction: number }) => void;
}

export async function tuneDataset(ds: Dataset, o: TuneOptions = {}): Promise<TuneResult> {
  const now = o.now ?? (() => performance.now());
  const started = now();
  const k = o.k ?? 10;
  const seed = o.seed ?? 1;
  if (!Number.isInteger(k) || k < 1) throw new InputError(`k must be a whole number >= 1, got ${k}`, { column: 'k' });
  const budget = o.budget ?? TUNE_BUDGET.default;
  if (!(budget >= TUNE_BUDGET.min && budget <= TUNE_BUDGET.max)) {
    throw new InputError(`budget must be from ${TUNE_BUDGET.min} to ${TUNE_BUDGET.max} plain fits, got ${budget}`, { column: 'budget' });
  }
  if (ds.items.length === 0 || ds.signals.length === 0) throw new InputError('nothing to tune: import items and signals first');
  const notes: TunerNote[] = [];
  const split = validationSplit(ds, { seed });
  const train = buildInteractionMatrix(ds, { rows: split.train });
  const validation = buildInteractionMatrix(ds, { rows: split.validation });
  const truth = sampleTruth(evalTruth(train, validation, undefined, split.unavailable), o.sampleCustomers ?? 1000, seededRng(seed));
  const ev = new RankingEvaluator(train, truth, k, split.unavailable);
  if (ev.customerCount === 0) throw new InputError(TOO_LITTLE_TO_TUNE);
  const useEase = ds.items.length <= EASE_TUNE_MAX_ITEMS;
  if (!useEase) notes.push({ model: 'ease', text: `EASE not tuned: ${ds.items.length} items, above ${EASE_TUNE_MAX_ITEMS} (each fit would take minutes); it trains with the default lambda` });

  const fixed = o.fixed ?? {};
  const measure = (name: string, m: Scorer, perCustomer?: Float64Array): EvalResult => ev.evaluateFill(name, (u, _c, out) => m.scoreInto(u, train, out), perCustomer);
  const iterations = o.iterations ?? 15;
  const searched = await searchModels({
    // Built only on a timed log (the searches run only there; content's vectors cost a pass over the text).
    halfLives: hasAges(train) ? halfLifeSearchers(ds, train, ev.customerCount, o.popularityHalfLife ?? POPULARITY_HALF_LIFE_SEARCHED, o.contentHalfLife ?? true) : [],
    train,
    measure,
    budget,
    useEase,
    fixed,
    iterations,
    ialsEpsilon: signalUnit(ds),
    seed,
    customers: ev.customerCount,
    now,
    ...(o.threads !== undefined && { threads: o.threads }),
    ...(o.signal && { signal: o.signal }),
    onTrial: (model, t, spentShare) => o.onProgress?.({ model, trial: t, trials: 0, fraction: spentShare }),
  });
  notes.push(...searched.notes);
  const models: ModelTuning[] = [...searched.tunings];
  o.onProgress?.({ model: models.at(-1)?.model ?? 'ials', trial: 0, trials: 0, fraction: 1 });

  const best = (name: string) => models.find((m) => m.model === name)?.best;
  const bk = best('itemknn')!;
  const bi = best('ials')!;
  const be = best('ease');
  // The recency half-lives as training parameters ('off' is null), only where they were searched or fixed.
  const recency = (b: TrialParams) =>
    Object.fromEntries((['fitHalfLifeDays', 'profileHalfLifeDays'] as const).filter((n) => b[n] !== undefined).map((n) => [n, halfLifeParam(b[n])]));
  const ialsSetting = {
    factors: bi['factors'] as number,
    regularization: bi['regularization'] as number,
    alpha: bi['alpha'] as number,
    scaling: bi['scaling'] as 'linear' | 'log',
  };
  return {
    k,
    seed,
    split: { method: split.method, train: split.train.length, validation: split.validation.length, customers: ev.customerCount, from: split.from },
    models,
    params: {
      itemknn: { k: bk['k'] as number, shrink: bk['shrink'] as number, values: bk['values'] as ValueTransform, normalize: bk['normalize'] as KnnNormalize, ...recency(bk) },
      ials: { ...ialsSetting, seed, ...(o.iterations !== undefined && { iterations: o.iterations }) },
      ...(be && { ease: { ...TRAIN_EASE_DEFAULTS, lambda: be['lambda'] as number, values: be['values'] as ValueTransform, ...recency(be) } }),
      // Popularity's and content's half-lives, where searched ('off' is null).
      ...Object.fromEntries(searched.halfLives.map((h) => [h.model, { [h.param]: h.best }])),
    },
    budget: { plainFits: budget, plainMs: searched.plainMs, spentMs: searched.spentMs },
    elapsedMs: now() - started,
    notes,
    halfLives: searched.halfLives,
  };
}

/**
 * Popularity's and content's half-life searchers on the validation split's train part. Content's item vectors
 * (the default content parameters; the text pass, linear in the catalogue, is not charged) are built once and
 * scored without neighbour lists, which scoring does not read; its trials only measure.
 */
function halfLifeSearchers(
  ds: Dataset,
  train: ReturnType<typeof buildInteractionMatrix>,
  customers: number,
  popularity: boolean,
  searchContent: boolean,
): HalfLifeSearcher[] {
  const sizes = costSizes(train, customers);
  if (!searchContent) return popularity ? [popularitySearcher(train, sizes)] : [];
  const { vectors } = contentVectors(ds.items);
  const postings = transpose(vectors);
  let postingPairs = 0;
  for (let f = 0; f < postings.rows; f++) postingPairs += (postings.indptr[f + 1]! - postings.indptr[f]!) ** 2;
  const noLists = { items: vectors.rows, indptr: new Int32Array(vectors.rows + 1), indices: new Int32Array(0), data: new Float32Array(0) };
  let content: ContentModel | null = null;
  return [
    ...(popularity ? [popularitySearcher(train, sizes)] : []),
    {
      model: 'content',
      param: 'profileHalfLifeDays',
      cost: contentScoreCost(sizes, postingPairs),
      plain: contentCost(sizes, postingPairs),
      fit: (h) => (content ??= new ContentModel(vectors, noLists)).withProfileHalfLife(h),
    },
  ];
}

function popularitySearcher(train: ReturnType<typeof buildInteractionMatrix>, sizes: ReturnType<typeof costSizes>): HalfLifeSearcher {
  return { model: 'popularity', param: 'fitHalfLifeDays', cost: popularityCost(sizes), plain: popularityCost(sizes), fit: (h) => fitPopularity(train, 'presence', h).model };
}
