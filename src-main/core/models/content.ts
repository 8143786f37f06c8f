import { SectionReader, formatVersion, packSections } from '../matrix/bytes.ts';
import { checkHalfLife } from '../matrix/values.ts';
import { transpose, type Csr } from '../matrix/csr.ts';
import { CancelledError, InputError } from '../errors.ts';
import { fitTfidf, normalizeRow } from '../text/tfidf.ts';
import { tokenize, type TokenizeOptions } from '../text/tokenize.ts';
import type { Item } from '../types.ts';
import type { FitOptions, FitReport, Scorer, TopN } from './scorer.ts';
import { collectNeighbours, neighbourTopN, type Neighbours, type TopKHeap } from './topn.ts';

/**
 * Content similarity (DESIGN.md "Methods"): TF-IDF over title, description and tags (scikit-learn's
 * documented TfidfVectorizer formula, see text/tfidf.ts), followed by one-hot columns for category and
 * supplier (and, if asked for, a price band), each set to `attributeWeight`; the whole row is then
 * l2-normalised so a dot product of two rows is their cosine similarity.
 *
 * A customer's history enters as presence: the score is the mean exact cosine over the distinct history
 * items, whatever their quantities (the matrix values are ignored), as in the quality reference.
 */
export interface ContentParams {
  tokenize?: TokenizeOptions;
  /** Value of each one-hot attribute column next to the unit-length text part. Default 0.5 (common practice, no source). */
  attributeWeight?: number;
  /**
   * Price bands cut at catalogue quantiles. Default 0: price left out. Price is a number, not one of the
   * catalogue's categorical attributes (DESIGN.md "Methods"), and a band one-hot puts a floor of
   * w²/(1+w²) (0.2 at w = 0.5) under the cosine of every pair in the same band (a quarter of the
   * catalogue at 4 bands), which swamps the text of short titles: on Online Retail content NDCG@20
   * fell from 0.0684 to 0.0645 with 4 bands (bench/quality).
   */
  priceBands?: number;
  /** Neighbours kept per item for similar-item lists (`similarItems`); customers are scored exactly. Default 50. */
  k?: number;
  /** Minimum document frequency of a term. Default 1. */
  minDf?: number;
  /**
   * Profile half-life in days (null or left out: off): each history item weighs 2^(−age / h) in the customer's
   * profile, age = days since the customer's latest signal of it (matrix/values.ts "Recency"). Scoring only:
   * the item vectors do not depend on it.
   */
  profileHalfLifeDays?: number | null;
}

export const CONTENT_DEFAULTS = { attributeWeight: 0.5, priceBands: 0, k: 50, minDf: 1 } as const;

export interface ContentVectors {
  /** Items × features, rows l2-normalised (an item with no text and no attributes has an empty row). */
  vectors: Csr;
  /** Name of each feature column: a term, or `category:x`, `supplier:x`, `price:b`. */
  featureNames: string[];
}

/** The item vectors the content model and the meters (intra-list distance) share. */
export function contentVectors(items: readonly Item[], params: ContentParams = {}): ContentVectors {
  const w = params.attributeWeight ?? CONTENT_DEFAULTS.attributeWeight;
  const bands = params.priceBands ?? CONTENT_DEFAULTS.priceBands;
  if (!(w >= 0 && Number.isFinite(w))) throw new InputError(`attributeWeight must be a finite number >= 0, got ${w}`);
  if (!(Number.isInteger(bands) && bands >= 0)) throw new InputError(`priceBands must be an integer >= 0, got ${bands}`);
  const docs = items.map((it) => tokenize(`${it.title}\n${it.description}\n${it.tags.join('\n')}`, params.tokenize));
  const tf = fitTfidf(docs, { minDf: params.minDf ?? CONTENT_DEFAULTS.minDf });

  // Attribute columns after the terms: categories, suppliers (sorted), then price bands.
  const names = [...tf.vocabulary];
  const columnOf = (prefix: string, values: string[]): Map<string, number> => {
    const m = new Map<string, number>();
    for (const v of [...new Set(values.filter((x) => x !== ''))].sort()) {
      m.set(v, names.length);
      names.push(`${prefix}:${v}`);
    }
    return m;
  };
  const catCol = w > 0 ? columnOf('category', items.map((it) => it.category)) : new Map<string, number>();
  const supCol = w > 0 ? columnOf('supplier', items.map((it) => it.supplier)) : new Map<string, number>();
  const cuts = w > 0 && bands > 0 ? priceCuts(items, bands) : new Float64Array(0);
  const bandBase = names.length;
  if (cuts.length > 0) for (let b = 0; b <= cuts.length; b++) names.push(`price:${b}`);

  const t = tf.matrix;
  const indptr = new Int32Array(items.length + 1);
  const indices = new Int32Array(t.indptr[t.rows]! + 3 * items.length);
  const data = new Float64Array(indices.length);
  let q = 0;
  items.forEach((it, i) => {
    const start = q;
    for (let p = t.indptr[i]!; p < t.indptr[i + 1]!; p++) {
      indices[q] = t.indices[p]!;
      data[q++] = t.data[p]!;
    }
    const add = (c: number | undefined): void => {
      if (c === undefined) return;
      indices[q] = c;
      data[q++] = w;
    };
    add(catCol.get(it.category));
    add(supCol.get(it.supplier));
    if (cuts.length > 0 && it.price !== null && Number.isFinite(it.price)) add(bandBase + upperBound(cuts, it.price));
    normalizeRow(data, start, q);
    indptr[i + 1] = q;
  });
  return {
    vectors: { rows: items.length, cols: names.length, indptr, indices: indices.slice(0, q), data: Float32Array.from(data.subarray(0, q)) },
    featureNames: names,
  };
}

/** Band edges at the j/bands quantiles of the catalogue's known prices (distinct edges only). */
function priceCuts(items: readonly Item[], bands: number): Float64Array {
  const prices = Float64Array.from(items.flatMap((it) => (it.price !== null && Number.isFinite(it.price) ? [it.price] : []))).sort();
  if (prices.length === 0) return new Float64Array(0);
  const edges: number[] = [];
  for (let b = 1; b < bands; b++) {
    const e = prices[Math.min(prices.length - 1, Math.floor((b * prices.length) / bands))]!;
    if (edges.length === 0 || e > edges[edges.length - 1]!) edges.push(e);
  }
  return Float64Array.from(edges);
}

/** Number of edges <= x: the band of price x (band b holds edges[b−1] <= x < edges[b]). */
function upperBound(edges: Float64Array, x: number): number {
  let lo = 0;
  let hi = edges.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (edges[mid]! <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export class ContentModel implements Scorer {
  readonly kind = 'content' as const;
  readonly #postings: Csr;
  /** Scratch for scoreInto: the customer's profile over features, and which features it touched. */
  readonly #profile: Float64Array;
  readonly #touched: Int32Array;
  readonly #seen: Uint8Array;
  readonly profileHalfLifeDays: number | null;
  constructor(
    readonly vectors: Csr,
    readonly neighbours: Neighbours,
    profileHalfLifeDays: number | null = null,
  ) {
    this.profileHalfLifeDays = checkHalfLife(profileHalfLifeDays, 'content profileHalfLifeDays');
    if (neighbours.items !== vectors.rows) throw new InputError('content model: neighbour lists and vectors disagree on the item count');
    this.#postings = transpose(vectors);
    this.#profile = new Float64Array(vectors.cols);
    this.#touched = new Int32Array(vectors.cols);
    this.#seen = new Uint8Array(vectors.cols);
  }

  get itemCount(): number {
    return this.vectors.rows;
  }

  /** The same vectors and lists, scoring with another profile half-life (tuning's trials share one fit). */
  withProfileHalfLife(h: number | null): ContentModel {
    return new ContentModel(this.vectors, this.neighbours, h);
  }

  /**
   * Mean exact cosine of item j to the customer's distinct history items h ≠ j (presence: quantities ignored).
   *
   * Why exact, not read from each history item's top-K neighbour lists (a product choice): the mean of the
   * cosines is the dot product of v_j with the profile Σ_h v_h / |H|, so one sparse pass over the profile's
   * features through the inverted index scores every item exactly, and costs no more than the neighbour
   * lists do for a long history (the profile's features are shared between history items). The top-K lists
   * cut the long tail of small similarities, and summed over a history of dozens of items that tail decides
   * the ranking: on Online Retail (bench/quality) the lists read NDCG@20 0.0684, the exact profile 0.0722,
   * as the reference (bench/quality/reference.py `content`, the full cosine matrix) does. Items with no
   * signal (cold items) get their score the same way, from their own text, so the hybrid's content path for
   * them is unchanged. The top-K lists still serve `similarItems`.
   *
   * With a profile half-life h (and a history carrying ages) the mean is weighted: item h counts
   * w_h = 2^(−age_h / h) (matrix/values.ts "Recency"), the score is Σ_h w_h cos(j, h) / Σ_h w_h, so a customer's
   * recent items say more about what they want next (Ding & Li 2005's time weight, on the profile side as
   * item-kNN and EASE apply it). Dividing by Σ w keeps the scale of the unweighted mean.
   */
  scoreInto(u: number, history: Csr, out: Float32Array): void {
    out.fill(0);
    const start = history.indptr[u]!;
    const end = history.indptr[u + 1]!;
    if (end === start) return;
    const v = this.vectors;
    const profile = this.#profile;
    const touched = this.#touched;
    const seen = this.#seen;
    let nTouched = 0;
    const ages = this.profileHalfLifeDays === null ? undefined : history.ageDays;
    const half = this.profileHalfLifeDays ?? 1;
    const weight = (p: number): number => (ages ? Math.pow(2, -ages[p]! / half) : 1);
    let totalWeight = 0;
    // The profile Σ_h w_h v_h, over the features it touches (history rows are distinct items: a CSR row).
    for (let p = start; p < end; p++) {
      const h = history.indices[p]!;
      const w = weight(p);
      totalWeight += w;
      for (let q = v.indptr[h]!, e = v.indptr[h + 1]!; q < e; q++) {
        const f = v.indices[q]!;
        if (seen[f] === 0) {
          seen[f] = 1;
          touched[nTouched++] = f;
        }
        profile[f]! += w * v.data[q]!;
      }
    }
    const ix = this.#postings;
    for (let t = 0; t < nTouched; t++) {
      const f = touched[t]!;
      const a = profile[f]!;
      for (let q = ix.indptr[f]!, g = ix.indptr[f + 1]!; q < g; q++) out[ix.indices[q]!]! += a * ix.data[q]!;
      profile[f] = 0;
      seen[f] = 0;
    }
    // Leave out each history item's similarity to itself (h = j), as the neighbour lists and the reference do.
    for (let p = start; p < end; p++) {
      const h = history.indices[p]!;
      let self = 0;
      for (let q = v.indptr[h]!, e = v.indptr[h + 1]!; q < e; q++) self += v.data[q]! * v.data[q]!;
      out[h]! -= weight(p) * self;
    }
    const inv = 1 / (ages ? totalWeight : end - start);
    for (let j = 0; j < out.length; j++) out[j]! *= inv;
  }

  /** Exact cosine of item i with every item, by sparse dot products over the inverted index. */
  similarityInto(i: number, out: Float32Array): void {
    out.fill(0);
    const v = this.vectors;
    const ix = this.#postings;
    for (let p = v.indptr[i]!, e = v.indptr[i + 1]!; p < e; p++) {
      const f = v.indices[p]!;
      const a = v.data[p]!;
      for (let q = ix.indptr[f]!, g = ix.indptr[f + 1]!; q < g; q++) out[ix.indices[q]!]! += a * ix.data[q]!;
    }
    out[i] = 0;
  }

  similarItems(i: number, n: number): TopN {
    return neighbourTopN(this.neighbours, i, n);
  }

  /** Format 2: format 1's sections, then the profile half-life (NaN for off). */
  serialize(): Uint8Array {
    const v = this.vectors;
    const nb = this.neighbours;
    return packSections(MAGIC, 2, [
      Int32Array.of(v.rows, v.cols),
      v.indptr,
      v.indices,
      v.data,
      nb.indptr,
      nb.indices,
      nb.data,
      Float64Array.of(this.profileHalfLifeDays ?? Number.NaN),
    ]);
  }
}

const MAGIC = 'SWCONTNT';

/** Restores format 2, and format 1 (before recency: profile half-life off). */
export function loadContent(bytes: Uint8Array): ContentModel {
  const version = formatVersion(bytes) === 1 ? 1 : 2;
  const r = new SectionReader(bytes, MAGIC, version);
  const [rows, cols] = r.i32();
  const vectors: Csr = { rows: rows!, cols: cols!, indptr: r.i32(), indices: r.i32(), data: r.f32() };
  const neighbours: Neighbours = { items: rows!, indptr: r.i32(), indices: r.i32(), data: r.f32() };
  if (vectors.indptr.length !== rows! + 1 || neighbours.indptr.length !== rows! + 1) {
    throw new InputError('not a valid content model: row offsets do not match the item count');
  }
  if (version === 1) return new ContentModel(vectors, neighbours);
  const h = r.f64();
  if (h.length !== 1 || !(Number.isNaN(h[0]!) || (h[0]! > 0 && Number.isFinite(h[0]!)))) {
    throw new InputError(`not a valid content model: half-life ${Array.from(h).join(', ')}`);
  }
  return new ContentModel(vectors, neighbours, Number.isNaN(h[0]!) ? null : h[0]!);
}

/**
 * Top-K cosine neighbours per item through the inverted index (features → items).
 *
 * A feature most items share (a word in every title, a large category) makes the index pass quadratic: at
 * 160,000 items one such word is 2.6·10¹⁰ updates. Such "common" features (in more than a tenth of the items,
 * and over COMMON_MIN_ITEMS) are kept out of the candidate search, as in Bayardo, Ma & Srikant (2007), "Scaling
 * up all pairs similarity search", §4: candidates come from the item's other features, each is scored exactly
 * over all features, and an item sharing only common features with i scores at most
 * Σ_common a_if · max_j a_jf. When the K-th kept score is above that bound, no other item can enter and the
 * list is the full pass's; otherwise that item takes the full pass. Scores are summed in the same order with
 * the same float32 rounding as the full pass, so the lists are identical (tested against it).
 */
export function contentNeighbours(vectors: Csr, k: number): Neighbours {
  const ix = transpose(vectors);
  const n = vectors.rows;
  const acc = new Float32Array(n);
  const touched = new Int32Array(n);
  const seen = new Uint8Array(n);
  const common = new Uint8Array(vectors.cols);
  const maxValue = new Float32Array(vectors.cols);
  const rowJ = new Float32Array(vectors.cols);
  let anyCommon = false;
  for (let f = 0; f < vectors.cols; f++) {
    const df = ix.indptr[f + 1]! - ix.indptr[f]!;
    if (df > COMMON_MIN_ITEMS && df * 10 > n) {
      common[f] = 1;
      anyCommon = true;
      for (let q = ix.indptr[f]!; q < ix.indptr[f + 1]!; q++) maxValue[f] = Math.max(maxValue[f]!, ix.data[q]!);
    }
  }
  const fullPass = (i: number, heap: TopKHeap) => {
    let nTouched = 0;
    for (let p = vectors.indptr[i]!, e = vectors.indptr[i + 1]!; p < e; p++) {
      const a = vectors.data[p]!;
      for (let q = ix.indptr[vectors.indices[p]!]!, g = ix.indptr[vectors.indices[p]! + 1]!; q < g; q++) {
        const j = ix.indices[q]!;
        if (seen[j] === 0) {
          seen[j] = 1;
          touched[nTouched++] = j;
        }
        acc[j]! += a * ix.data[q]!;
      }
    }
    for (let t = 0; t < nTouched; t++) {
      const j = touched[t]!;
      if (j !== i && acc[j]! > 0) heap.push(j, acc[j]!);
      acc[j] = 0;
      seen[j] = 0;
    }
  };
  if (!anyCommon) return collectNeighbours(n, k, fullPass);
  return collectNeighbours(n, k, (i, heap) => {
    const from = vectors.indptr[i]!;
    const to = vectors.indptr[i + 1]!;
    let bound = 0;
    let nTouched = 0;
    for (let p = from; p < to; p++) {
      const f = vectors.indices[p]!;
      if (common[f] === 1) {
        bound += vectors.data[p]! * maxValue[f]!;
        continue;
      }
      for (let q = ix.indptr[f]!, g = ix.indptr[f + 1]!; q < g; q++) {
        const j = ix.indices[q]!;
        if (seen[j] === 0) {
          seen[j] = 1;
          touched[nTouched++] = j;
        }
      }
    }
    if (bound === 0) {
      // No common feature: the candidates are every item the full pass would touch.
      for (let t = 0; t < nTouched; t++) seen[touched[t]!] = 0;
      fullPass(i, heap);
      return;
    }
    for (let t = 0; t < nTouched; t++) {
      const j = touched[t]!;
      seen[j] = 0;
      if (j === i) continue;
      // Exact score in the full pass's order of additions (i's features in row order, float32 after each):
      // j's row scattered into a dense scratch, where a feature j lacks adds 0 and changes nothing.
      const jFrom = vectors.indptr[j]!;
      const jTo = vectors.indptr[j + 1]!;
      for (let q = jFrom; q < jTo; q++) rowJ[vectors.indices[q]!] = vectors.data[q]!;
      let s = 0;
      for (let p = from; p < to; p++) s = Math.fround(s + vectors.data[p]! * rowJ[vectors.indices[p]!]!);
      for (let q = jFrom; q < jTo; q++) rowJ[vectors.indices[q]!] = 0;
      if (s > 0) heap.push(j, s);
    }
    // The bound in exact arithmetic, widened for the float32 rounding of the sums it stands above.
    if (heap.size === Math.min(k, n - 1) && heap.worstScore > bound * (1 + 1e-5) + 1e-12) return;
    heap.clear();
    fullPass(i, heap);
  });
}

/** Below this many items a feature is never "common": the full pass over it is cheap (common practice, no source). */
const COMMON_MIN_ITEMS = 1000;

/** Fits the content model on the catalogue. */
export function fitContent(items: readonly Item[], params: ContentParams = {}, o: FitOptions = {}): { model: ContentModel; report: FitReport } {
  const start = performance.now();
  const k = params.k ?? CONTENT_DEFAULTS.k;
  if (!(Number.isInteger(k) && k > 0)) throw new InputError(`content k must be a positive integer, got ${k}`);
  const { vectors, featureNames } = contentVectors(items, params);
  if (o.signal?.aborted) throw new CancelledError();
  const model = new ContentModel(vectors, contentNeighbours(vectors, k), checkHalfLife(params.profileHalfLifeDays, 'content profileHalfLifeDays'));
  const elapsedMs = performance.now() - start;
  o.onIteration?.({ iteration: 1, iterations: 1, elapsedMs });
  return { model, report: { kind: 'content', elapsedMs, notes: [`content: ${items.length} items, ${featureNames.length} features, k ${k}`] } };
}
