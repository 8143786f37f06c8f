/**
 * Tuning (issue 6 item 4): each model's small grid (grid.ts) is fitted on the train part of a seeded
 * validation split (split.ts) and measured by NDCG@K on the validation part; the best setting of each model
 * is what `train --tune` then refits on all signals. The hybrid's content weight is tuned last, over the
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
import { fitEase } from '../../core/models/ease.ts';
import type { IalsParams } from '../../core/models/ials-params.ts';
import { fitItemKnn } from '../../core/models/itemknn.ts';
import { trendRatios } from '../../core/models/popularity.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import { seededRng } from '../../core/rng.ts';
import { CustomerHybrid, HybridScorer } from '../../core/scoring/index.ts';
import type { Dataset } from '../../core/types.ts';
import { columnCounts, datasetDate } from '../holdout/trained.ts';
import { fitIalsThreaded } from '../train/ials-threads.ts';
import { TRAIN_EASE_DEFAULTS, type TrainOptions } from '../train/train-models.ts';
import {
  EASE_GRID,
  fullyFixed,
  HYBRID_CONTENT_GRID,
  IALS_CONFIDENCE_GRID,
  IALS_SIZE_GRID,
  itemKnnTrials,
  withFixed,
  type FixedParams,
} from './grid.ts';
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
  elapsedMs: number;
  notes: string[];
}

export interface TuneOptions {
  /** K of NDCG@K. Default 10. */
  k?: number;
  seed?: number;
  /** Validation customers measured (seeded sample). Default 1,000. */
  sampleCustomers?: number;
  /** iALS sweeps per trial. Default 15 (the training default). */
  iterations?: number;
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
  if (ds.items.length === 0 || ds.signals.length === 0) throw new InputError('nothing to tune: import items and signals first');
  const notes: string[] = [];
  const split = validationSplit(ds, { seed });
  const train = buildInteractionMatrix(ds, { rows: split.train });
  const validation = buildInteractionMatrix(ds, { rows: split.validation });
  const truth = sampleTruth(evalTruth(train, validation), o.sampleCustomers ?? 1000, seededRng(seed));
  const ev = new RankingEvaluator(train, truth, k);
  if (ev.customerCount === 0) throw new InputError('no customer has both train history and new validation items: too little data to tune');
  const useEase = ds.items.length <= EASE_TUNE_MAX_ITEMS;
  if (!useEase) notes.push(`EASE not tuned: ${ds.items.length} items, above ${EASE_TUNE_MAX_ITEMS} (each fit would take minutes); it trains with the default lambda`);

  const fixed = o.fixed ?? {};
  const itemknn = withFixed(itemKnnTrials(), fixed.itemknn);
  const knnSearched = !fullyFixed('itemknn', fixed);
  const easeSearched = useEase && !fullyFixed('ease', fixed);
  const easeLambdas = withFixed(EASE_GRID.lambda.map((lambda) => ({ lambda })), fixed.ease);
  // iALS: the size grid's first point is the setting the confidence stage runs at (grid.ts), so the size
  // stage skips it; fixing can merge points of either stage.
  const ialsSearched = !fullyFixed('ials', fixed);
  const confidences = withFixed(IALS_CONFIDENCE_GRID, fixed.ials);
  const sizes = withFixed(IALS_SIZE_GRID, fixed.ials);
  // A model not searched still costs one fit when the hybrid needs it (item-kNN, iALS), none for EASE.
  const total =
    itemknn.length + (easeSearched ? easeLambdas.length : 0) + (ialsSearched ? confidences.length + sizes.length - 1 : 1) + HYBRID_CONTENT_GRID.length;
  let done = 0;
  // Fits run on this thread; yielding to the event loop before each one lets a poller (the CLI, the app's
  // job status) see the progress and a cancel arrive between trials.
  const step = async (model: string): Promise<void> => {
    await new Promise((r) => setImmediate(r));
    if (o.signal?.aborted) throw new CancelledError('tuning cancelled');
    o.onProgress?.({ model, trial: done + 1, trials: total, fraction: done / total });
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
  const models: ModelTuning[] = [];

  // item-kNN: neighbours × shrinkage.
  const knn = new Search<Scorer>('itemknn', { ...fixed.itemknn });
  for (const p of itemknn) {
    await step('itemknn');
    const t0 = performance.now();
    const m = fitItemKnn(train, p, fitOpts).model;
    if (knnSearched) knn.offer(trial(p, measure('itemknn', m), t0), m);
    else knn.hold(p, m);
  }
  models.push(knn.result());

  // EASE: λ.
  if (useEase) {
    const ease = new Search<Scorer>('ease', { ...fixed.ease });
    if (!easeSearched) ease.hold(easeLambdas[0]!, null);
    else {
      for (const { lambda } of easeLambdas) {
        await step('ease');
        const t0 = performance.now();
        const m = fitEase(train, { ...TRAIN_EASE_DEFAULTS, lambda }, fitOpts).model;
        ease.offer(trial({ lambda }, measure('ease', m), t0), null);
      }
    }
    models.push(ease.result());
  }

  // iALS: confidence first, then size.
  const ials = new Search<Scorer>('ials', { ...fixed.ials });
  const base = { ...sizes[0]!, iterations: o.iterations ?? 15, seed };
  const fitI = async (p: Partial<IalsParams>): Promise<void> => {
    await step('ials');
    const t0 = performance.now();
    const m = (await fitIalsThreaded(train, p, { ...fitOpts, ...(o.threads !== undefined && { threads: o.threads }) })).model;
    const shown: TrialParams = { factors: p.factors!, regularization: p.regularization!, alpha: p.alpha!, scaling: p.scaling! };
    if (ialsSearched) ials.offer(trial(shown, measure('ials', m), t0), m);
    else ials.hold(shown, m);
  };
  for (const c of confidences) await fitI({ ...base, ...c });
  if (ialsSearched) {
    const conf = { scaling: ials.best!.params['scaling'] as 'linear' | 'log', alpha: ials.best!.params['alpha'] as number };
    for (const size of sizes.slice(1)) await fitI({ ...base, ...size, ...conf });
  }
  models.push(ials.result());

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
  return {
    k,
    seed,
    split: { method: split.method, train: split.train.length, validation: split.validation.length, customers: ev.customerCount, from: split.from },
    models,
    hybridContentWeight: best('hybrid')!['content'] as number,
    params: {
      itemknn: { k: bk['k'] as number, shrink: bk['shrink'] as number },
      ials: {
        factors: bi['factors'] as number,
        regularization: bi['regularization'] as number,
        alpha: bi['alpha'] as number,
        scaling: bi['scaling'] as 'linear' | 'log',
        seed,
        ...(o.iterations !== undefined && { iterations: o.iterations }),
      },
      ...(be && { ease: { ...TRAIN_EASE_DEFAULTS, lambda: be['lambda'] as number } }),
    },
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
