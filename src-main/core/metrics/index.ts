/** Ranking and list metrics, one family per file (STYLE.md §3). Each file's comment gives formula and source. */
export { log2Discount, log2Discounts } from './discount.ts';
export { hitsAtK, hitCount, checkK } from './hits.ts';
export { dcg, idealDcg, ndcgAtK, ndcgFromHits, ndcgGradedAtK, discountsUpTo } from './dcg.ts';
export { precisionFromHits, recallFromHits, cappedRecallFromHits } from './precision-recall.ts';
export {
  averagePrecisionFromHits,
  meanAveragePrecision,
  meanDefined,
  type ApDenominator,
} from './average-precision.ts';
export { hitRateFromHits } from './hit-rate.ts';
export { catalogueCoverage } from './coverage.ts';
export { novelty, selfInformation } from './novelty.ts';
