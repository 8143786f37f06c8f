import { orderInto } from './normalise.ts';

/**
 * The rank editors read beside an item: its place among the pool's candidates by score, 1 = best, ties
 * sharing the best place of their run and the next distinct score skipping past them ("1224" standard
 * competition ranking; scipy.stats.rankdata's method='min' on the negated scores). Unlike the mid-rank
 * percentile the scorer blends with, which puts every item of a shelf drawn from a pool of a thousand into
 * "the top 1%", the rank tells any two distinct scores apart: rank = 1 + (candidates with a higher score).
 * The share of the pool at or above the item is then rank / n, in (0, 1] (`topShare`).
 *
 * `scratch` must hold at least n values and is overwritten. NaN ranks last, as in the pool's order.
 */
export function competitionRanksInto(values: Float32Array, n: number, out: Int32Array, scratch: Float64Array): void {
  if (n === 0) return;
  const order = new Int32Array(n);
  orderInto(values, n, order, scratch, true);
  const key = (v: number) => (v === v ? v : -Infinity);
  let rank = 1;
  for (let q = 0; q < n; q++) {
    const p = order[q]!;
    if (q > 0 && key(values[p]!) !== key(values[order[q - 1]!]!)) rank = q + 1;
    out[p] = rank;
  }
}

/** The share of a pool of n ranked at or above an item of this rank: rank / n, in (0, 1]. */
export function topShare(rank: number, n: number): number {
  if (!(Number.isInteger(rank) && rank >= 1 && rank <= n)) throw new RangeError(`rank ${rank} is outside 1..${n}`);
  return rank / n;
}
