import type { BlendWeights } from '../curation/types.ts';
import type { Csr } from '../matrix/csr.ts';
import type { Scorer } from '../models/scorer.ts';
import {
  C_AUDIENCE,
  C_COLLABORATIVE,
  C_CONTENT,
  C_FRESHNESS,
  C_POPULARITY,
  C_TREND,
  effectiveWeights,
} from './components.ts';
import type { HybridScorer } from './hybrid.ts';
import { normaliseInto } from './normalise.ts';

/** Per-customer components: content, collaborative, audience (the customer as an audience of one). */
const PERSONAL = [C_CONTENT, C_COLLABORATIVE, C_AUDIENCE] as const;

/**
 * The hybrid for one customer instead of a shelf's audience ("customer mode"), so offline evaluation
 * and the blend-weight search can measure the same blend the shelves use. For customer u over the whole
 * catalogue: content = the content model's `scoreInto` (similarity to u's history), collaborative = the
 * collaborative model's `scoreInto` (item-kNN/EASE: similarity to u's history), audience = the affinity
 * model's `scoreInto` (u's own predicted preference); popularity, trend and freshness (at `date`) are
 * the shop-wide ones. Each is normalised over the catalogue as in `scorePool`, cold items take content in
 * place of collaborative and audience, and the blend uses the same renormalised weights.
 *
 * The three personal columns of a set of customers can be cached (`precompute`) so that a weight search
 * re-blends without re-scoring: 3 × items float32 per customer (30 MB for 1,000 customers × 2,500 items).
 */
export class CustomerHybrid {
  readonly #h: HybridScorer;
  readonly #history: Csr;
  readonly #global: Float32Array;
  readonly #available: boolean[];
  readonly #buf: Float32Array;
  #cacheRows = new Int32Array(0);
  #cache = new Float32Array(0);

  constructor(hybrid: HybridScorer, history: Csr, date: number) {
    this.#h = hybrid;
    this.#history = history;
    const N = hybrid.itemCount;
    const { scratch } = hybrid.scratchFor(N);
    const m = hybrid.models;
    this.#available = [m.content !== null, m.collaborative !== null, m.affinity !== null, true, hybrid.data.trend !== null, true];
    // Shop-wide columns, normalised once: [popularity | trend | freshness].
    this.#global = new Float32Array(3 * N);
    const raw = new Float32Array(N);
    raw.set(hybrid.data.customersPerItem);
    normaliseInto(hybrid.normalisation, raw, N, this.#global.subarray(0, N), scratch);
    if (hybrid.data.trend) normaliseInto(hybrid.normalisation, hybrid.data.trend, N, this.#global.subarray(N, 2 * N), scratch);
    normaliseInto(hybrid.normalisation, hybrid.freshnessAt(date), N, this.#global.subarray(2 * N, 3 * N), scratch);
    this.#buf = new Float32Array(3 * N);
  }

  /** The three personal normalised columns of customer u, cold substitution applied, into out (3 × items). */
  personalInto(u: number, out: Float32Array): void {
    const h = this.#h;
    const N = h.itemCount;
    const { scratch, column } = h.scratchFor(N);
    const models: (Scorer | null)[] = [h.models.content, h.models.collaborative, h.models.affinity];
    for (let k = 0; k < 3; k++) {
      const target = out.subarray(k * N, (k + 1) * N);
      const model = models[k];
      if (!model) {
        target.fill(0);
        continue;
      }
      model.scoreInto(u, this.#history, column);
      normaliseInto(h.normalisation, column, N, target, scratch);
    }
    if (!h.models.content) return;
    const cpi = h.data.customersPerItem;
    for (let i = 0; i < N; i++) {
      if (cpi[i]! >= h.coldStartMinCustomers) continue;
      out[N + i] = out[i]!;
      out[2 * N + i] = out[i]!;
    }
  }

  /** Blended hybrid scores of customer u for every item, into out (length items). */
  hybridScoresForCustomer(u: number, weights: BlendWeights, out: Float32Array): void {
    this.personalInto(u, this.#buf);
    this.#blend(this.#buf, 0, effectiveWeights(weights, this.#available), out);
  }

  /** Caches the personal columns of these customers (ascending or not; looked up by position). */
  precompute(customers: Int32Array): void {
    const N = this.#h.itemCount;
    this.#cacheRows = Int32Array.from(customers);
    this.#cache = new Float32Array(customers.length * 3 * N);
    customers.forEach((u, c) => this.personalInto(u, this.#cache.subarray(c * 3 * N, (c + 1) * 3 * N)));
  }

  /** Like `hybridScoresForCustomer` for the c-th precomputed customer, with weights already effective. */
  blendCached(c: number, w: Float64Array, out: Float32Array): void {
    if (!(c >= 0 && c < this.#cacheRows.length)) throw new RangeError(`customer position ${c} was not precomputed`);
    this.#blend(this.#cache, c * 3 * this.#h.itemCount, w, out);
  }

  /** Effective (renormalised) weights for this hybrid's available components. */
  effective(weights: BlendWeights): Float64Array {
    return effectiveWeights(weights, this.#available);
  }

  #blend(personal: Float32Array, off: number, w: Float64Array, out: Float32Array): void {
    const N = this.#h.itemCount;
    const g = this.#global;
    const wc = w[PERSONAL[0]]!, wk = w[PERSONAL[1]]!, wa = w[PERSONAL[2]]!;
    const wp = w[C_POPULARITY]!, wt = w[C_TREND]!, wf = w[C_FRESHNESS]!;
    for (let i = 0; i < N; i++) {
      out[i] =
        wc * personal[off + i]! +
        wk * personal[off + N + i]! +
        wa * personal[off + 2 * N + i]! +
        wp * g[i]! +
        wt * g[N + i]! +
        wf * g[2 * N + i]!;
    }
  }
}
