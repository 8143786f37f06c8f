import { InputError } from '../core/errors.ts';
import {
  customersPerItem,
  MIN_BLEND_CUSTOMERS,
  evalTruth,
  RankingEvaluator,
  sampleTruth,
  validateBlend,
  type BlendModel,
  type BlendModelInput,
  type EvalResult,
  type ValidatedBlend,
} from '../core/eval/index.ts';
import { buildInteractionMatrix, type BuildOptions } from '../core/matrix/build.ts';
import type { Csr } from '../core/matrix/csr.ts';
import { quantileCuts, splitByTime, type TimeCuts } from '../core/matrix/split.ts';
import { fitContent, type ContentParams } from '../core/models/content.ts';
import { fitEase, type EaseParams } from '../core/models/ease.ts';
import { fitIals } from '../core/models/ials.ts';
import type { IalsParams } from '../core/models/ials-params.ts';
import { fitItemKnn, type ItemKnnParams } from '../core/models/itemknn.ts';
import { fitPopularity, randomScorer } from '../core/models/popularity.ts';
import type { Scorer } from '../core/models/scorer.ts';
import { seededRng } from '../core/rng.ts';
import { BlendScorer } from '../core/scoring/blend-scorer.ts';
import type { Dataset } from '../core/types.ts';
import { loadDataset } from '../store/dataset.ts';
import { ModelRepo } from '../store/models.ts';
import type { Db } from '../store/workspace.ts';
import { confirmationHalves, NOTHING_TO_HOLD_OUT, notYetAvailable, randomThreeWay } from './tune/split.ts';

export interface EvaluateOptions {
  /** List length K. Default 10. */
  k?: number;
  /** Most customers evaluated per window (seeded sample). Default 2,000. */
  sampleCustomers?: number;
  seed?: number;
  /** Split cuts; default the last 10% of timed signals is test and the 10% before it validation. */
  cuts?: TimeCuts;
  /** Leave EASE out (large catalogues: its inverse is dense). Default: in when items <= 5,000. */
  ease?: boolean;
  params?: { content?: ContentParams; itemknn?: ItemKnnParams; ease?: EaseParams; ials?: Partial<IalsParams> };
  matrix?: Omit<BuildOptions, 'rows' | 'window'>;
  signal?: AbortSignal;
}

export interface WorkspaceEvaluation {
  k: number;
  /** validationFrom and testFrom: null when the signals have no times and the split was random per customer. */
  split: { validationFrom: number | null; testFrom: number | null; train: number; validation: number; test: number };
  /** The hybrid's weight of each model, chosen on the validation window (one model at 1: the hybrid is that model). */
  weights: Partial<Record<BlendModel, number>>;
  /** What the hybrid is and why, in words ("no blend beat itemknn on validation, so the hybrid is itemknn"). */
  hybrid: string;
  validation: { blend: ValidatedBlend; trials: number; searchMs: number };
  /** One row per model on the test window, best NDCG first: single models, the hybrid, the baselines. */
  test: EvalResult[];
  fits: { model: string; elapsedMs: number; notes: string[] }[];
  notes: string[];
}

/** Loads the workspace and evaluates it (see `evaluateDataset`). */
export function evaluateWorkspace(db: Db, options: EvaluateOptions = {}): WorkspaceEvaluation {
  return evaluateDataset(loadDataset(db), options);
}

/**
 * Offline evaluation of every model, the hybrid and two baselines on a global temporal split
 * (train | validation | test, split.ts):
 * 1. learned models (content, item-kNN, EASE, iALS) are fitted on train only;
 * 2. the validated blend (core/eval/validated-blend.ts) is chosen on validation over every model, with
 *    train as each customer's history (popularity counted on train): weights on the window's earlier half,
 *    kept only if they also beat the best single model on its later half, as training does (tune/blend.ts);
 * 3. everything is measured on test, with train + validation as history: those items are excluded from
 *    the lists and read by history-based scorers (item-kNN, content, EASE); iALS keeps its train factors.
 * Counting components (popularity, trend, the cold-start test) and the popularity baseline read all
 * history before the window being measured, so the baseline has the same information as the hybrid.
 * Customers are sampled (seeded) to at most `sampleCustomers` per window; all models see one sample.
 * Items added (else first signalled) at or after a window's cut are neither ranked nor truth in that window.
 */
export function evaluateDataset(ds: Dataset, options: EvaluateOptions = {}): WorkspaceEvaluation {
  const k = options.k ?? 10;
  const seed = options.seed ?? 1;
  const cap = options.sampleCustomers ?? 2000;
  if (!Number.isInteger(k) || k < 1) throw new InputError(`k must be a whole number >= 1, got ${k}`, { column: 'k' });
  if (!Number.isInteger(cap) || cap < 1) {
    throw new InputError(`sampleCustomers must be a whole number >= 1, got ${cap}`, { column: 'sampleCustomers' });
  }
  if (ds.items.length === 0 || ds.signals.length === 0) throw new InputError('nothing to evaluate: import items and signals first');
  const notes: string[] = [];
  // A log without times (customer, item, count exports) is split per customer at random, as tuning splits it.
  const byTime = options.cuts !== undefined || mostlyTimed(ds);
  const cuts = byTime ? (options.cuts ?? quantileCuts(ds)) : null;
  let split: { train: Int32Array; validation: Int32Array; test: Int32Array };
  if (cuts) split = splitByTime(ds, cuts);
  else {
    try {
      split = randomThreeWay(ds, { seed });
    } catch (e) {
      if (e instanceof InputError && e.message === NOTHING_TO_HOLD_OUT) throw new InputError('no customer has two or more items: nothing can be held out to evaluate on');
      throw e;
    }
    notes.push("the signals carry no times: 10% of each customer's items were held out at random for test and 10% for validation");
  }
  if (split.validation.length === 0 || split.test.length === 0) {
    throw new InputError(cuts ? 'the time split left the validation or test window empty; the signals need a time spread' : 'too few customers with three or more items to hold out validation and test items');
  }
  const m = (rows: Int32Array): Csr => buildInteractionMatrix(ds, { ...options.matrix, rows });
  const train = m(split.train);
  const validation = m(split.validation);
  const test = m(split.test);
  const trainVal = m(concat(split.train, split.validation));

  const fits: WorkspaceEvaluation['fits'] = [];
  const fitOpts = options.signal ? { signal: options.signal } : {};
  const record = <T extends { model: Scorer; report: { elapsedMs: number; notes: string[] } }>(name: string, r: T): Scorer => {
    fits.push({ model: name, elapsedMs: r.report.elapsedMs, notes: r.report.notes });
    return r.model;
  };
  const models = new Map<string, Scorer>();
  models.set('content', record('content', fitContent(ds.items, options.params?.content, fitOpts)));
  models.set('itemknn', record('itemknn', fitItemKnn(train, options.params?.itemknn, fitOpts)));
  const useEase = options.ease ?? ds.items.length <= 5000;
  if (useEase) models.set('ease', record('ease', fitEase(train, options.params?.ease, fitOpts)));
  else notes.push(`EASE left out: ${ds.items.length} items (its dense inverse is costly above 5,000)`);
  models.set('ials', record('ials', fitIals(train, { seed, ...options.params?.ials }, fitOpts)));

  // Each window is measured over the catalogue of its cut's moment, as the tuner and the blend do
  // (services/tune/split.ts `unavailable`): an item added (else first signalled) at or after the cut is
  // neither ranked nor truth there, since no list served at the cut could have held it.
  const notYetInValidation = cuts ? notYetAvailable(ds, cuts.validationFrom) : undefined;
  const notYetInTest = cuts ? notYetAvailable(ds, cuts.testFrom) : undefined;

  // Validation: the validated blend over every model (services/tune/blend.ts does the same for training).
  const windowEvaluator = (v: Csr, rngSeed: number) =>
    new RankingEvaluator(train, sampleTruth(evalTruth(train, v, undefined, notYetInValidation), cap, seededRng(rngSeed)), k, notYetInValidation);
  const halves = confirmationHalves(ds, split.validation, cuts ? 'time' : 'random', seed);
  const chooseEval = windowEvaluator(m(halves.choose), seed);
  const confirmEval = windowEvaluator(m(halves.confirm), seed + 2);
  const twoWindows = chooseEval.customerCount >= MIN_BLEND_CUSTOMERS && confirmEval.customerCount >= MIN_BLEND_CUSTOMERS;
  const valEval = twoWindows ? chooseEval : windowEvaluator(validation, seed);
  if (valEval.customerCount === 0) throw new InputError('no customer has both history and new items in the validation window');
  const t0 = performance.now();
  const inputs: BlendModelInput[] = [...models].map(([name, m]) => ({ name: name as BlendModel, scorer: { name, scoreInto: (u, h, out) => m.scoreInto(u, h, out) } }));
  const trainPopularity = fitPopularity(train).model;
  inputs.push({ name: 'popularity', scorer: { name: 'popularity', scoreInto: (u, h, out) => trainPopularity.scoreInto(u, h, out) } });
  const blend = validateBlend(valEval, train, inputs, { customersPerItem: customersPerItem(train), ...(twoWindows && { confirm: confirmEval }) });
  const searchMs = performance.now() - t0;
  if (!blend.validated) notes.push(blend.reason);

  // Test: every model, the hybrid as chosen, and the baselines, on one customer sample.
  const testEval = new RankingEvaluator(trainVal, sampleTruth(evalTruth(trainVal, test, undefined, notYetInTest), cap, seededRng(seed + 1)), k, notYetInTest);
  if (testEval.customerCount === 0) throw new InputError('no customer has both history and new items in the test window');
  const rows: EvalResult[] = [];
  for (const [name, model] of models) rows.push(testEval.evaluate({ name, scoreInto: (u, h, out) => model.scoreInto(u, h, out) }));
  const popularity = fitPopularity(trainVal).model;
  // The hybrid on test reads the learned models fitted on train and the counts of train + validation.
  const served = new BlendScorer(blend, new Map<string, Scorer>([...models, ['popularity', popularity]]), customersPerItem(trainVal));
  rows.push(testEval.evaluate(served));
  rows.push(testEval.evaluate({ name: 'popularity', scoreInto: (u, h, out) => popularity.scoreInto(u, h, out) }));
  const random = randomScorer(seed, ds.items.length);
  rows.push(testEval.evaluate({ name: 'random', scoreInto: (u, h, out) => random.scoreInto(u, h, out) }));
  rows.sort((a, b) => b.ndcg - a.ndcg);

  return {
    k,
    split: {
      validationFrom: cuts ? cuts.validationFrom : null,
      testFrom: cuts ? cuts.testFrom : null,
      train: split.train.length,
      validation: split.validation.length,
      test: split.test.length,
    },
    weights: { ...blend.weights },
    hybrid: blend.reason,
    validation: { blend, trials: blend.validation.trials, searchMs },
    test: rows,
    fits,
    notes,
  };
}

/**
 * Attaches each test-window row to the workspace's current stored model of the same kind (DESIGN.md:
 * models are persisted with their evaluation), in one transaction: all rows are written or none. The
 * rows describe the method with the stored parameters fitted on the train window, not the stored
 * instance itself (which was fitted on all signals). Returns how many models were updated.
 */
export function saveEvaluation(db: Db, evaluation: WorkspaceEvaluation, evaluatedAt: number): number {
  const repo = new ModelRepo(db);
  const current = repo.list().filter((m) => m.current);
  return db.transaction(() => {
    let updated = 0;
    for (const m of current) {
      const row = evaluation.test.find((r) => r.model === m.kind);
      if (!row) continue;
      repo.setEvaluation(m.id, { ...row, evaluatedAt, split: evaluation.split, baselines: baselineRows(evaluation) });
      updated++;
    }
    return updated;
  })();
}

function baselineRows(e: WorkspaceEvaluation): { model: string; ndcg: number }[] {
  return e.test.filter((r) => r.model === 'popularity' || r.model === 'random').map((r) => ({ model: r.model, ndcg: r.ndcg }));
}

/** At least half of the signals (and three) carry a time: the split is by time (tune/split.ts decides alike). */
function mostlyTimed(ds: Dataset): boolean {
  const at = ds.signals.at;
  let timed = 0;
  for (let k = 0; k < at.length; k++) if (at[k] === at[k]) timed++;
  return timed >= 3 && timed * 2 >= at.length;
}

function concat(a: Int32Array, b: Int32Array): Int32Array {
  const out = new Int32Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}
