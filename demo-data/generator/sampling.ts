/** Small sampling helpers over a seeded Rng (no Math.random anywhere in the generator). */
import type { Rng } from '../../src-main/core/rng.ts';

/**
 * Index k in [from, to) of the first cumulative weight exceeding u, by binary search. `cum` holds
 * running sums; u must lie in [cum[from-1] or 0, cum[to-1]).
 */
export function searchCumulative(cum: Float64Array, from: number, to: number, u: number): number {
  let lo = from;
  let hi = to - 1;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (cum[mid]! > u) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** Draws an index with probability proportional to weights (small arrays only). */
export function pickWeighted(rng: Rng, weights: readonly number[]): number {
  let total = 0;
  for (const w of weights) total += w;
  let u = rng.next() * total;
  for (let k = 0; k < weights.length; k++) {
    u -= weights[k]!;
    if (u < 0) return k;
  }
  return weights.length - 1;
}

export function pick<T>(rng: Rng, xs: readonly T[]): T {
  return xs[rng.int(xs.length)]!;
}

/** Fisher-Yates shuffle in place. */
export function shuffle<T>(rng: Rng, xs: T[]): T[] {
  for (let k = xs.length - 1; k > 0; k--) {
    const j = rng.int(k + 1);
    const tmp = xs[k]!;
    xs[k] = xs[j]!;
    xs[j] = tmp;
  }
  return xs;
}

/**
 * Splits n into whole counts proportional to shares (largest remainder), so that every group gets
 * its share exactly and the counts sum to n.
 */
export function apportion(n: number, shares: readonly number[]): number[] {
  const total = shares.reduce((a, b) => a + b, 0);
  const raw = shares.map((s) => (n * s) / total);
  const counts = raw.map(Math.floor);
  let left = n - counts.reduce((a, b) => a + b, 0);
  const order = raw.map((r, k) => ({ k, frac: r - Math.floor(r) })).sort((a, b) => b.frac - a.frac || a.k - b.k);
  for (let j = 0; left > 0; j = (j + 1) % order.length, left--) counts[order[j]!.k]! += 1;
  return counts;
}

/** Group label of each of n slots, in shuffled order, with exact per-group counts. */
export function assignGroups(rng: Rng, n: number, shares: readonly number[]): Int32Array {
  const counts = apportion(n, shares);
  const labels: number[] = [];
  counts.forEach((c, g) => {
    for (let k = 0; k < c; k++) labels.push(g);
  });
  return Int32Array.from(shuffle(rng, labels));
}
