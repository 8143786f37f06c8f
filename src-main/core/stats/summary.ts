/** Small statistics over typed arrays. Empty input gives NaN (no data), never 0. */

export function mean(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  let s = 0;
  for (let i = 0; i < n; i++) s += values[i] as number;
  return s / n;
}

/** Median of the values (the mean of the two middle ones for an even count). Does not modify the input. */
export function median(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  const sorted = Float64Array.from(values as ArrayLike<number>).sort();
  return medianOfSorted(sorted, n);
}

/** Median of the first n entries of an ascending array. */
export function medianOfSorted(sorted: ArrayLike<number>, n: number): number {
  if (n === 0) return NaN;
  const h = n >> 1;
  return n % 2 === 1 ? (sorted[h] as number) : ((sorted[h - 1] as number) + (sorted[h] as number)) / 2;
}
