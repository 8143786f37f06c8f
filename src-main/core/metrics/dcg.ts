import { log2Discounts } from './discount.ts';
import { checkK } from './hits.ts';

/**
 * DCG@K and NDCG@K, Järvelin & Kekäläinen (2002), "Cumulated gain-based evaluation of IR techniques",
 * with the log2(rank + 1) discount of `discount.ts` (rank 1 weighs 1):
 *
 *   DCG@K  = Σ_{r=1..K} g_r / log2(r + 1)          g_r = gain of the item at rank r
 *   IDCG@K = DCG@K of the ideal ordering (all truth gains sorted descending)
 *   NDCG@K = DCG@K / IDCG@K ∈ [0, 1]
 *
 * Edge cases: empty truth (or truth with no positive gain) gives IDCG = 0 and NDCG = NaN, not 0 —
 * a customer with nothing to find is no evidence either way and must be left out of a mean, not
 * counted as a failure. Negative gains are clipped to 0 so NDCG stays in [0, 1]. A ranked list shorter
 * than K simply contributes nothing at the missing ranks.
 */

let cache: Float64Array = log2Discounts(64);

/** Discounts for ranks 1..k, grown on demand so hot loops never allocate. */
export function discountsUpTo(k: number): Float64Array {
  if (cache.length < k) cache = log2Discounts(Math.max(k, cache.length * 2));
  return cache;
}

/** DCG@K of gains listed in ranked order (gains[0] is rank 1). */
export function dcg(gains: ArrayLike<number>, k: number): number {
  checkK(k);
  const d = discountsUpTo(k);
  const n = Math.min(k, gains.length);
  let s = 0;
  for (let r = 0; r < n; r++) {
    const g = gains[r]!;
    if (g > 0) s += g * d[r]!;
  }
  return s;
}

/** IDCG@K: DCG@K of the truth gains in their ideal (descending) order. */
export function idealDcg(truthGains: ArrayLike<number>, k: number): number {
  const sorted = Float64Array.from(truthGains).sort().reverse();
  return dcg(sorted, k);
}

/** Binary-relevance NDCG@K from a hit vector (see hits.ts) and the number of relevant items. */
export function ndcgFromHits(hits: ArrayLike<number>, truthCount: number, k: number): number {
  checkK(k);
  if (truthCount <= 0) return Number.NaN;
  const d = discountsUpTo(k);
  const n = Math.min(k, hits.length);
  let s = 0;
  for (let r = 0; r < n; r++) if (hits[r]) s += d[r]!;
  // With binary gains the ideal list puts min(K, |truth|) ones first.
  const m = Math.min(k, truthCount);
  let ideal = 0;
  for (let r = 0; r < m; r++) ideal += d[r]!;
  return s / ideal;
}

/** Binary-relevance NDCG@K of a ranked list against a truth set. */
export function ndcgAtK(ranked: ArrayLike<number>, truth: ReadonlySet<number>, k: number): number {
  checkK(k);
  if (truth.size === 0) return Number.NaN;
  const d = discountsUpTo(k);
  const n = Math.min(k, ranked.length);
  let s = 0;
  for (let r = 0; r < n; r++) if (truth.has(ranked[r]!)) s += d[r]!;
  let ideal = 0;
  for (let r = 0, m = Math.min(k, truth.size); r < m; r++) ideal += d[r]!;
  return s / ideal;
}

/** Graded NDCG@K: `gains` maps item → relevance grade; items not in the map have gain 0. */
export function ndcgGradedAtK(ranked: ArrayLike<number>, gains: ReadonlyMap<number, number>, k: number): number {
  checkK(k);
  const ideal = idealDcg(Array.from(gains.values(), (g) => Math.max(0, g)), k);
  if (ideal === 0) return Number.NaN;
  const n = Math.min(k, ranked.length);
  const g = new Float64Array(n);
  for (let r = 0; r < n; r++) g[r] = gains.get(ranked[r]!) ?? 0;
  return dcg(g, k) / ideal;
}
