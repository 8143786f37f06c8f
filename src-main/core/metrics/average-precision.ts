import { checkK } from './hits.ts';

/**
 * Average precision at K and its mean over customers, Manning, Raghavan & Schütze, Introduction to
 * Information Retrieval (2008), section 8.4 (mean average precision):
 *
 *   AP@K = (1 / |truth|) Σ_{r ≤ K, rank r relevant} P@r
 *   MAP@K = mean of AP@K over customers
 *
 * The denominator is |truth|, as in IIR: "if a relevant document never gets retrieved, we assume the
 * precision corresponding to that relevant document to be zero" (quoted from memory). So a customer
 * with more relevant items than K cannot reach 1; `denominator: 'min'` divides by min(K, |truth|) instead (common
 * practice in recommender libraries, no single source), which can.
 * Edge cases: empty truth → NaN (left out of MAP); AP is 0 when nothing in the top K is relevant.
 */
export type ApDenominator = 'truth' | 'min';

export function averagePrecisionFromHits(
  hits: ArrayLike<number>,
  truthCount: number,
  k: number,
  denominator: ApDenominator = 'truth',
): number {
  checkK(k);
  if (truthCount <= 0) return Number.NaN;
  const n = Math.min(k, hits.length);
  let found = 0;
  let sum = 0;
  for (let r = 0; r < n; r++) {
    if (hits[r]) {
      found++;
      sum += found / (r + 1);
    }
  }
  return sum / (denominator === 'truth' ? truthCount : Math.min(k, truthCount));
}

/** MAP@K: mean AP@K over customers whose AP is defined (NaN entries — empty truth — are skipped). */
export function meanAveragePrecision(aps: ArrayLike<number>): number {
  return meanDefined(aps);
}

/** Mean of the finite entries; NaN when there are none. Used for every per-customer average. */
export function meanDefined(values: ArrayLike<number>): number {
  let s = 0;
  let c = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) {
      s += v;
      c++;
    }
  }
  return c === 0 ? Number.NaN : s / c;
}
