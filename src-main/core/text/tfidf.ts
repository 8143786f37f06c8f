import { InputError } from '../errors.ts';
import { transposeRows } from '../matrix/csr.ts';

/** Sparse rows in double precision (the TF-IDF weights before they are stored as Float32). */
export interface SparseRows64 {
  rows: number;
  cols: number;
  indptr: Int32Array;
  indices: Int32Array;
  data: Float64Array;
}

export interface Tfidf {
  /** Terms in column order (sorted by code unit, as scikit-learn sorts its vocabulary). */
  vocabulary: string[];
  /** idf of each column. */
  idf: Float64Array;
  /** Documents × terms, each row l2-normalised (empty documents stay empty). */
  matrix: SparseRows64;
}

export interface TfidfOptions {
  /** Ignore terms found in fewer documents than this. Default 1 (keep all). */
  minDf?: number;
}

/**
 * TF-IDF as documented for scikit-learn's TfidfVectorizer / TfidfTransformer with smooth_idf=True,
 * sublinear_tf=False, norm='l2':
 *   tf(t, d) = raw count of t in d,
 *   idf(t)   = ln((1 + n) / (1 + df(t))) + 1,
 *   v_d      = (tf(t, d) · idf(t))_t / ‖·‖₂.
 * The smoothing acts as if one extra document contained every term once, so no idf divides by zero;
 * the +1 keeps terms that occur everywhere from vanishing.
 */
export function fitTfidf(docs: readonly (readonly string[])[], opts: TfidfOptions = {}): Tfidf {
  const minDf = opts.minDf ?? 1;
  if (!(Number.isInteger(minDf) && minDf >= 1)) throw new InputError(`minDf must be an integer >= 1, got ${minDf}`);
  const n = docs.length;
  // Provisional ids in first-seen order; each document's ids sorted so counts are runs.
  const provisional = new Map<string, number>();
  const docIds: Int32Array[] = new Array<Int32Array>(n);
  for (let d = 0; d < n; d++) {
    const toks = docs[d]!;
    const ids = new Int32Array(toks.length);
    for (let t = 0; t < toks.length; t++) {
      let id = provisional.get(toks[t]!);
      if (id === undefined) {
        id = provisional.size;
        provisional.set(toks[t]!, id);
      }
      ids[t] = id;
    }
    docIds[d] = ids.sort();
  }
  const df = new Int32Array(provisional.size);
  for (const ids of docIds) for (let t = 0; t < ids.length; t++) if (t === 0 || ids[t] !== ids[t - 1]) df[ids[t]!]!++;

  // Final columns: kept terms in sorted order.
  const terms = [...provisional.keys()].filter((_, id) => df[id]! >= minDf).sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  const column = new Int32Array(provisional.size).fill(-1);
  terms.forEach((term, c) => (column[provisional.get(term)!] = c));
  const idf = new Float64Array(terms.length);
  terms.forEach((term, c) => (idf[c] = Math.log((1 + n) / (1 + df[provisional.get(term)!]!)) + 1));

  const indptr = new Int32Array(n + 1);
  for (let d = 0; d < n; d++) {
    const ids = docIds[d]!;
    let distinct = 0;
    for (let t = 0; t < ids.length; t++) if ((t === 0 || ids[t] !== ids[t - 1]) && column[ids[t]!]! >= 0) distinct++;
    indptr[d + 1] = indptr[d]! + distinct;
  }
  const indices = new Int32Array(indptr[n]!);
  const data = new Float64Array(indptr[n]!);
  for (let d = 0; d < n; d++) {
    const ids = docIds[d]!;
    const start = indptr[d]!;
    let q = start;
    for (let t = 0; t < ids.length; ) {
      let run = 1;
      while (t + run < ids.length && ids[t + run] === ids[t]) run++;
      const c = column[ids[t]!]!;
      if (c >= 0) {
        indices[q] = c;
        data[q++] = run * idf[c]!;
      }
      t += run;
    }
    normalizeRow(data, start, q);
  }
  const unsorted = { rows: n, cols: terms.length, indptr, indices, data };
  return { vocabulary: terms, idf, matrix: transpose64(transpose64(unsorted)) };
}

/** Divides data[start, end) by its Euclidean norm (a zero row stays zero). */
export function normalizeRow(data: Float64Array, start: number, end: number): void {
  let s = 0;
  for (let p = start; p < end; p++) s += data[p]! * data[p]!;
  if (s === 0) return;
  const inv = 1 / Math.sqrt(s);
  for (let p = start; p < end; p++) data[p]! *= inv;
}

/**
 * Transpose by counting sort; applied twice it sorts every row's columns in O(nnz), where sorting rows
 * one by one could cost the square of a long description's term count.
 */
export function transpose64(m: SparseRows64): SparseRows64 {
  return transposeRows(m, (n) => new Float64Array(n));
}
