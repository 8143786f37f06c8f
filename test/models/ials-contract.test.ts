import { fitIals, loadIals } from '../../src-main/core/models/ials.ts';
import { describeScorerContract, plantedBlocks } from './contract.ts';

// The shared planted-answer contract (test/models/contract.ts, after benfred/implicit's
// tests/recommender_base_test.py). Three blocks make a rank-3 structure, so 3 factors with λ = 0.1;
// more factors with almost no regularisation can learn the withheld zero itself.
describeScorerContract('ials', () => {
  const { history, customer, withheld } = plantedBlocks();
  const { model } = fitIals(history, { factors: 3, regularization: 0.1, alpha: 2, iterations: 15, seed: 3 });
  return { scorer: model, load: loadIals, history, customer, withheld };
});
