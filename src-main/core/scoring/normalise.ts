/**
 * Putting components on one scale before they are blended. Raw model scores mean nothing to an editor
 * and differ by orders of magnitude between models (a cosine, a count of customers, an iALS dot product),
 * so each component is normalised within the pool first (DESIGN.md "Data flow": normalise within the
 * pool).
 *
 * - `percentile` (the default): the mid-rank percentile of each value among the pool's values,
 *   (below + (equal − 1) / 2) / (n − 1) ∈ [0, 1], ties sharing their average rank. Robust to heavy tails
 *   (popularity counts) and exactly what editors are shown. A one-item pool gets 1.
 * - `minmax`: (v − min) / (max − min); keeps the gaps between values, so one outlier squashes the rest.
 *   A constant component gives 0 everywhere (it tells the pool's items nothing apart).
 *
 * Both write into caller-owned buffers; `scratch` must hold at least n values and is overwritten.
 */
export type Normalisation = 'percentile' | 'minmax';

export function normaliseInto(
  how: Normalisation,
  values: Float32Array,
  n: number,
  out: Float32Array,
  scratch: Float64Array,
): void {
  if (how === 'minmax') minMaxInto(values, n, out);
  else percentileInto(values, n, out, scratch);
}

export function percentileInto(values: Float32Array, n: number, out: Float32Array, scratch: Float64Array): void {
  if (n === 0) return;
  if (n === 1) {
    out[0] = 1;
    return;
  }
  const keys = sortedKeys(values, n, scratch, false);
  const denom = n - 1;
  // Walk runs of equal values; each member gets the run's mid-rank.
  let a = 0;
  while (a < n) {
    const v = Math.floor(keys[a]! / INDEX_SPAN);
    let b = a + 1;
    while (b < n && Math.floor(keys[b]! / INDEX_SPAN) === v) b++;
    const pct = (a + (b - a - 1) / 2) / denom;
    for (let q = a; q < b; q++) out[keys[q]! % INDEX_SPAN] = pct;
    a = b;
  }
}

/**
 * Positions 0..n−1 ordered by value, written into `order`: descending (ties: lower position first) or
 * ascending. Uses the same packed-key sort as the percentiles.
 */
export function orderInto(values: Float32Array, n: number, order: Int32Array, scratch: Float64Array, descending: boolean): void {
  const keys = sortedKeys(values, n, scratch, descending);
  if (descending) for (let q = 0; q < n; q++) order[q] = INDEX_SPAN - 1 - (keys[n - 1 - q]! % INDEX_SPAN);
  else for (let q = 0; q < n; q++) order[q] = keys[q]! % INDEX_SPAN;
}

/**
 * Sorting without a comparator closure: each float32 value is mapped to a 32-bit key whose unsigned
 * order is the numeric order (flip all bits of negatives, set the sign bit of non-negatives; NaN counts
 * as −∞, −0 as +0), and packed with its position into one float64, key · 2^21 + position < 2^53, so the packed
 * numbers are exact and a native Float64Array sort orders by value, then position. Pools of up to 2^21
 * (about two million) items. With `reversePosition` the position is stored as 2^21 − 1 − p, so a
 * descending walk meets equal values in ascending position.
 */
const INDEX_SPAN = 2 ** 21;
const f32 = new Float32Array(1);
const u32 = new Uint32Array(f32.buffer);

function sortedKeys(values: Float32Array, n: number, scratch: Float64Array, reversePosition: boolean): Float64Array {
  if (n > INDEX_SPAN) throw new RangeError(`pools of more than ${INDEX_SPAN} items are not supported, got ${n}`);
  const keys = scratch.subarray(0, n);
  for (let p = 0; p < n; p++) {
    const v = values[p]!;
    f32[0] = v === v ? (v === 0 ? 0 : v) : -Infinity; // −0 joins +0; NaN ranks lowest
    const bits = u32[0]!;
    const key = bits & 0x80000000 ? ~bits >>> 0 : (bits | 0x80000000) >>> 0;
    keys[p] = key * INDEX_SPAN + (reversePosition ? INDEX_SPAN - 1 - p : p);
  }
  keys.sort();
  return keys;
}

export function minMaxInto(values: Float32Array, n: number, out: Float32Array): void {
  let min = Infinity;
  let max = -Infinity;
  for (let p = 0; p < n; p++) {
    const v = values[p]!;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const span = max - min;
  for (let p = 0; p < n; p++) {
    const v = values[p]!;
    out[p] = span > 0 && v === v ? (v - min) / span : 0;
  }
}
