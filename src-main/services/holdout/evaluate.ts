/**
 * Evaluation against a holdout file the user brings (issue 6): every trained model, the hybrid and the random
 * baseline are scored against exactly the held-out pairs of the file.
 *
 * - Each listed customer's ranking covers the whole catalogue minus the items that customer already has in
 *   the workspace (any signal of any kind): a shelf never proposes what the customer has.
 * - A held-out pair the customer already has in the workspace can never be recommended; it is counted
 *   (`alreadyInWorkspace`) and left out of that customer's truth, as are duplicate rows of one pair.
 * - Customers or items the workspace does not know are counted and listed (first few), never dropped silently.
 * - Metrics per customer, averaged over customers with at least one held-out item to find (core/metrics):
 *   Recall@K with denominator min(K, |held-out|) (Liang et al. 2018), NDCG@K with binary relevance and log2
 *   discount (Järvelin & Kekäläinen 2002), HitRate@K, Precision@K and MAP@K (Manning et al. 2008), plus
 *   Coverage@K over the catalogue and Novelty (mean self-information, Zhou et al. 2010) with an item's
 *   popularity = the number of workspace customers who have it.
 */
import { plural } from '../../core/util/plural.ts';
import { InputError } from '../../core/errors.ts';
import { RankingEvaluator, type EvalResult, type EvalTruth } from '../../core/eval/index.ts';
import { randomScorer } from '../../core/models/popularity.ts';
import type { Dataset } from '../../core/types.ts';
import { loadDataset } from '../../store/dataset.ts';
import { modelStatus } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import { readHoldout, type HoldoutReadOptions, type HoldoutRows, type HoldoutSource } from './read.ts';
import { loadTrainedModels, ownedMatrix } from './trained.ts';

export interface HoldoutOptions extends HoldoutReadOptions {
  /** List length K. Default 20. */
  k?: number;
  /** Seed of the random baseline. Default 1. */
  seed?: number;
  /** Also answer each customer's NDCG@K per model (`perCustomer`), for paired comparisons. Default false. */
  perCustomer?: boolean;
}

export interface HoldoutModelRow {
  model: string;
  k: number;
  /** Recall@K with denominator min(K, |held-out|), Liang et al. (2018). */
  recall: number;
  ndcg: number;
  hitRate: number;
  precision: number;
  map: number;
  /** Share of the catalogue in at least one top-K list. */
  coverage: number;
  novelty: number;
  customers: number;
  /** The stored model is older than the workspace data (null for the hybrid and the baseline). */
  stale: boolean | null;
  elapsedMs: number;
}

export interface UnknownIds {
  /** Distinct ids the workspace does not know. */
  distinct: number;
  /** Rows naming one of them. */
  rows: number;
  /** The first few, for the message. */
  examples: string[];
}

export interface HoldoutEvaluation {
  file: string;
  k: number;
  rows: number;
  /** Rows whose customer and item are both known (before de-duplication). */
  usableRows: number;
  /** Distinct held-out (customer, item) pairs used as truth. */
  pairs: number;
  /** Customers evaluated (known, with at least one held-out item they do not already have). */
  customers: number;
  unknownCustomers: UnknownIds;
  unknownItems: UnknownIds;
  /** Known pairs the customer already has in the workspace: unrecommendable, left out of the truth. */
  alreadyInWorkspace: number;
  duplicateRows: number;
  /** Known customers left with nothing to find (every held-out item already theirs). */
  customersWithoutNewItems: number;
  /** Evaluated customers with no signal in the workspace (only popularity-like models can serve them). */
  coldCustomers: number;
  /** Best NDCG first. */
  models: HoldoutModelRow[];
  weightsFrom: string;
  mapping: Record<string, string>;
  notes: string[];
  /**
   * With `perCustomer`: the evaluated customers' ids and, per model, each one's NDCG@K in that order. A gap
   * between two models' means is then judged by the standard error of the paired differences, which is far
   * smaller than either mean's own (the customers are the same).
   */
  perCustomer?: { customers: string[]; ndcg: Record<string, number[]> };
}

const EXAMPLES = 5;

export async function evaluateHoldout(db: Db, source: HoldoutSource, o: HoldoutOptions = {}): Promise<HoldoutEvaluation> {
  const k = o.k ?? 20;
  if (!Number.isInteger(k) || k < 1) throw new InputError(`k must be a whole number >= 1, got ${k}`, { column: 'k' });
  const rows = await readHoldout(source, o);
  return evaluateHoldoutRows(db, loadDataset(db), rows, k, o.seed ?? 1, o.perCustomer ?? false);
}

/** The evaluation proper, on rows already read (tests call it with hand-made rows). */
export function evaluateHoldoutRows(db: Db, ds: Dataset, rows: HoldoutRows, k: number, seed = 1, perCustomer = false): HoldoutEvaluation {
  if (ds.items.length === 0) throw new InputError('the workspace has no items: import a catalogue first');
  const models = loadTrainedModels(db, ds);
  if (models.scorers.size === 0) throw new InputError('no trained models: run train first');
  const owned = ownedMatrix(ds);
  const truthAndCounts = holdoutTruth(ds, rows, owned);
  const { truth } = truthAndCounts;
  if (truth.customers.length === 0) {
    throw new InputError(
      `no held-out pair can be evaluated: ${plural(truthAndCounts.unknownCustomers.distinct, 'unknown customer')}, ` +
        `${plural(truthAndCounts.unknownItems.distinct, 'unknown item')}, ${plural(truthAndCounts.alreadyInWorkspace, 'pair')} already in the workspace`,
      { file: rows.file },
    );
  }
  const evaluator = new RankingEvaluator(owned, truth, k);
  const status = new Map(modelStatus(db).map((m) => [m.kind as string, m.stale]));
  const out: HoldoutModelRow[] = [];
  const row = (r: EvalResult, stale: boolean | null): HoldoutModelRow => ({
    model: r.model,
    k: r.k,
    recall: r.cappedRecall,
    ndcg: r.ndcg,
    hitRate: r.hitRate,
    precision: r.precision,
    map: r.map,
    coverage: r.coverage,
    novelty: r.novelty,
    customers: r.customers,
    stale,
    elapsedMs: r.elapsedMs,
  });
  const each = new Map<string, Float64Array>();
  const per = (name: string) => {
    if (!perCustomer) return undefined;
    const a = new Float64Array(truth.customers.length);
    each.set(name, a);
    return a;
  };
  for (const [name, model] of models.scorers) {
    out.push(row(evaluator.evaluateFill(name, (u, _c, s) => model.scoreInto(u, models.matrix, s), per(name)), status.get(name) ?? null));
  }
  if (models.blend) {
    const blend = models.blend;
    out.push(row(evaluator.evaluateFill('hybrid', (u, _c, s) => blend.scoreInto(u, models.matrix, s), per('hybrid')), null));
  }
  const random = randomScorer(seed, ds.items.length);
  out.push(row(evaluator.evaluateFill('random', (u, _c, s) => random.scoreInto(u, models.matrix, s), per('random')), null));
  out.sort((a, b) => b.ndcg - a.ndcg || a.model.localeCompare(b.model));
  const notes = [...models.notes];
  if ([...status.values()].some(Boolean)) notes.push('some models are older than the workspace data: retrain for a fair comparison');
  return {
    file: rows.file,
    k,
    rows: rows.customer.length,
    usableRows: truthAndCounts.usableRows,
    pairs: truth.items.length,
    customers: truth.customers.length,
    unknownCustomers: truthAndCounts.unknownCustomers,
    unknownItems: truthAndCounts.unknownItems,
    alreadyInWorkspace: truthAndCounts.alreadyInWorkspace,
    duplicateRows: truthAndCounts.duplicateRows,
    customersWithoutNewItems: truthAndCounts.customersWithoutNewItems,
    coldCustomers: truthAndCounts.coldCustomers,
    models: out,
    weightsFrom: models.weightsFrom,
    mapping: rows.mapping as Record<string, string>,
    notes,
    ...(perCustomer && {
      perCustomer: {
        customers: Array.from(truth.customers, (u) => ds.customerExternalIds[u]!),
        ndcg: Object.fromEntries([...each].map(([m, a]) => [m, Array.from(a)])),
      },
    }),
  };
}

/** The truth, and the counts the report gives about how the file's rows were used. */
type TruthAndCounts = { truth: EvalTruth } & Pick<
  HoldoutEvaluation,
  'usableRows' | 'unknownCustomers' | 'unknownItems' | 'alreadyInWorkspace' | 'duplicateRows' | 'customersWithoutNewItems' | 'coldCustomers'
>;

export function holdoutTruth(ds: Dataset, rows: HoldoutRows, owned: { indptr: Int32Array; indices: Int32Array }): TruthAndCounts {
  const customerIndex = new Map<string, number>();
  ds.customerExternalIds.forEach((id, u) => customerIndex.set(id, u));
  const itemIndex = new Map<string, number>();
  ds.items.forEach((it, i) => itemIndex.set(it.externalId, i));
  const unknownC = new Map<string, number>();
  const unknownI = new Map<string, number>();
  const byCustomer = new Map<number, number[]>();
  let usableRows = 0;
  for (let r = 0; r < rows.customer.length; r++) {
    const u = customerIndex.get(rows.customer[r]!);
    const i = itemIndex.get(rows.item[r]!);
    if (u === undefined) unknownC.set(rows.customer[r]!, (unknownC.get(rows.customer[r]!) ?? 0) + 1);
    if (i === undefined) unknownI.set(rows.item[r]!, (unknownI.get(rows.item[r]!) ?? 0) + 1);
    if (u === undefined || i === undefined) continue;
    usableRows++;
    let list = byCustomer.get(u);
    if (!list) byCustomer.set(u, (list = []));
    list.push(i);
  }
  let already = 0;
  let duplicates = 0;
  let without = 0;
  let cold = 0;
  const customers: number[] = [];
  const ptr: number[] = [0];
  const items: number[] = [];
  for (const u of [...byCustomer.keys()].sort((a, b) => a - b)) {
    const list = byCustomer.get(u)!.sort((a, b) => a - b);
    const start = owned.indptr[u]!;
    const end = owned.indptr[u + 1]!;
    const before = items.length;
    let h = start;
    let last = -1;
    for (const i of list) {
      if (i === last) {
        duplicates++;
        continue;
      }
      last = i;
      while (h < end && owned.indices[h]! < i) h++;
      if (h < end && owned.indices[h] === i) already++;
      else items.push(i);
    }
    if (items.length === before) {
      without++;
      continue;
    }
    if (end === start) cold++;
    customers.push(u);
    ptr.push(items.length);
  }
  const unknown = (m: Map<string, number>): UnknownIds => ({
    distinct: m.size,
    rows: [...m.values()].reduce((s, c) => s + c, 0),
    examples: [...m.keys()].slice(0, EXAMPLES),
  });
  return {
    truth: { customers: Int32Array.from(customers), ptr: Int32Array.from(ptr), items: Int32Array.from(items) },
    usableRows,
    unknownCustomers: unknown(unknownC),
    unknownItems: unknown(unknownI),
    alreadyInWorkspace: already,
    duplicateRows: duplicates,
    customersWithoutNewItems: without,
    coldCustomers: cold,
  };
}
