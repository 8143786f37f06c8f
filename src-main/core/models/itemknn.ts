import { SectionReader, formatVersion, packSections } from '../matrix/bytes.ts';
import { transpose, type Csr } from '../matrix/csr.ts';
import { CancelledError, InputError } from '../errors.ts';
import { checkTransform, decayedValue, transformCode, transformFromCode, transformMatrix, type ValueTransform } from '../matrix/values.ts';
import { describeRecency, NO_RECENCY, recencyFromSection, recencyOf, recencySection, type Recency } from './recency.ts';
import type { FitOptions, FitReport, Scorer, TopN } from './scorer.ts';
import { collectNeighbours, neighbourRowInto, neighbourTopN, type Neighbours } from './topn.ts';

/**
 * Item-based collaborative filtering, Sarwar, Karypis, Konstan & Riedl (2001), "Item-based
 * collaborative filtering recommendation algorithms", §3.1.1 (cosine-based similarity) with shrinkage:
 *   sim(i, j) = x_i · x_j / (‖x_i‖ ‖x_j‖ + shrink)
 * over the item columns x_i of the interaction matrix. Shrinkage pulls similarities resting on few
 * common customers towards 0 (common practice in neighbourhood models, no single source). Each item
 * keeps its K most similar items; a customer's score for j is Σ_h x_uh · sim(h, j) over the history
 * items h whose lists contain j, where x_uh is the history value through the model's transform
 * (matrix/values.ts; presence by default, so x is binary as in Sarwar et al.'s setting).
 *
 * Among candidates tied with the K-th similarity, all are kept (topn.ts collectNeighbours, `ties: 'all'`), so
 * the model does not depend on the order of the catalogue.
 *
 * `normalize: 'sum'` is Deshpande & Karypis (2004), "Item-based top-N recommendation algorithms", ACM TOIS
 * 22(1), §4.2 (similarity normalisation): each history item's kept similarities are scaled to sum to 1 when
 * scoring, so an item whose neighbourhood is dense (many high similarities) does not outweigh the rest of the
 * history; they report it improving top-N quality on most of their data sets. The stored similarities stay the
 * cosines (similar items and their values are unchanged); tuning searches the option (services/tune/grid.ts).
 */
export interface ItemKnnParams {
  /** Neighbours kept per item. Default 50. */
  k?: number;
  /** Added to the norm product in the denominator. Default 10. */
  shrink?: number;
  /** How a matrix value enters, in the fit and in scoring (matrix/values.ts). Default presence. */
  values?: ValueTransform;
  /** 'sum': each history item's neighbour similarities sum to 1 in scoring (Deshpande & Karypis 2004 §4.2). Default 'none'. */
  normalize?: KnnNormalize;
  /** Half-life in days of the entries the cosines are computed from (matrix/values.ts "Recency"); null/absent = off. */
  fitHalfLifeDays?: number | null;
  /** Half-life in days of the history values x_uh in scoring Σ_h x_uh · sim(h, j); null/absent = off. */
  profileHalfLifeDays?: number | null;
}

export const KNN_NORMALIZE = ['none', 'sum'] as const;
export type KnnNormalize = (typeof KNN_NORMALIZE)[number];

export const ITEMKNN_DEFAULTS = { k: 50, shrink: 10, values: 'presence', normalize: 'none' } as const satisfies ItemKnnParams;

function checkNormalize(v: unknown): KnnNormalize {
  if (!KNN_NORMALIZE.includes(v as KnnNormalize)) throw new InputError(`item-kNN normalize must be one of ${KNN_NORMALIZE.join(', ')}, got ${String(v)}`);
  return v as KnnNormalize;
}

export class ItemKnnModel implements Scorer {
  readonly kind = 'itemknn' as const;
  constructor(
    readonly neighbours: Neighbours,
    readonly values: ValueTransform = ITEMKNN_DEFAULTS.values,
    readonly normalize: KnnNormalize = ITEMKNN_DEFAULTS.normalize,
    readonly recency: Recency = NO_RECENCY,
  ) {
    const nb = neighbours;
    this.#scale = new Float32Array(nb.items).fill(1);
    if (normalize === 'sum') {
      for (let h = 0; h < nb.items; h++) {
        let s = 0;
        for (let q = nb.indptr[h]!, e = nb.indptr[h + 1]!; q < e; q++) s += nb.data[q]!;
        this.#scale[h] = s > 0 ? 1 / s : 0;
      }
    }
  }
  /** Per history item, the factor of its similarities in scoring (1, or 1 / their sum under 'sum'). */
  readonly #scale: Float32Array;

  get itemCount(): number {
    return this.neighbours.items;
  }

  scoreInto(u: number, history: Csr, out: Float32Array): void {
    out.fill(0);
    const nb = this.neighbours;
    const t = this.values;
    const half = this.recency.profileHalfLifeDays;
    for (let p = history.indptr[u]!, end = history.indptr[u + 1]!; p < end; p++) {
      const h = history.indices[p]!;
      const x = decayedValue(history, p, t, half) * this.#scale[h]!;
      for (let q = nb.indptr[h]!, e = nb.indptr[h + 1]!; q < e; q++) out[nb.indices[q]!]! += x * nb.data[q]!;
    }
  }

  similarityInto(i: number, out: Float32Array): void {
    neighbourRowInto(this.neighbours, i, out);
  }

  similarItems(i: number, n: number): TopN {
    return neighbourTopN(this.neighbours, i, n);
  }

  serialize(): Uint8Array {
    const nb = this.neighbours;
    const norm = KNN_NORMALIZE.indexOf(this.normalize);
    return packSections(MAGIC, 4, [
      Int32Array.of(nb.items),
      nb.indptr,
      nb.indices,
      nb.data,
      Int32Array.of(transformCode(this.values)),
      Int32Array.of(norm),
      recencySection(this.recency),
    ]);
  }

  /** The same neighbours scoring with another profile half-life (no refit: the profile side only reads the history). */
  withProfileHalfLife(profileHalfLifeDays: number | null): ItemKnnModel {
    return new ItemKnnModel(this.neighbours, this.values, this.normalize, { ...this.recency, profileHalfLifeDays });
  }
}

const MAGIC = 'SWITMKNN';

/**
 * Reads format 4 (with the recency half-lives), format 3 (before them: both off, with the normalisation), format
 * 2 (before it: none) and format 1 (before value transforms too: raw values, i.e. linear).
 */
export function loadItemKnn(bytes: Uint8Array): ItemKnnModel {
  const version = formatVersion(bytes);
  const r = new SectionReader(bytes, MAGIC, version === 1 ? 1 : version === 2 ? 2 : version === 3 ? 3 : 4);
  const items = r.i32()[0]!;
  const indptr = r.i32();
  if (indptr.length !== items + 1) throw new InputError('not a valid item-kNN model: neighbour offsets do not match the item count');
  const nb = { items, indptr, indices: r.i32(), data: r.f32() };
  const values = version === 1 ? 'linear' : transformFromCode(r.i32()[0]!);
  let normalize: KnnNormalize = 'none';
  if (version >= 3) {
    const code = r.i32()[0]!;
    if (!(code >= 0 && code < KNN_NORMALIZE.length)) throw new InputError(`not a valid item-kNN model: unknown normalisation code ${code}`);
    normalize = KNN_NORMALIZE[code]!;
  }
  return new ItemKnnModel(nb, values, normalize, version >= 4 ? recencyFromSection(r.f64()) : NO_RECENCY);
}

/**
 * Fits item-kNN on an interaction matrix (customers × items). For each item i the dot products with
 * every co-occurring item are accumulated sparsely — Σ over customers u of i, over items j of u — into
 * one dense accumulator reused across items, with a touched list so that resetting it costs only what
 * was touched. Cost Σ_u |row_u|², memory O(items + customers + nnz).
 */
export function fitItemKnn(raw: Csr, params: ItemKnnParams = {}, o: FitOptions = {}): { model: ItemKnnModel; report: FitReport } {
  const start = performance.now();
  // k may exceed the catalogue: every item is then kept ("all" in the tuning grid).
  const k = params.k ?? ITEMKNN_DEFAULTS.k;
  const shrink = params.shrink ?? ITEMKNN_DEFAULTS.shrink;
  const values = checkTransform(params.values ?? ITEMKNN_DEFAULTS.values);
  const normalize = checkNormalize(params.normalize ?? ITEMKNN_DEFAULTS.normalize);
  if (!(Number.isInteger(k) && k > 0)) throw new InputError(`item-kNN k must be a positive integer, got ${k}`);
  if (!(shrink >= 0)) throw new InputError(`item-kNN shrink must be >= 0, got ${shrink}`);
  const recency = recencyOf(params, 'item-kNN');
  const x = transformMatrix(raw, values, recency.fitHalfLifeDays);
  const xt = transpose(x);
  const nItems = x.cols;
  const norm = new Float64Array(nItems);
  for (let i = 0; i < nItems; i++) {
    let s = 0;
    for (let p = xt.indptr[i]!, e = xt.indptr[i + 1]!; p < e; p++) s += xt.data[p]! * xt.data[p]!;
    norm[i] = Math.sqrt(s);
  }
  const acc = new Float32Array(nItems);
  const touched = new Int32Array(nItems);
  const seen = new Uint8Array(nItems);
  const step = Math.max(1, Math.ceil(nItems / 20));
  const neighbours = collectNeighbours(nItems, Math.max(1, Math.min(k, nItems)), (i, heap) => {
    if (i % step === 0) {
      if (o.signal?.aborted) throw new CancelledError();
      o.onIteration?.({ iteration: i / step, iterations: Math.ceil(nItems / step), elapsedMs: performance.now() - start });
    }
    let nTouched = 0;
    for (let p = xt.indptr[i]!, e = xt.indptr[i + 1]!; p < e; p++) {
      const u = xt.indices[p]!;
      const a = xt.data[p]!;
      for (let q = x.indptr[u]!, f = x.indptr[u + 1]!; q < f; q++) {
        const j = x.indices[q]!;
        if (seen[j] === 0) {
          seen[j] = 1;
          touched[nTouched++] = j;
        }
        acc[j]! += a * x.data[q]!;
      }
    }
    const ni = norm[i]!;
    for (let t = 0; t < nTouched; t++) {
      const j = touched[t]!;
      if (j !== i) {
        const sim = acc[j]! / (ni * norm[j]! + shrink);
        if (sim > 0) heap.push(j, sim);
      }
      acc[j] = 0;
      seen[j] = 0;
    }
  }, { ties: 'all' });
  const elapsedMs = performance.now() - start;
  return {
    model: new ItemKnnModel(neighbours, values, normalize, recency),
    report: {
      kind: 'itemknn',
      elapsedMs,
      notes: [`item-kNN: ${nItems} items, k ${k}, shrink ${shrink}, values ${values}, normalize ${normalize}, ${describeRecency(recency)}`],
    },
  };
}
