import type { BlendWeights } from '../curation/types.ts';
import { InputError } from '../errors.ts';
import type { Scorer } from '../models/scorer.ts';
import {
  C_AUDIENCE,
  C_COLLABORATIVE,
  C_CONTENT,
  C_FRESHNESS,
  C_POPULARITY,
  C_TREND,
  COMPONENT_COUNT,
  DEFAULT_COLD_START_MIN_CUSTOMERS,
  effectiveWeights,
} from './components.ts';
import { DEFAULT_FRESHNESS_HALF_LIFE_DAYS, freshnessInto } from './freshness.ts';
import { normaliseInto, percentileInto, type Normalisation } from './normalise.ts';
import { PoolScores } from './pool-scores.ts';

/** The trained models the hybrid draws on; any may be missing (its components are then unavailable). */
export interface HybridModels {
  /** Content similarity (TF-IDF + attributes). */
  content: Scorer | null;
  /** Collaborative item similarity (item-kNN, EASE or iALS). */
  collaborative: Scorer | null;
  /** The model whose predicted preference is averaged over an audience (iALS preferred: exact and cheap). */
  affinity: Scorer | null;
}

/** Per-item facts from the interaction history, dense item order. */
export interface HybridItemData {
  /** Distinct customers per item: the popularity component and the cold-start test. */
  customersPerItem: Int32Array;
  /** Recent change in interest (higher = rising); null when not computed. */
  trend: Float32Array | null;
  /** Unix ms the item was added; NaN when unknown. */
  addedAt: Float64Array;
}

export interface HybridOptions {
  coldStartMinCustomers?: number;
  freshnessHalfLifeDays?: number;
  normalisation?: Normalisation;
  /** Anchor similarity rows kept between calls (editors re-score the same anchors many times). */
  anchorCacheSize?: number;
}

export interface PoolRequest {
  /** Candidate dense item indices (the pool). */
  pool: Int32Array;
  /** Anchor dense item indices. */
  anchors: Int32Array;
  weights: BlendWeights;
  /** Unix ms of the edition date (freshness is measured at it). */
  editionDate: number;
  /** Catalogue-length audience affinity (`audienceAffinityInto`); null or absent = no audience component. */
  audienceAffinity?: Float32Array | null;
  /** Boost (> 1) / sink (< 1) factor per dense item index, applied after blending. */
  multipliers?: ReadonlyMap<number, number>;
  /** Trend ratios measured at another time than the scorer's own (a back-dated edition); absent = its own. */
  trend?: Float32Array | null;
  /**
   * Catalogue-length relevance of every item to the anchors by the validated blend (anchor-relevance.ts).
   * Given (with anchors), it is the collaborative component's raw value in place of the mean of the
   * collaborative model's similarity rows, which then serve only as evidence ("why?").
   */
  anchorRelevance?: Float32Array | null;
}

/**
 * The hybrid scorer. For a pool it computes six components per candidate — content and collaborative
 * similarity to the anchors (mean over anchors; the collaborative part is the validated blend's relevance to
 * the anchors when the caller gives it, anchor-relevance.ts), audience affinity, popularity (distinct customers),
 * trend and freshness — normalises each within the pool, blends them with the brief's weights
 * (renormalised over the available components, so the blend is in [0, 1]), then multiplies by the
 * editor's boost/sink factor. Cold items (fewer than `coldStartMinCustomers` customers) take their
 * normalised content value in place of both collaborative and audience values when anchors give
 * content something to say. Each candidate keeps its contributions (weight × normalised value) and the
 * anchors behind its similarity parts (see PoolScores.explain).
 *
 * Cost: one similarity row per anchor and model (cached, `anchorCacheSize` rows), then O(pool) per
 * component plus an O(pool log pool) native sort per component for the percentile. Per-pool arrays are
 * the result's own; scratch buffers are reused across calls.
 */
export class HybridScorer {
  readonly itemCount: number;
  readonly models: HybridModels;
  readonly data: HybridItemData;
  readonly coldStartMinCustomers: number;
  readonly freshnessHalfLifeDays: number;
  readonly normalisation: Normalisation;
  readonly #cacheSize: number;
  readonly #cache = new Map<string, Float32Array>();
  #scratch = new Float64Array(0);
  #column = new Float32Array(0);
  #freshness: Float32Array;
  #freshnessAt = Number.NaN;
  readonly #dated: boolean;

  constructor(models: HybridModels, data: HybridItemData, options: HybridOptions = {}) {
    const n = data.customersPerItem.length;
    for (const m of [models.content, models.collaborative, models.affinity]) {
      if (m && m.itemCount !== n) throw new InputError(`model '${m.kind}' knows ${m.itemCount} items, the catalogue has ${n}; retrain`);
    }
    if (data.addedAt.length !== n || (data.trend && data.trend.length !== n)) {
      throw new InputError(`item data lengths differ from the catalogue size ${n}`);
    }
    this.itemCount = n;
    this.models = models;
    this.data = data;
    this.coldStartMinCustomers = options.coldStartMinCustomers ?? DEFAULT_COLD_START_MIN_CUSTOMERS;
    this.freshnessHalfLifeDays = options.freshnessHalfLifeDays ?? DEFAULT_FRESHNESS_HALF_LIFE_DAYS;
    this.normalisation = options.normalisation ?? 'percentile';
    this.#cacheSize = Math.max(0, options.anchorCacheSize ?? 64);
    this.#freshness = new Float32Array(n);
    // Freshness reads items' dates added; with none (a catalogue exported without them) every item would read 0,
    // which tells no item apart: the component is left out and its weight goes to the others.
    this.#dated = data.addedAt.some((t) => t === t);
  }

  /** Freshness of every item at `editionDate`, computed once per date. */
  freshnessAt(editionDate: number): Float32Array {
    if (editionDate !== this.#freshnessAt) {
      freshnessInto(this.data.addedAt, editionDate, this.freshnessHalfLifeDays, this.#freshness);
      this.#freshnessAt = editionDate;
    }
    return this.#freshness;
  }

  /** Similarity of every item to anchor a under a model, through a small insertion-ordered cache. */
  similarityRow(which: 'content' | 'collaborative', a: number): Float32Array {
    const model = this.models[which];
    if (!model) throw new InputError(`no ${which} model is trained`);
    const key = `${which}:${a}`;
    const hit = this.#cache.get(key);
    if (hit) return hit;
    const row = new Float32Array(this.itemCount);
    model.similarityInto(a, row);
    if (this.#cacheSize > 0) {
      if (this.#cache.size >= this.#cacheSize) this.#cache.delete(this.#cache.keys().next().value!);
      this.#cache.set(key, row);
    }
    return row;
  }

  scorePool(req: PoolRequest): PoolScores {
    const { pool, anchors } = req;
    const n = pool.length;
    const N = this.itemCount;
    for (const i of pool) if (!(i >= 0 && i < N)) throw new InputError(`pool item index ${i} is outside 0..${N - 1}`);
    for (const a of anchors) if (!(a >= 0 && a < N)) throw new InputError(`anchor item index ${a} is outside 0..${N - 1}`);
    const affinity = req.audienceAffinity ?? null;
    if (affinity && affinity.length !== N) throw new InputError(`audience affinity has ${affinity.length} items, expected ${N}`);

    const anchorRel = anchors.length > 0 ? (req.anchorRelevance ?? null) : null;
    if (anchorRel && anchorRel.length !== N) throw new InputError(`anchor relevance has ${anchorRel.length} items, expected ${N}`);
    const available = [
      anchors.length > 0 && this.models.content !== null,
      anchors.length > 0 && (anchorRel !== null || this.models.collaborative !== null),
      affinity !== null,
      true,
      (req.trend === undefined ? this.data.trend : req.trend) !== null,
      this.#dated,
    ];
    const w = effectiveWeights(req.weights, available);
    const contentRows = available[C_CONTENT] ? Array.from(anchors, (a) => this.similarityRow('content', a)) : [];
    const collabRows = available[C_COLLABORATIVE] && this.models.collaborative ? Array.from(anchors, (a) => this.similarityRow('collaborative', a)) : [];

    const raw = new Float32Array(COMPONENT_COUNT * n);
    const norm = new Float32Array(COMPONENT_COUNT * n);
    const cold = new Uint8Array(n);
    const fresh = this.freshnessAt(req.editionDate);
    const cpi = this.data.customersPerItem;
    const trend = req.trend === undefined ? this.data.trend : req.trend;
    if (trend && trend.length !== N) throw new InputError(`trend has ${trend.length} items, expected ${N}`);
    const invA = anchors.length > 0 ? 1 / anchors.length : 0;
    for (let p = 0; p < n; p++) {
      const i = pool[p]!;
      let sc = 0;
      for (const row of contentRows) sc += row[i]!;
      let sk = 0;
      for (const row of collabRows) sk += row[i]!;
      raw[C_CONTENT * n + p] = sc * invA;
      raw[C_COLLABORATIVE * n + p] = anchorRel ? anchorRel[i]! : sk * invA;
      raw[C_AUDIENCE * n + p] = affinity ? affinity[i]! : 0;
      raw[C_POPULARITY * n + p] = cpi[i]!;
      raw[C_TREND * n + p] = trend ? trend[i]! : 0;
      raw[C_FRESHNESS * n + p] = fresh[i]!;
      cold[p] = cpi[i]! < this.coldStartMinCustomers ? 1 : 0;
    }
    this.#ensureScratch(n);
    for (let c = 0; c < COMPONENT_COUNT; c++) {
      if (!available[c]) continue;
      normaliseInto(this.normalisation, raw.subarray(c * n, (c + 1) * n), n, norm.subarray(c * n, (c + 1) * n), this.#scratch);
    }
    if (available[C_CONTENT]) {
      for (let p = 0; p < n; p++) {
        if (!cold[p]) continue;
        const v = norm[C_CONTENT * n + p]!;
        norm[C_COLLABORATIVE * n + p] = v;
        norm[C_AUDIENCE * n + p] = v;
      }
    }
    const contrib = new Float32Array(COMPONENT_COUNT * n);
    const blended = new Float32Array(n);
    const score = new Float32Array(n);
    const mult = new Float32Array(n);
    for (let p = 0; p < n; p++) {
      let s = 0;
      for (let c = 0; c < COMPONENT_COUNT; c++) {
        const v = w[c]! * norm[c * n + p]!;
        contrib[c * n + p] = v;
        s += v;
      }
      blended[p] = s;
      const m = req.multipliers?.get(pool[p]!) ?? 1;
      if (!(m >= 0) || !Number.isFinite(m)) throw new InputError(`boost/sink factor for item ${pool[p]} must be >= 0, got ${m}`);
      mult[p] = m;
      score[p] = s * m;
    }
    const percentile = new Float32Array(n);
    percentileInto(score, n, percentile, this.#scratch);
    return new PoolScores({
      pool: Int32Array.from(pool),
      anchors: Int32Array.from(anchors),
      available,
      weights: w,
      raw,
      normalised: norm,
      contributions: contrib,
      blended,
      multiplier: mult,
      score,
      percentile,
      coldStart: cold,
      contentRows,
      collaborativeRows: collabRows,
    });
  }

  #ensureScratch(n: number): void {
    if (this.#scratch.length < n) this.#scratch = new Float64Array(n);
    if (this.#column.length < n) this.#column = new Float32Array(n);
  }

  /** @internal shared scratch for customer mode (same module family). */
  scratchFor(n: number): { scratch: Float64Array; column: Float32Array } {
    this.#ensureScratch(n);
    return { scratch: this.#scratch, column: this.#column };
  }
}
