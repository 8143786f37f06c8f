/**
 * Putting one customer's scores from different models on one scale before they are blended (issue 10
 * item 3). Raw scores differ by orders of magnitude between models and between customers (an item-kNN sum
 * grows with the history's length, an iALS dot product does not), so a fixed weight means something only
 * once each model's column is normalised for that customer.
 *
 * - `zscore`: (v − mean) / sd over the customer's candidate items (every item not in their history: the
 *   history's own scores, often the largest, are never proposed and would only stretch the scale). A
 *   constant column gives 0 everywhere. Affine, so a single model keeps its order exactly.
 * - `rank`: the mid-rank percentile over the whole catalogue (normalise.ts `percentileInto`), in [0, 1];
 *   robust to heavy tails, at the cost of an O(items log items) sort per customer and model.
 * Blending standardised or rank-transformed scores is the usual score-fusion practice (common practice,
 * no source); which of the two is used is chosen on validation (core/eval/validated-blend.ts).
 */
import { percentileInto } from './normalise.ts';

export type CustomerNormalisation = 'zscore' | 'rank';
export const CUSTOMER_NORMALISATIONS: readonly CustomerNormalisation[] = ['zscore', 'rank'];

/**
 * Normalises `raw` (one customer's scores, length n) into `out`. `history` lists the item indices the
 * customer already has (left out of the z-score's mean and sd; ignored by `rank`). `scratch` must hold at
 * least n values.
 */
export function normaliseForCustomer(
  how: CustomerNormalisation,
  raw: Float32Array,
  history: ArrayLike<number>,
  out: Float32Array,
  scratch: Float64Array,
): void {
  const n = raw.length;
  if (how === 'rank') {
    percentileInto(raw, n, out, scratch);
    return;
  }
  let s = 0;
  let ss = 0;
  let m = n;
  for (let i = 0; i < n; i++) {
    const v = raw[i]!;
    s += v;
    ss += v * v;
  }
  for (let q = 0; q < history.length; q++) {
    const v = raw[history[q]!]!;
    s -= v;
    ss -= v * v;
    m--;
  }
  if (m <= 0) {
    out.fill(0, 0, n);
    return;
  }
  const mean = s / m;
  const variance = ss / m - mean * mean;
  // Relative floor: the subtraction above can leave rounding noise where every candidate is equal.
  const sd = variance > 1e-12 * (mean * mean + 1) ? Math.sqrt(variance) : 0;
  if (sd === 0) {
    out.fill(0, 0, n);
    return;
  }
  const inv = 1 / sd;
  for (let i = 0; i < n; i++) out[i] = (raw[i]! - mean) * inv;
}

/**
 * The blend of normalised columns: out[i] = Σ_m w_m · col_m[i], with `cold` items (mask 1) moved towards the
 * content column's value, share·content + (1 − share)·blend (the content path of items too new to have
 * collaborative evidence; share 1 replaces the blend). `columns[m]` is a view of length n; `contentColumn`
 * is null when there is no content model.
 */
export function blendColumnsInto(
  columns: readonly Float32Array[],
  weights: ArrayLike<number>,
  cold: Uint8Array | null,
  contentColumn: Float32Array | null,
  out: Float32Array,
  share = 1,
): void {
  const n = out.length;
  out.fill(0);
  for (let m = 0; m < columns.length; m++) {
    const w = weights[m]!;
    if (w === 0) continue;
    const col = columns[m]!;
    for (let i = 0; i < n; i++) out[i]! += w * col[i]!;
  }
  if (cold && contentColumn && share > 0) for (let i = 0; i < n; i++) if (cold[i]) out[i] = share * contentColumn[i]! + (1 - share) * out[i]!;
}
