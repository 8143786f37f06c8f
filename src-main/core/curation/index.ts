/** The curation engine's public surface: context, candidates, fill, meters, what-if. */
export type { CurationContext, ContextOptions, FacetCodes } from './context.ts';
export { buildCurationContext, similarity } from './context.ts';
export type { CandidatePool, EditorialState, ExclusionCounts, ExclusionReason } from './candidates.ts';
export { buildCandidatePool, EXCLUSION_REASONS } from './candidates.ts';
export { checkBrief } from './brief-check.ts';
export type { FillInput } from './fill.ts';
export { fillShelf } from './fill.ts';
export { mmrObjective } from './mmr.ts';
export { quotaName } from './quota-counter.ts';
export type { MeterInputs } from './meter.ts';
export { meterShelf, intraListDistance, promotedShares, SATURATION_THRESHOLD } from './meter.ts';
export type { EditionMeterOptions } from './edition-meter.ts';
export { meterEdition } from './edition-meter.ts';
export type { WhatIfBatch } from './whatif.ts';
export { whatIf, whatIfBatch, flatReadings } from './whatif.ts';
export * from './types.ts';
export { universeMask, bestRelevanceSums, choiceCost, costOf, describeChoiceCost, describeAutoDials } from './choice-cost.ts';
