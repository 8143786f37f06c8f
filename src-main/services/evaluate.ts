import type { BlendWeights } from '../core/curation/types.ts';
import { InputError } from '../core/errors.ts';
import { customersPerItem, evalTruth, RankingEvaluator, sampleTruth, searchBlendWeights, type EvalResult } from '../core/eval/index.ts';
import { buildInteractionMatrix, type BuildOptions } from '../core/matrix/build.ts';
import type { Csr } from '../core/matrix/csr.ts';
import { quantileCuts, splitByTime, type TimeCuts } from '../core/matrix/split.ts';
import { fitContent, type ContentParams } from '../core/models/content.ts';
import { fitEase, type EaseParams } from '../core/models/ease.ts';
import { fitIals } from '../core/models/ials.ts';
import type { IalsParams } from '../core/models/ials-params.ts';
import { fitItemKnn, type ItemKnnParams } from '../core/models/itemknn.ts';
import { fitPopularity, randomScorer, trendRatios } from '../core/models/popularity.ts';
import type { Scorer } from '../core/models/scorer.ts';
import { seededRng } from '../core/rng.ts';
import { CustomerHybrid, HybridScorer } from '../core/scoring/index.ts';
import type { Dataset } from '../core/types.ts';
import { loadDataset } from '../store/dataset.ts';
import { ModelRepo } from '../store/models.ts';
import type { Db } from '../store/workspace.ts';

export interface EvaluateOptions {
  /** List length K. Default 10. */
  k?: number;
  /** Most customers evaluated per window (seeded sample). Default 2,000. */
  sampleCustomers?: number;
  seed?: number;
  /** Split cuts; default the last 10% of timed signals is test and the 10% before it validation. */
  cuts?: TimeCuts;
  /** Which model supplies the hybrid's collaborative similarity. Default item-kNN. */
  collaborative?: 'itemknn' | 'ease' | 'ials';
  /** Leave EASE out (large catalogues: its inverse is dense). Default: in when items <= 5,000. */
  ease?: boolean;
  params?: { content?: ContentParams; itemknn?: ItemKnnParams; ease?: EaseParams; ials?: Partial<IalsParams> };
  matrix?: Omit<BuildOptions, 'rows' | 'window'>;
  /** Blend-search grid (see searchBlendWeights). */
  grid?: readonly number[];
  signal?: AbortSignal;
}

export interface WorkspaceEvaluation {
  k: number;
  split: { validationFrom: number; testFrom: number; train: number; validation: number; test: number };
  /** Chosen on the validation window. */
  weights: BlendWeights;
  validation: { hybrid: EvalResult; trials: number; searchMs: number };
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
 * 2. the hybrid's blend weights are searched on validation, with train as each customer's history;
 * 3. everything is measured on test, with train + validation as history: those items are excluded from
 *    the lists and read by history-based scorers (item-kNN, content, EASE); iALS keeps its train factors.
 * Counting components (popularity, trend, the cold-start test) and the popularity baseline read all
 * history before the window being measured, so the baseline has the same information as the hybrid.
 * Customers are sampled (seeded) to at most `sampleCustomers` per window; all models see one sample.
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
  const cuts = options.cuts ?? quantileCuts(ds);
  const split = splitByTime(ds, cuts);
  if (split.validation.length === 0 || split.test.length === 0) {
    throw new InputError('the time split left the validation or test window empty; the signals need a time spread');
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
  const collabName = options.collaborative ?? 'itemknn';
  const collaborative = models.get(collabName);
  if (!collaborative) throw new InputError(`collaborative model '${collabName}' was not fitted`);

  const addedAt = Float64Array.from(ds.items, (it) => it.addedAt ?? Number.NaN);
  const hybridFor = (history: Csr, date: number): CustomerHybrid => {
    const h = new HybridScorer(
      { content: models.get('content')!, collaborative, affinity: models.get('ials')! },
      { customersPerItem: customersPerItem(history), trend: Float32Array.from(trendRatios(ds, { now: date })), addedAt },
    );
    return new CustomerHybrid(h, history, date);
  };

  // Validation: choose the blend weights.
  const valEval = new RankingEvaluator(train, sampleTruth(evalTruth(train, validation), cap, seededRng(seed)), k);
  if (valEval.customerCount === 0) throw new InputError('no customer has both history and new items in the validation window');
  const search = searchBlendWeights(valEval, hybridFor(train, cuts.validationFrom), options.grid ? { grid: options.grid } : {});

  // Test: every model, the hybrid with the chosen weights, and the baselines, on one customer sample.
  const testEval = new RankingEvaluator(trainVal, sampleTruth(evalTruth(trainVal, test), cap, seededRng(seed + 1)), k);
  if (testEval.customerCount === 0) throw new InputError('no customer has both history and new items in the test window');
  const rows: EvalResult[] = [];
  for (const [name, model] of models) rows.push(testEval.evaluate({ name, scoreInto: (u, h, out) => model.scoreInto(u, h, out) }));
  const testHybrid = hybridFor(trainVal, cuts.testFrom);
  const eff = testHybrid.effective(search.weights);
  testHybrid.precompute(testEval.customers);
  rows.push(testEval.evaluateFill('hybrid', (_u, c, out) => testHybrid.blendCached(c, eff, out)));
  const popularity = fitPopularity(trainVal).model;
  rows.push(testEval.evaluate({ name: 'popularity', scoreInto: (u, h, out) => popularity.scoreInto(u, h, out) }));
  const random = randomScorer(seed, ds.items.length);
  rows.push(testEval.evaluate({ name: 'random', scoreInto: (u, h, out) => random.scoreInto(u, h, out) }));
  rows.sort((a, b) => b.ndcg - a.ndcg);

  return {
    k,
    split: {
      validationFrom: cuts.validationFrom,
      testFrom: cuts.testFrom,
      train: split.train.length,
      validation: split.validation.length,
      test: split.test.length,
    },
    weights: search.weights,
    validation: { hybrid: search.result, trials: search.trials.length, searchMs: search.elapsedMs },
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

function concat(a: Int32Array, b: Int32Array): Int32Array {
  const out = new Int32Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}
