/**
 * The Gini coefficient of non-negative values, from its definition (mean absolute difference over twice
 * the mean): G = Σ_i Σ_j |x_i − x_j| / (2 n² x̄). 0 = everyone gets the same, (n − 1)/n = one takes all.
 * Computed in O(n log n) through the sorted form G = Σ_k (2k − n − 1) x_(k) / (n Σ x), k = 1..n ascending,
 * which is the double sum regrouped (each x_(k) is larger than k − 1 values and smaller than n − k).
 *
 * Empty input or a zero total gives NaN: with nothing shared out there is no inequality to measure.
 */
export function gini(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  const sorted = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i] as number;
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`gini needs finite values >= 0, got ${v} at ${i}`);
    sorted[i] = v;
    total += v;
  }
  if (total === 0) return NaN;
  sorted.sort();
  let weighted = 0;
  for (let k = 1; k <= n; k++) weighted += (2 * k - n - 1) * (sorted[k - 1] as number);
  return weighted / (n * total);
}
