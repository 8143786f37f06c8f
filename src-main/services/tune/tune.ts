/**
 * Tuning (issue 6 item 4, issue 10 item 2): each model's log grid (grid.ts) is searched by coordinate search
 * under a budget of plain fits (model-search.ts, search.ts), every trial fitted on the train part of a seeded
 * validation split (split.ts) and measured by NDCG@K on the validation part; the best setting of each model
 * is what `train` then refits on all signals. The hybrid's content weight is tuned last, over the
 * best item-kNN and iALS of the grid, so it can reach items nobody has interacted with (cold start: the
 * hybrid substitutes content for the collaborative and audience components of such items).
 *
 * Parameters the caller fixed (TuneOptions.fixed, the user's own training values) are held at the caller's
 * value: the grid varies only the rest of that model's parameters (grid points de-duplicated after fixing),
 * and a model whose every grid parameter is fixed is not searched (its record has no trials and
 * `searched: false`; item-kNN and iALS are then fitted once all the same, as the hybrid's components).
 *
 * Choice rule: the highest NDCG@K; a later trial must beat the best so far by more than 1e-9, so ties keep
 * the earlier (grid-order) setting and the outcome does not depend on floating-point noise.
 */
import { DEFAULT_WEIGHTS } from '../../core/editing/brief-schema.ts';
import { CancelledError, InputError } from '../../core/errors.ts';
import { evalTruth, RankingEvaluator, sampleTruth, type EvalResult } from '../../core/eval/index.ts';
import { buildInteractionMatrix } from '../../core/matrix/build.ts';
import { fitContent } from '../../core/models/content.ts';
import type { ValueTransform } from '../../core/matrix/values.ts';
import { trendRatios } from '../../core/models/popularity.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import { seededRng } from '../../core/rng.ts';
import { CustomerHybrid, HybridScorer } from '../../core/scoring/index.ts';
import type { Dataset } from '../../core/types.ts';
import { columnCounts, datasetDate } from '../holdout/trained.ts';
import { TRAIN_EASE_DEFAULTS, type TrainOptions } from '../train/train-models.ts';
import { HYBRID_CONTENT_GRID, TUNE_BUDGET, type FixedParams } from './grid.ts';
import { searchModels } from './model-search.ts';
import type { AxisValue } from './search.ts';
import { validationSplit } from './split.ts';

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
  model: 'itemknn' | 'ials' | 'ease' | 'hybrid';
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
  /** The best content weight of the hybrid (other weights at the brief defaults). */
  hybridContentWeight: number;
  /** The best settings as training parameters. */
  params: NonNullable<TrainOptions['params']>;
  /** The budget in plain fits, what one plain fit of the searched models took here, and what the searches spent. */
  budget: { plainFits: number; plainMs: number; spentMs: number };
  elapsedMs: number;
  notes: string[];
}

export interface TuneOptions {
  /** K of NDCG@K. Default 10. */
  k?: number;
  seed?: number;
  /** Validation customers measured (seeded sample). Default 1,000. */
  sampleCustomers?: number;
  /** iALS sweeps of the final training (trials run fewer: grid.ts IALS_SEARCH_ITERATIONS). Default 15. */
  iterations?: number;
  /** Plain fits the per-model searches may spend (grid.ts TUNE_BUDGET). Default 2. */
  budget?: number;
  threads?: number;
  /** Grid parameters held at these values (the caller's own training parameters); the rest is searched. */
  fixed?: FixedParams;
  signal?: AbortSignal;
  onProgress?: (p: { model: string; trial: number; trials: number; fraction: number }) => void;
}

export async function tuneDataset(ds: Dataset, o: TuneOptions = {}): Promise<TuneResult> {
  const started = performance.now();
  const k = o.k ?? 10;
  const seed = o.seed ?? 1;
  if (!Number.isInteger(k) || k < 1) throw new InputError(`k must be a whole number >= 1, got ${k}`, { column: 'k' });
  const budget = o.budget ?? TUNE_BUDGET.default;
  if (!(budget >= TUNE_BUDGET.min && budget <= TUNE_BUDGET.max)) {
    throw new InputError(`budget must be from ${TUNE_BUDGET.min} to ${TUNE_BUDGET.max} plain fits, got ${budget}`, { column: 'budget' });
  }
  if (ds.items.length === 0 || ds.signals.length === 0) throw new InputError('nothing to tune: import items and signals first');
  const notes: string[] = [];
  const split = validationSplit(ds, { seed });
  const train = buildInteractionMatrix(ds, { rows: split.train });
  const validation = buildInteractionMatrix(ds, { rows: split.validation });
  const truth = sampleTruth(evalTruth(train, validation, undefined, split.unavailable), o.sampleCustomers ?? 1000, seededRng(seed));
  const ev = new RankingEvaluator(train, truth, k, split.unavailable);
  if (ev.customerCount === 0) throw new InputError('no customer has both train history and new validation items: too little data to tune');
  const useEase = ds.items.length <= EASE_TUNE_MAX_ITEMS;
  if (!useEase) notes.push(`EASE not tuned: ${ds.items.length} items, above ${EASE_TUNE_MAX_ITEMS} (each fit would take minutes); it trains with the default lambda`);

  const fixed = o.fixed ?? {};
  // Progress: the per-model searches take the first 90% of the bar (by budget spent), the hybrid's grid the rest.
  const SEARCH_SHARE = 0.9;
  const total = HYBRID_CONTENT_GRID.length;
  let done = 0;
  // Fits run on this thread; yielding to the event loop before each one lets a poller (the CLI, the app's
  // job status) see the progress and a cancel arrive between trials.
  const step = async (model: string): Promise<void> => {
    await new Promise((r) => setImmediate(r));
    if (o.signal?.aborted) throw new CancelledError('tuning cancelled');
    o.onProgress?.({ model, trial: done + 1, trials: total, fraction: SEARCH_SHARE + ((1 - SEARCH_SHARE) * done) / total });
    done++;
  };
  const measure = (name: string, m: Scorer): EvalResult => ev.evaluate({ name, scoreInto: (u, h, out) => m.scoreInto(u, h, out) });
  const trial = (params: TrialParams, r: EvalResult, t0: number): GridTrial => ({
    params,
    ndcg: r.ndcg,
    recall: r.cappedRecall,
    elapsedMs: performance.now() - t0,
  });
  const fitOpts = o.signal ? { signal: o.signal } : {};
  const iterations = o.iterations ?? 15;
  const searched = await searchModels({
    train,
    measure,
    budget,
    useEase,
    fixed,
    iterations,
    seed,
    ...(o.threads !== undefined && { threads: o.threads }),
    ...(o.signal && { signal: o.signal }),
    onTrial: (model, t, spentShare) => o.onProgress?.({ model, trial: t, trials: 0, fraction: SEARCH_SHARE * spentShare }),
  });
  notes.push(...searched.notes);
  const models: ModelTuning[] = [...searched.tunings];
  const knn = { bestModel: searched.itemknn };
  const ials = { bestModel: searched.ials };

  // The hybrid's content weight, over the best collaborative and affinity models.
  const content = fitContent(ds.items, {}, fitOpts).model;
  const date = split.from ?? datasetDate(ds);
  const h = new HybridScorer(
    { content, collaborative: knn.bestModel!, affinity: ials.bestModel! },
    {
      customersPerItem: columnCounts(train),
      trend: split.method === 'time' ? Float32Array.from(trendRatios(ds, { now: date })) : null,
      addedAt: Float64Array.from(ds.items, (it) => it.addedAt ?? Number.NaN),
    },
  );
  const hybrid = new CustomerHybrid(h, train, date);
  hybrid.precompute(ev.customers);
  const hy = new Search<Scorer>('hybrid', {});
  for (const content of HYBRID_CONTENT_GRID) {
    await step('hybrid');
    const t0 = performance.now();
    const eff = hybrid.effective({ ...DEFAULT_WEIGHTS, content });
    const r = ev.evaluateFill('hybrid', (_u, c, out) => hybrid.blendCached(c, eff, out));
    hy.offer(trial({ content }, r, t0), null);
  }
  models.push(hy.result());
  o.onProgress?.({ model: 'hybrid', trial: total, trials: total, fraction: 1 });

  const best = (name: string) => models.find((m) => m.model === name)?.best;
  const bk = best('itemknn')!;
  const bi = best('ials')!;
  const be = best('ease');
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
    hybridContentWeight: best('hybrid')!['content'] as number,
    params: {
      itemknn: { k: bk['k'] as number, shrink: bk['shrink'] as number, values: bk['values'] as ValueTransform },
      ials: { ...ialsSetting, seed, ...(o.iterations !== undefined && { iterations: o.iterations }) },
      ...(be && { ease: { ...TRAIN_EASE_DEFAULTS, lambda: be['lambda'] as number, values: be['values'] as ValueTransform } }),
    },
    budget: { plainFits: budget, plainMs: searched.plainMs, spentMs: searched.spentMs },
    elapsedMs: performance.now() - started,
    notes,
  };
}

/** The running best of one model's grid (first of equals kept), or the one setting of a model not searched. */
class Search<M> {
  readonly trials: GridTrial[] = [];
  best: GridTrial | null = null;
  bestModel: M | null = null;
  private held: TrialParams | null = null;
  constructor(
    readonly model: ModelTuning['model'],
    readonly fixed: TrialParams,
  ) {}
  /** Every grid parameter fixed by the caller: this setting is the result, with no trial (model: its fit, if any). */
  hold(params: TrialParams, model: M | null): void {
    this.held = params;
    this.bestModel = model;
  }
  offer(t: GridTrial, model: M | null): void {
    this.trials.push(t);
    const score = Number.isNaN(t.ndcg) ? -1 : t.ndcg;
    if (!this.best || score > (Number.isNaN(this.best.ndcg) ? -1 : this.best.ndcg) + 1e-9) {
      this.best = t;
      this.bestModel = model;
    }
  }
  result(): ModelTuning {
    if (this.held) return { model: this.model, trials: [], best: this.held, ndcg: Number.NaN, fixed: this.fixed, searched: false };
    return { model: this.model, trials: this.trials, best: this.best!.params, ndcg: this.best!.ndcg, fixed: this.fixed, searched: true };
  }
}
