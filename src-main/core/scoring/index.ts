/** The hybrid scorer: components, normalisation within the pool, blend, explanations. */
export { COMPONENTS, type Component, DEFAULT_COLD_START_MIN_CUSTOMERS, effectiveWeights, weightsFromArray } from './components.ts';
export { normaliseInto, percentileInto, minMaxInto, type Normalisation } from './normalise.ts';
export { freshnessInto, DEFAULT_FRESHNESS_HALF_LIFE_DAYS } from './freshness.ts';
export { resolveAudience, audienceAffinityInto, audienceWindowNote, groupOf, missingGroupName, type AffinityOptions, type AffinityReport } from './audience.ts';
export { HybridScorer, type HybridModels, type HybridItemData, type HybridOptions, type PoolRequest } from './hybrid.ts';
export { competitionRanksInto, topShare } from './rank.ts';
export { PoolScores, type ScoredItem, type Evidence } from './pool-scores.ts';
export { CustomerHybrid } from './customer-mode.ts';
export { BlendScorer } from './blend-scorer.ts';
export { normaliseForCustomer, blendColumnsInto, CUSTOMER_NORMALISATIONS, type CustomerNormalisation } from './per-customer.ts';
export { anchorHistory, anchorRelevanceInto } from './anchor-relevance.ts';
