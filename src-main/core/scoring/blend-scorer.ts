import type { BlendModel, BlendSpec } from '../eval/validated-blend.ts';
import { BLEND_MODELS } from '../eval/validated-blend.ts';
import { InputError } from '../errors.ts';
import type { Csr } from '../matrix/csr.ts';
import type { Scorer } from '../models/scorer.ts';
import { seededRng } from '../rng.ts';
import { DEFAULT_COLD_START_MIN_CUSTOMERS } from './components.ts';
import { blendColumnsInto, normaliseForCustomer } from './per-customer.ts';

/**
 * The validated blend at work (core/eval/validated-blend.ts chose it): one customer's relevance for every
 * item. A single model without the content path is that model's own scores; otherwise each model in the
 * blend is normalised for the customer and weighted, and cold items (fewer than `coldMinCustomers`
 * customers) take the content model's normalised score when the blend keeps that path.
 *
 * A model the spec names but the workspace no longer holds is left out and the remaining weights are
 * rescaled (`missing` says which); a spec with nothing left is the caller's input error.
 */
export class BlendScorer {
  readonly name = 'hybrid';
  readonly spec: BlendSpec;
  readonly itemCount: number;
  /** Models in the blend, BLEND_MODELS order, with their rescaled weights. */
  readonly parts: readonly { model: BlendModel; scorer: Scorer; weight: number }[];
  readonly missing: readonly BlendModel[];
  readonly #content: Scorer | null;
  readonly #cold: Uint8Array | null;
  readonly #raw: Float32Array;
  readonly #scratch: Float64Array;
  #columns: Float32Array[] = [];
  #weights: Float64Array;

  constructor(spec: BlendSpec, scorers: ReadonlyMap<string, Scorer>, customersPerItem: Int32Array, coldMinCustomers = DEFAULT_COLD_START_MIN_CUSTOMERS) {
    this.spec = spec;
    this.itemCount = customersPerItem.length;
    const missing: BlendModel[] = [];
    const parts: { model: BlendModel; scorer: Scorer; weight: number }[] = [];
    for (const m of BLEND_MODELS) {
      const w = spec.weights[m] ?? 0;
      if (!(w > 0)) continue;
      const s = scorers.get(m);
      if (!s) missing.push(m);
      else parts.push({ model: m, scorer: s, weight: w });
    }
    if (parts.length === 0) throw new InputError(`the validated blend (${BLEND_MODELS.filter((m) => (spec.weights[m] ?? 0) > 0).join(', ')}) has no trained model left: retrain`);
    const total = parts.reduce((s, p) => s + p.weight, 0);
    for (const p of parts) {
      p.weight /= total;
      if (p.scorer.itemCount !== this.itemCount) throw new InputError(`model '${p.model}' knows ${p.scorer.itemCount} items, the catalogue has ${this.itemCount}; retrain`);
    }
    this.parts = parts;
    this.missing = missing;
    this.#content = spec.coldContent ? (scorers.get('content') ?? null) : null;
    this.#cold = this.#content ? Uint8Array.from(customersPerItem, (c) => (c < coldMinCustomers ? 1 : 0)) : null;
    const N = this.itemCount;
    this.#raw = new Float32Array(N);
    this.#scratch = new Float64Array(N);
    this.#weights = Float64Array.from(parts, (p) => p.weight);
  }

  /** True when the blend is one model's raw scores (no normalisation needed). */
  get isRawSingle(): boolean {
    return this.parts.length === 1 && this.#cold === null;
  }

  /** Customer u's blended relevance for every item (history items included: the caller leaves them out). */
  scoreInto(u: number, history: Csr, out: Float32Array): void {
    if (this.isRawSingle) {
      this.parts[0]!.scorer.scoreInto(u, history, out);
      return;
    }
    this.blendInto(this.columnsFor(u, history), out);
  }

  /** The blend of columns from `columnsFor`, into out. */
  blendInto(cols: { parts: Float32Array[]; content: Float32Array | null }, out: Float32Array): void {
    blendColumnsInto(cols.parts, this.#weights, this.#cold, cols.content, out, this.spec.coldShare ?? 1);
  }

  /**
   * Customer u's normalised column of each part (and of content, for the cold path), in scratch owned by
   * this scorer: valid until the next call. Used by `scoreInto` and to explain a list (weight × column).
   */
  columnsFor(u: number, history: Csr): { parts: Float32Array[]; content: Float32Array | null } {
    const N = this.itemCount;
    const need = this.parts.length + (this.#content ? 1 : 0);
    while (this.#columns.length < need) this.#columns.push(new Float32Array(N));
    const hist = u < history.rows ? history.indices.subarray(history.indptr[u]!, history.indptr[u + 1]!) : new Int32Array(0);
    const norm = (s: Scorer, into: Float32Array) => {
      s.scoreInto(u, history, this.#raw);
      normaliseForCustomer(this.spec.normalisation, this.#raw, hist, into, this.#scratch);
    };
    const parts = this.parts.map((p, q) => {
      norm(p.scorer, this.#columns[q]!);
      return this.#columns[q]!;
    });
    let content: Float32Array | null = null;
    if (this.#content) {
      const at = this.parts.findIndex((p) => p.model === 'content');
      if (at >= 0) content = parts[at]!;
      else norm(this.#content, (content = this.#columns[this.parts.length]!));
    }
    return { parts, content };
  }

  /** Dense item i is cold and scored through content. */
  isCold(i: number): boolean {
    return this.#cold !== null && this.#cold[i] === 1;
  }

  /**
   * An audience's relevance for every item: the mean over its members of their blended relevance, each
   * member's own items set to that member's lowest score (a slot spent on what a reader already has is
   * wasted). Audiences above `sample` members are sampled with `seededRng(seed)` (common practice, no
   * source: 300 customers estimate a mean to about sd/17). Returns the customers used.
   */
  audienceInto(audience: Int32Array, history: Csr, owned: Csr, out: Float32Array, o: { sample?: number; seed?: number } = {}): number {
    const N = this.itemCount;
    out.fill(0);
    const members = Int32Array.from(audience).filter((u) => u >= 0 && u < history.rows);
    if (members.length === 0) return 0;
    const cap = Math.max(1, Math.floor(o.sample ?? 300));
    let chosen = members;
    if (members.length > cap) {
      const rng = seededRng(o.seed ?? 0);
      for (let c = 0; c < cap; c++) {
        const j = c + rng.int(members.length - c);
        const t = members[c]!;
        members[c] = members[j]!;
        members[j] = t;
      }
      chosen = members.subarray(0, cap);
    }
    const sum = new Float64Array(N);
    const buf = new Float32Array(N);
    for (const u of chosen) {
      this.scoreInto(u, history, buf);
      let min = Infinity;
      for (let i = 0; i < N; i++) if (buf[i]! < min) min = buf[i]!;
      if (u < owned.rows) for (let p = owned.indptr[u]!; p < owned.indptr[u + 1]!; p++) buf[owned.indices[p]!] = min;
      for (let i = 0; i < N; i++) sum[i]! += buf[i]!;
    }
    for (let i = 0; i < N; i++) out[i] = sum[i]! / chosen.length;
    return chosen.length;
  }
}
