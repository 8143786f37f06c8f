import { packSections } from '../matrix/bytes.ts';
import type { Csr } from '../matrix/csr.ts';
import { InputError } from '../errors.ts';
import { decayedValue, transformCode, type ValueTransform } from '../matrix/values.ts';
import { NO_RECENCY, recencySection, type Recency } from './recency.ts';
import type { Scorer, TopN } from './scorer.ts';
import { topN } from './topn.ts';

/**
 * EASE weights kept sparse: for each fitted item, only the `k` weights of largest magnitude in its row of
 * B (the items it pushes up or down the most). Used above EASE_DENSE_MAX_BYTES, where the dense m × m
 * float32 B would not fit a SQLite blob (1e9 bytes by default: 15,811 items) nor be quick to store and
 * load. Scoring is x_u · B̃ with B̃ the sparsified B; the quality cost is measured in the EASE benchmark.
 */
export const EASE_DENSE_MAX_BYTES = 256 * 1024 * 1024;
/**
 * Weights kept per item when sparsified. bench/ease-topk.bench.ts on the demo shop (2,500 items): keeping
 * 5 % of each row gave 99.2 % of the dense NDCG@10, 2.5 % gave 97.5 %; 1,000 is 5 % of a 20,000-item row,
 * and 20,000 × 1,000 weights store in 160 MB.
 */
export const EASE_TOP_K = 1000;

export class EaseTopKModel implements Scorer {
  readonly kind = 'ease' as const;
  /**
   * @param itemCount items of the catalogue
   * @param kept global index of each fitted item (ascending)
   * @param indptr row r's weights are entries indptr[r] .. indptr[r+1] − 1
   * @param cols global item index of each weight
   * @param values the weights B_r,cols
   * @param transform how a history value enters scoring (the fitted model's value transform)
   * @param recency the fitted model's half-lives (the profile side decays the history in scoring)
   */
  constructor(
    readonly itemCount: number,
    readonly kept: Int32Array,
    readonly indptr: Int32Array,
    readonly cols: Int32Array,
    readonly values: Float32Array,
    readonly transform: ValueTransform = 'presence',
    readonly recency: Recency = NO_RECENCY,
  ) {
    if (indptr.length !== kept.length + 1 || cols.length !== values.length || indptr[kept.length] !== cols.length) {
      throw new InputError('EASE top-k weights have inconsistent lengths');
    }
    this.#local = new Int32Array(itemCount).fill(-1);
    for (let r = 0; r < kept.length; r++) this.#local[kept[r]!] = r;
  }
  readonly #local: Int32Array;

  scoreInto(u: number, history: Csr, out: Float32Array): void {
    out.fill(0);
    for (let p = history.indptr[u]!, end = history.indptr[u + 1]!; p < end; p++) {
      const r = this.#local[history.indices[p]!]!;
      if (r < 0) continue;
      const x = decayedValue(history, p, this.transform, this.recency.profileHalfLifeDays);
      for (let q = this.indptr[r]!, qe = this.indptr[r + 1]!; q < qe; q++) out[this.cols[q]!]! += x * this.values[q]!;
    }
  }

  similarityInto(i: number, out: Float32Array): void {
    out.fill(0);
    const r = this.#local[i]!;
    if (r < 0) return;
    for (let q = this.indptr[r]!, qe = this.indptr[r + 1]!; q < qe; q++) out[this.cols[q]!] = this.values[q]!;
    out[i] = 0;
  }

  similarItems(i: number, n: number): TopN {
    return keptSimilarItems(this, i, n);
  }

  serialize(): Uint8Array {
    return packSections(EASE_MAGIC, 5, [
      Int32Array.of(this.itemCount),
      this.kept,
      this.indptr,
      this.cols,
      this.values,
      Int32Array.of(transformCode(this.transform)),
      recencySection(this.recency),
    ]);
  }
}

export const EASE_MAGIC = 'SWEASE  ';

/** The n items most pushed up by item i, among the fitted items only (items not kept have no weights). */
export function keptSimilarItems(m: Pick<Scorer, 'itemCount' | 'similarityInto'> & { kept: Int32Array }, i: number, n: number): TopN {
  const row = new Float32Array(m.itemCount);
  m.similarityInto(i, row);
  const skip = new Uint8Array(m.itemCount).fill(1);
  for (const c of m.kept) skip[c] = 0;
  return topN(row, n, i, skip);
}

/** Keeps the k largest-magnitude off-diagonal weights of each row of the dense m × m B (row-major). */
export function sparsifyEase(
  itemCount: number,
  kept: Int32Array,
  b: Float32Array,
  k: number,
  transform: ValueTransform = 'presence',
  recency: Recency = NO_RECENCY,
): EaseTopKModel {
  const m = kept.length;
  const per = Math.min(k, Math.max(0, m - 1));
  const indptr = new Int32Array(m + 1);
  const cols = new Int32Array(m * per);
  const values = new Float32Array(m * per);
  const mag = new Float32Array(m);
  let q = 0;
  for (let r = 0; r < m; r++) {
    const row = b.subarray(r * m, (r + 1) * m);
    for (let c = 0; c < m; c++) mag[c] = Math.abs(row[c]!);
    const best = topN(mag, per, r).items;
    best.sort();
    for (const c of best) {
      cols[q] = kept[c]!;
      values[q++] = row[c]!;
    }
    indptr[r + 1] = q;
  }
  return new EaseTopKModel(itemCount, kept, indptr, cols.subarray(0, q), values.subarray(0, q), transform, recency);
}
