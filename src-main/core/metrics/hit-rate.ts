import { checkK, hitCount } from './hits.ts';

/**
 * Hit rate at K (also "HR@K"): 1 when at least one relevant item is in the top K, else 0; its mean over
 * customers is the share of customers the list would have served at all. Common practice in top-N
 * evaluation (e.g. Deshpande & Karypis 2004, "Item-based top-N recommendation algorithms", HR).
 * Edge case: empty truth → NaN, as for the other ranking metrics.
 */
export function hitRateFromHits(hits: ArrayLike<number>, truthCount: number, k: number): number {
  checkK(k);
  if (truthCount <= 0) return Number.NaN;
  return hitCount(hits, k) > 0 ? 1 : 0;
}
