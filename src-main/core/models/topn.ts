import type { TopN } from './scorer.ts';

/**
 * Bounded selection of the k best (index, score) pairs with a min-heap in typed arrays: O(m log k) over m
 * candidates and no allocation per candidate. Order is deterministic: higher score first, and on equal
 * scores the lower index first, so the same input always gives the same list.
 */
export class TopKHeap {
  readonly #idx: Int32Array;
  readonly #score: Float32Array;
  #size = 0;
  constructor(readonly capacity: number) {
    this.#idx = new Int32Array(Math.max(0, capacity));
    this.#score = new Float32Array(Math.max(0, capacity));
  }
  get size(): number {
    return this.#size;
  }
  clear(): void {
    this.#size = 0;
  }
  /** The lowest score kept (the next push must beat it once the heap is full); -Infinity when empty. */
  get worstScore(): number {
    return this.#size > 0 ? this.#score[0]! : -Infinity;
  }
  /** true when (s1, i1) ranks below (s2, i2). */
  static #worse(s1: number, i1: number, s2: number, i2: number): boolean {
    return s1 < s2 || (s1 === s2 && i1 > i2);
  }
  push(index: number, raw: number): void {
    const k = this.capacity;
    if (k === 0 || raw !== raw) return;
    // Compared as stored (float32): a float64 score against float32 ones would break ties by the direction of
    // rounding instead of by index (two equal similarities, one already stored, would differ).
    const score = Math.fround(raw);
    const idx = this.#idx;
    const sc = this.#score;
    if (this.#size < k) {
      let c = this.#size++;
      while (c > 0) {
        const p = (c - 1) >> 1;
        if (!TopKHeap.#worse(score, index, sc[p]!, idx[p]!)) break;
        idx[c] = idx[p]!;
        sc[c] = sc[p]!;
        c = p;
      }
      idx[c] = index;
      sc[c] = score;
      return;
    }
    if (!TopKHeap.#worse(sc[0]!, idx[0]!, score, index)) return;
    this.#siftDown(index, score, k);
  }
  #siftDown(index: number, score: number, size: number): void {
    const idx = this.#idx;
    const sc = this.#score;
    let c = 0;
    while (true) {
      let m = 2 * c + 1;
      if (m >= size) break;
      if (m + 1 < size && TopKHeap.#worse(sc[m + 1]!, idx[m + 1]!, sc[m]!, idx[m]!)) m++;
      if (!TopKHeap.#worse(sc[m]!, idx[m]!, score, index)) break;
      idx[c] = idx[m]!;
      sc[c] = sc[m]!;
      c = m;
    }
    idx[c] = index;
    sc[c] = score;
  }
  /** Writes the kept pairs best first into the arrays at `offset` and empties the heap; returns the count. */
  drainInto(items: Int32Array, scores: Float32Array, offset = 0): number {
    const n = this.#size;
    for (let left = n; left > 0; left--) {
      // The root is the worst kept pair: it goes last among what is left.
      items[offset + left - 1] = this.#idx[0]!;
      scores[offset + left - 1] = this.#score[0]!;
      const lastI = this.#idx[left - 1]!;
      const lastS = this.#score[left - 1]!;
      this.#siftDown(lastI, lastS, left - 1);
    }
    this.#size = 0;
    return n;
  }
}

/**
 * The n best entries of a dense score vector, best first. `exclude` (an index, or -1) and `skip` (a 0/1
 * mask, e.g. the customer's history) are left out; NaN scores are never picked.
 */
export function topN(scores: Float32Array, n: number, exclude = -1, skip?: Uint8Array): TopN {
  const heap = new TopKHeap(Math.min(Math.max(0, n), scores.length));
  for (let j = 0; j < scores.length; j++) {
    if (j === exclude || (skip !== undefined && skip[j] === 1)) continue;
    heap.push(j, scores[j]!);
  }
  const items = new Int32Array(heap.size);
  const out = new Float32Array(heap.size);
  heap.drainInto(items, out);
  return { items, scores: out };
}

/**
 * Top-K neighbour lists, one per item, best first: item i's neighbours are `indices[indptr[i] ..
 * indptr[i+1])` with similarities in `data` (sorted by similarity, descending; not by index).
 */
export interface Neighbours {
  items: number;
  indptr: Int32Array;
  indices: Int32Array;
  data: Float32Array;
}

/** The first n neighbours of item i (lists are already sorted). */
export function neighbourTopN(nb: Neighbours, i: number, n: number): TopN {
  const start = nb.indptr[i]!;
  const end = Math.min(nb.indptr[i + 1]!, start + Math.max(0, n));
  return { items: nb.indices.slice(start, end), scores: nb.data.slice(start, end) };
}

/** Dense row i of a neighbour list: its similarities, 0 elsewhere (and for i itself). */
export function neighbourRowInto(nb: Neighbours, i: number, out: Float32Array): void {
  out.fill(0);
  for (let p = nb.indptr[i]!, end = nb.indptr[i + 1]!; p < end; p++) out[nb.indices[p]!] = nb.data[p]!;
  out[i] = 0;
}

/** Where a row's candidate neighbours go (a TopKHeap, or collectNeighbours' recorder). */
export interface NeighbourSink {
  push(index: number, score: number): void;
}

/**
 * Builds neighbour lists row by row: `row(i, sink)` pushes item i's candidate neighbours (each index once).
 * The lists are grown as needed, so memory follows the neighbours actually found, not items × K.
 *
 * `ties: 'all'` keeps, beyond the K best, every candidate whose similarity (as stored, float32) equals the K-th's,
 * as k-nearest-neighbour rules commonly do (Venables & Ripley, Modern Applied Statistics with S, 4th ed., 2002,
 * §12.3: "if there are ties for the kth nearest vector, all candidates are included"). Why: otherwise which of
 * the tied items make the list depends on the order of the catalogue (here the lower index wins; a partition
 * picks arbitrarily), so renumbering the items would change the model. Tied candidates carry the same
 * evidence by the similarity's own measure, so none is preferred; lists may then exceed K by the ties.
 * 'lowerIndex' (the default) keeps exactly K, the lower index first among equals.
 */
export function collectNeighbours(items: number, k: number, row: (i: number, sink: TopKHeap) => void, o?: { ties?: 'lowerIndex' }): Neighbours;
export function collectNeighbours(items: number, k: number, row: (i: number, sink: NeighbourSink) => void, o: { ties: 'all' }): Neighbours;
export function collectNeighbours(
  items: number,
  k: number,
  row: (i: number, sink: TopKHeap) => void,
  o: { ties?: 'lowerIndex' | 'all' } = {},
): Neighbours {
  const heap = new TopKHeap(k);
  const all = o.ties === 'all';
  // With ties kept: every candidate of the row is recorded too, and those at or above the K-th are ranked again.
  let candIdx = new Int32Array(all ? Math.min(items, 1 << 16) : 0);
  let candScore = new Float32Array(candIdx.length);
  let wide = new TopKHeap(0);
  let nCand = 0;
  const recorder: NeighbourSink = {
    push(index, score) {
      if (score !== score) return;
      if (nCand === candIdx.length) {
        const ni = new Int32Array(Math.max(16, 2 * nCand));
        ni.set(candIdx);
        const ns = new Float32Array(ni.length);
        ns.set(candScore);
        candIdx = ni;
        candScore = ns;
      }
      candIdx[nCand] = index;
      candScore[nCand++] = score;
      heap.push(index, score);
    },
  };
  const indptr = new Int32Array(items + 1);
  let indices = new Int32Array(Math.min(items * k, 1 << 16));
  let data = new Float32Array(indices.length);
  let q = 0;
  for (let i = 0; i < items; i++) {
    heap.clear();
    nCand = 0;
    // With ties kept the row sees the recorder, whose overload promises only push (NeighbourSink).
    row(i, all ? (recorder as TopKHeap) : heap);
    let source = heap;
    if (all && heap.size === k && nCand > k) {
      const kth = heap.worstScore;
      let over = 0;
      for (let c = 0; c < nCand; c++) if (candScore[c]! >= kth) over++;
      if (over > k) {
        // Some candidate left out ties the K-th: rank everything at or above it (most rows have no such tie).
        if (wide.capacity < over) wide = new TopKHeap(Math.max(over, 2 * wide.capacity));
        wide.clear();
        for (let c = 0; c < nCand; c++) if (candScore[c]! >= kth) wide.push(candIdx[c]!, candScore[c]!);
        source = wide;
      }
    }
    if (q + source.size > indices.length) {
      const grown = Math.max(indices.length * 2, q + source.size);
      const ni = new Int32Array(grown);
      ni.set(indices);
      const nd = new Float32Array(grown);
      nd.set(data);
      indices = ni;
      data = nd;
    }
    q += source.drainInto(indices, data, q);
    heap.clear();
    indptr[i + 1] = q;
  }
  return { items, indptr, indices: indices.slice(0, q), data: data.slice(0, q) };
}
