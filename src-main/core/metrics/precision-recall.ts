import { checkK, hitCount } from './hits.ts';

/**
 * Precision@K and Recall@K for binary relevance, as defined in Manning, Raghavan & Schütze,
 * Introduction to Information Retrieval (2008), sections 8.3 (precision, recall) and 8.4 ("precision at k"):
 *
 *   P@K = |hits in top K| / K
 *   R@K = |hits in top K| / |truth|                               (the classic definition)
 *   R̃@K = |hits in top K| / min(K, |truth|)                       (Liang, Krishnan, Hoffman & Jebara 2018,
 *         "Variational autoencoders for collaborative filtering", eq. for Recall@R: reaches 1 whenever
 *         the top K is all hits, so customers with long truth lists are not capped below 1)
 *
 * Edge cases: empty truth gives NaN for all three (no evidence, left out of a mean). P@K divides by K
 * even when fewer than K items were ranked: unused slots count as misses, since the shelf offered them.
 */
export function precisionFromHits(hits: ArrayLike<number>, truthCount: number, k: number): number {
  checkK(k);
  if (truthCount <= 0) return Number.NaN;
  return hitCount(hits, k) / k;
}

export function recallFromHits(hits: ArrayLike<number>, truthCount: number, k: number): number {
  checkK(k);
  if (truthCount <= 0) return Number.NaN;
  return hitCount(hits, k) / truthCount;
}

/** Recall@K with denominator min(K, |truth|), Liang et al. (2018). */
export function cappedRecallFromHits(hits: ArrayLike<number>, truthCount: number, k: number): number {
  checkK(k);
  if (truthCount <= 0) return Number.NaN;
  return hitCount(hits, k) / Math.min(k, truthCount);
}
