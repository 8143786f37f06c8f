import type { Csr } from '../matrix/csr.ts';
import { TopKHeap } from '../models/topn.ts';
import {
  averagePrecisionFromHits,
  cappedRecallFromHits,
  catalogueCoverage,
  checkK,
  hitRateFromHits,
  ndcgFromHits,
  novelty,
  precisionFromHits,
  recallFromHits,
} from '../metrics/index.ts';
import { customersPerItem, type EvalTruth } from './customers.ts';

/** Anything that can fill a customer's scores over the catalogue: every Scorer, the hybrid, a baseline. */
export interface Ranker {
  readonly name: string;
  scoreInto(u: number, history: Csr, out: Float32Array): void;
}

/** One row of an evaluation table. Per-customer metrics are means over `customers`. */
export interface EvalResult {
  model: string;
  k: number;
  ndcg: number;
  precision: number;
  /** Classic recall, |hits| / |truth|. */
  recall: number;
  /** Recall with denominator min(K, |truth|), Liang et al. (2018). */
  cappedRecall: number;
  /** MAP@K with the IIR denominator |truth|. */
  map: number;
  hitRate: number;
  /** Share of the catalogue in at least one top-K list. */
  coverage: number;
  /** Mean self-information of the recommended items, p_i from `history` (Zhou et al. 2010). */
  novelty: number;
  customers: number;
  elapsedMs: number;
}

/**
 * Offline top-K evaluation (lkpy-style: rank, truncate, measure, average). For each customer of `truth`:
 * fill scores for every item, remove the customer's history items and any unavailable item (set to −∞),
 * keep the top K with a bounded heap (O(items · log K), no full sort), and measure the list against the
 * truth items. Buffers are allocated once per evaluator and reused for every customer and model.
 */
export class RankingEvaluator {
  readonly k: number;
  readonly #history: Csr;
  readonly #truth: EvalTruth;
  readonly #scores: Float32Array;
  readonly #mark: Uint8Array;
  readonly #hits: Uint8Array;
  readonly #heap: TopKHeap;
  readonly #list: Int32Array;
  readonly #listScores: Float32Array;
  readonly #itemCounts: Int32Array;
  readonly #unavailable: Int32Array;

  /**
   * `unavailable` (length history.cols, 1 = never ranked for anyone): items not in the catalogue at the
   * moment the evaluation stands for, e.g. items first sold after a validation cut in time. The truth should
   * not hold them either (evalTruth's `unavailable`).
   */
  constructor(history: Csr, truth: EvalTruth, k: number, unavailable?: Uint8Array | null) {
    checkK(k);
    if (unavailable && unavailable.length !== history.cols) {
      throw new RangeError(`unavailable has ${unavailable.length} items but the history has ${history.cols}`);
    }
    this.k = k;
    const off: number[] = [];
    if (unavailable) unavailable.forEach((x, i) => x && off.push(i));
    this.#unavailable = Int32Array.from(off);
    this.#history = history;
    this.#truth = truth;
    this.#scores = new Float32Array(history.cols);
    this.#mark = new Uint8Array(history.cols);
    this.#hits = new Uint8Array(k);
    this.#heap = new TopKHeap(k);
    this.#list = new Int32Array(k);
    this.#listScores = new Float32Array(k);
    this.#itemCounts = customersPerItem(history);
  }

  get customerCount(): number {
    return this.#truth.customers.length;
  }

  /** Evaluated customers, ascending (the hybrid's customer mode caches components for exactly these). */
  get customers(): Int32Array {
    return this.#truth.customers;
  }

  /** Evaluates one ranker on every customer of the truth. */
  evaluate(ranker: Ranker): EvalResult {
    return this.evaluateFill(ranker.name, (u, _c, out) => ranker.scoreInto(u, this.#history, out));
  }

  /**
   * Like `evaluate`, with `fill(u, c, out)` scoring customer u, the c-th evaluated (for cached blends).
   * `perCustomerNdcg`, when given (length customerCount), receives each customer's NDCG@K (paired comparisons).
   */
  evaluateFill(name: string, fill: (u: number, c: number, out: Float32Array) => void, perCustomerNdcg?: Float64Array): EvalResult {
    const start = performance.now();
    const { customers, ptr, items } = this.#truth;
    const k = this.k;
    const h = this.#history;
    const scores = this.#scores;
    const mark = this.#mark;
    const hits = this.#hits;
    const list = this.#list;
    const nC = customers.length;
    const lists = new Int32Array(nC * k).fill(-1);
    let sNdcg = 0, sP = 0, sR = 0, sCr = 0, sAp = 0, sHr = 0;
    for (let c = 0; c < nC; c++) {
      const u = customers[c]!;
      fill(u, c, scores);
      for (let p = h.indptr[u]!, end = h.indptr[u + 1]!; p < end; p++) scores[h.indices[p]!] = -Infinity;
      for (const i of this.#unavailable) scores[i] = -Infinity;
      const heap = this.#heap;
      heap.clear();
      for (let j = 0; j < scores.length; j++) if (scores[j] !== -Infinity) heap.push(j, scores[j]!);
      const got = heap.drainInto(list, this.#listScores);
      lists.set(list.subarray(0, got), c * k);
      const ts = ptr[c]!;
      const te = ptr[c + 1]!;
      for (let p = ts; p < te; p++) mark[items[p]!] = 1;
      hits.fill(0);
      for (let r = 0; r < got; r++) hits[r] = mark[list[r]!]!;
      for (let p = ts; p < te; p++) mark[items[p]!] = 0;
      const t = te - ts;
      const nd = ndcgFromHits(hits, t, k);
      if (perCustomerNdcg) perCustomerNdcg[c] = nd;
      sNdcg += nd;
      sP += precisionFromHits(hits, t, k);
      sR += recallFromHits(hits, t, k);
      sCr += cappedRecallFromHits(hits, t, k);
      sAp += averagePrecisionFromHits(hits, t, k);
      sHr += hitRateFromHits(hits, t, k);
    }
    const views: Int32Array[] = [];
    for (let c = 0; c < nC; c++) views.push(lists.subarray(c * k, (c + 1) * k));
    const mean = (s: number): number => (nC === 0 ? Number.NaN : s / nC);
    return {
      model: name,
      k,
      ndcg: mean(sNdcg),
      precision: mean(sP),
      recall: mean(sR),
      cappedRecall: mean(sCr),
      map: mean(sAp),
      hitRate: mean(sHr),
      coverage: catalogueCoverage(views, h.cols),
      novelty: novelty(views, this.#itemCounts, Math.max(1, h.rows)),
      customers: nC,
      elapsedMs: performance.now() - start,
    };
  }
}
