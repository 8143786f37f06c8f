/**
 * The rank discount, in one place: NDCG (Järvelin & Kekäläinen 2002) and the promoted-exposure meter
 * both weigh position r (1-based) by 1 / log2(r + 1). lg 1 = 0 forces a choice between clipping ranks
 * and adding 1; we add 1, so the first position weighs 1, the second 1/log2(3) ≈ 0.631.
 */
export function log2Discount(rank: number): number {
  if (!Number.isInteger(rank) || rank < 1) throw new RangeError(`rank must be an integer >= 1, got ${rank}`);
  return 1 / Math.log2(rank + 1);
}

/** Discounts for ranks 1..n in one array (index 0 holds rank 1), for hot loops. */
export function log2Discounts(n: number): Float64Array {
  const out = new Float64Array(n);
  for (let r = 1; r <= n; r++) out[r - 1] = 1 / Math.log2(r + 1);
  return out;
}
