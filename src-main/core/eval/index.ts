/** Offline evaluation: who is evaluated, the top-K evaluator, and the blend-weight search. */
export { evalTruth, sampleTruth, customersPerItem, type EvalTruth } from './customers.ts';
export { RankingEvaluator, type Ranker, type EvalResult } from './evaluator.ts';
export { searchBlendWeights, type BlendSearchOptions, type BlendSearchResult, type BlendTrial } from './blend-search.ts';
export {
  validateBlend,
  describeBlend,
  BLEND_MODELS,
  MIN_BLEND_CUSTOMERS,
  type BlendModel,
  type BlendSpec,
  type ValidatedBlend,
  type BlendModelInput,
  type ValidatedBlendOptions,
} from './validated-blend.ts';
