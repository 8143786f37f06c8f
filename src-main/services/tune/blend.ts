/**
 * Learning the validated blend (issue 10 item 3) for a training run: every model kind that will be
 * current is fitted with the run's own settings on the train part of the tuner's seeded validation split
 * (split.ts, the same split `train --tune` measures on), and core/eval/validated-blend.ts chooses the blend
 * (or the single model) by NDCG@K on the validation part. Nothing is written here; training stores the
 * result with its models (store/blends.ts).
 *
 * The validation part is cut in two (split.ts `confirmationHalves`): the weights are chosen on the earlier half,
 * the later half shrinks them towards the best single model and keeps the blend only when it beats that model
 * there by a clear margin (validated-blend.ts `confirmLater` says why). A random split (no times) has no
 * earlier or later: its validation customers are dealt to two halves at random, so the second half is an
 * independent sample of customers from the same period, which is what the verdict needs (cross-validation
 * over customers), and no customer's truth is seen by both halves. When either half has too few customers to
 * measure, the whole part chooses, unconfirmed, under the one-standard-error rule (validated-blend.ts says why).
 */
import { evalTruth, MIN_BLEND_CUSTOMERS, RankingEvaluator, sampleTruth, validateBlend, type BlendModel, type BlendModelInput, type ValidatedBlend } from '../../core/eval/index.ts';
import { buildInteractionMatrix, type BuildOptions } from '../../core/matrix/build.ts';
import { fitContent } from '../../core/models/content.ts';
import { fitEase } from '../../core/models/ease.ts';
import { fitItemKnn } from '../../core/models/itemknn.ts';
import { fitPopularity } from '../../core/models/popularity.ts';
import type { Scorer } from '../../core/models/scorer.ts';
import { seededRng } from '../../core/rng.ts';
import type { Dataset } from '../../core/types.ts';
import { InputError } from '../../core/errors.ts';
import { columnCounts } from '../holdout/trained.ts';
import { easeSolver } from '../train/ease-solver.ts';
import { fitIalsThreaded } from '../train/ials-threads.ts';
import { TRAIN_EASE_DEFAULTS, type TrainOptions } from '../train/train-models.ts';
import { confirmationHalves, validationSplit } from './split.ts';

export interface BlendTrainingOptions {
  /** NDCG@K the blend is chosen by. Default 10 (the tuner's). */
  k?: number;
  /** Seed of the split and of the customer sample. Default 1 (the tuner's). */
  seed?: number;
  /** Most validation customers measured. Default 1,000 (the tuner's), fewer when the columns would not fit `budgetBytes`. */
  sampleCustomers?: number;
  /** Memory for the cached normalised columns (customers × models × items float32). Default 256 MiB. */
  budgetBytes?: number;
  threads?: number;
  signal?: AbortSignal;
  matrix?: Omit<BuildOptions, 'rows' | 'window'>;
}

/** Fits `kinds` with `params` on the validation split's train part and chooses the blend on its validation part. */
export async function learnBlend(
  ds: Dataset,
  kinds: readonly BlendModel[],
  params: NonNullable<TrainOptions['params']>,
  o: BlendTrainingOptions = {},
): Promise<ValidatedBlend> {
  const k = o.k ?? 10;
  const seed = o.seed ?? 1;
  // A workspace with nothing to hold out (every customer has one item, no times) has no validation
  // customer: the blend then falls back, saying why, instead of failing the training run.
  let split: { method: 'time' | 'random'; train: Int32Array | undefined; validation: Int32Array; unavailable: Uint8Array | null };
  try {
    split = validationSplit(ds, { seed });
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    split = { method: 'random', train: undefined, validation: new Int32Array(0), unavailable: null };
  }
  const train = buildInteractionMatrix(ds, { ...o.matrix, ...(split.train && { rows: split.train }) });
  const validation = buildInteractionMatrix(ds, { ...o.matrix, rows: split.validation });
  const budget = o.budgetBytes ?? 256 * 2 ** 20;
  const perCustomer = 4 * Math.max(1, kinds.length) * Math.max(1, ds.items.length);
  const cap = Math.max(1, Math.min(o.sampleCustomers ?? 1000, Math.floor(budget / perCustomer)));
  const windowEvaluator = (v: typeof validation, rngSeed: number) =>
    new RankingEvaluator(train, sampleTruth(evalTruth(train, v, undefined, split.unavailable), cap, seededRng(rngSeed)), k, split.unavailable);
  const halves = confirmationHalves(ds, split.validation, split.method, seed);
  const chooseEv = windowEvaluator(buildInteractionMatrix(ds, { ...o.matrix, rows: halves.choose }), seed);
  const confirmEv = windowEvaluator(buildInteractionMatrix(ds, { ...o.matrix, rows: halves.confirm }), seed + 1);
  const twoWindows = chooseEv.customerCount >= MIN_BLEND_CUSTOMERS && confirmEv.customerCount >= MIN_BLEND_CUSTOMERS;
  const ev = twoWindows ? chooseEv : windowEvaluator(validation, seed);
  const fitOpts = o.signal ? { signal: o.signal } : {};
  const models: BlendModelInput[] = [];
  const add = (name: BlendModel, m: Scorer) => models.push({ name, scorer: { name, scoreInto: (u, h, out) => m.scoreInto(u, h, out) } });
  for (const kind of kinds) {
    if (ev.customerCount === 0) add(kind, NOTHING_MEASURED);
    else if (kind === 'content') add(kind, fitContent(ds.items, params.content, fitOpts).model);
    else if (kind === 'itemknn') add(kind, fitItemKnn(train, params.itemknn, fitOpts).model);
    else if (kind === 'ease') add(kind, fitEase(train, { ...TRAIN_EASE_DEFAULTS, ...params.ease }, fitOpts, easeSolver(o.threads ?? 1)).model);
    else if (kind === 'popularity') add(kind, fitPopularity(train, 'presence', params.popularity?.fitHalfLifeDays ?? null).model);
    else add(kind, (await fitIalsThreaded(train, { seed, ...params.ials }, { ...fitOpts, ...(o.threads !== undefined && { threads: o.threads }) })).model);
  }
  const r = validateBlend(ev, train, models, { customersPerItem: columnCounts(train), halves: split.method, ...(twoWindows && { confirm: confirmEv }) });
  return { ...r, validation: { ...r.validation, method: split.method } };
}

/** Stands in for a model when there is no validation customer (validateBlend then calls no model). */
const NOTHING_MEASURED = {
  scoreInto: () => {
    throw new Error('no validation customer: no model is measured');
  },
} as unknown as Scorer;
