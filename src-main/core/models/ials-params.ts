import { InputError } from '../errors.ts';

/**
 * Parameters of implicit-feedback matrix factorisation (iALS), named as in Hu, Koren & Volinsky (2008),
 * "Collaborative Filtering for Implicit Feedback Datasets", and in benfred/implicit (equation
 * numbers of the paper here and in ials-*.ts are from memory).
 *
 * - `factors`: the latent dimension k.
 * - `regularization`: λ of eq. (3), applied to every customer and item vector.
 * - `alpha`: the confidence slope of eq. (2) (`linear`: c = 1 + α·r) or of the log variant the same
 *   paper proposes (`log`: c = 1 + α·log(1 + r/ε)). Hu et al. report α = 40 as best on raw watch counts (from
 *   memory); our matrix values are already weighted per signal kind and decayed in time, on a scale
 *   of about 1 per interaction, so we start at α = 1 (no source: a conservative start to be tuned by the evaluator).
 * - `epsilon`: ε of the log variant (Hu et al. give no value, from memory; 1 is our choice, no source).
 * - `iterations`: alternating sweeps (customers then items).
 * - `cgSteps`: conjugate-gradient steps per row and half-iteration, warm-started from the previous
 *   solution. Takács, Pilászy & Tikk (2011) find a few steps enough for near-exact quality, and
 *   implicit's default is 3 (both from memory; test/models/ials-solve.test.ts compares 3 steps with
 *   exact solves). Measured on the demo shop (k = 64, 15 iterations): 2 steps save a quarter of the
 *   solve and end 0.5% above 3 steps in loss, NDCG@10 of iALS 0.081 vs 0.079, of the iALS hybrid
 *   0.076 vs 0.077 — close, but not clearly unchanged, so the default stays 3.
 * - `seed`: the initial factors are the only randomness; same seed, same model.
 * - `regularizationScaling`: absent (or 'none') for every model trained here: λ is the same for every row.
 *   'signals' only on a model imported from Spark's ALS, which weights λ by the number of positive entries
 *   of the row being solved (ALS.scala `computeFactors`: `solver.solve(ls, numExplicits * regParam)`, after
 *   the ALS-WR paper, Zhou et al. 2008): folding a customer in must then use λ·n_u to match Spark's own
 *   solution. Training never reads it.
 */
export interface IalsParams {
  factors: number;
  regularization: number;
  alpha: number;
  scaling: 'linear' | 'log';
  epsilon: number;
  iterations: number;
  cgSteps: number;
  seed: number;
  regularizationScaling?: 'none' | 'signals';
}

export const IALS_DEFAULTS: Readonly<IalsParams> = {
  factors: 64,
  regularization: 0.01,
  alpha: 1,
  scaling: 'linear',
  epsilon: 1,
  iterations: 15,
  cgSteps: 3,
  seed: 1,
};

/** Fills defaults and refuses values that cannot train, naming the parameter. */
export function ialsParams(given: Partial<IalsParams> = {}): IalsParams {
  const p: IalsParams = { ...IALS_DEFAULTS, ...given };
  const where = (field: string) => ({ column: field });
  if (!Number.isInteger(p.factors) || p.factors < 1 || p.factors > 1024) {
    throw new InputError(`factors must be an integer from 1 to 1024, got ${p.factors}`, where('factors'));
  }
  if (!(p.regularization >= 0) || !Number.isFinite(p.regularization)) {
    throw new InputError(`regularization must be a finite number >= 0, got ${p.regularization}`, where('regularization'));
  }
  if (!(p.alpha >= 0) || !Number.isFinite(p.alpha)) {
    throw new InputError(`alpha must be a finite number >= 0, got ${p.alpha}`, where('alpha'));
  }
  if (p.scaling !== 'linear' && p.scaling !== 'log') {
    throw new InputError(`scaling must be 'linear' or 'log', got ${String(p.scaling)}`, where('scaling'));
  }
  if (!(p.epsilon > 0) || !Number.isFinite(p.epsilon)) {
    throw new InputError(`epsilon must be a finite number > 0, got ${p.epsilon}`, where('epsilon'));
  }
  if (!Number.isInteger(p.iterations) || p.iterations < 1) {
    throw new InputError(`iterations must be an integer >= 1, got ${p.iterations}`, where('iterations'));
  }
  if (!Number.isInteger(p.cgSteps) || p.cgSteps < 1) {
    throw new InputError(`cgSteps must be an integer >= 1, got ${p.cgSteps}`, where('cgSteps'));
  }
  if (p.regularizationScaling !== undefined && p.regularizationScaling !== 'none' && p.regularizationScaling !== 'signals') {
    throw new InputError(`regularizationScaling must be 'none' or 'signals', got ${String(p.regularizationScaling)}`, where('regularizationScaling'));
  }
  if (!Number.isInteger(p.seed)) throw new InputError(`seed must be an integer, got ${p.seed}`, where('seed'));
  return p;
}

/**
 * Confidence of an observed value r > 0: eq. (2) of Hu et al. (linear) or their log variant.
 * Preference is p = 1 for every r > 0; entries with r <= 0 are treated as unobserved (c = 1, p = 0).
 */
export function confidence(p: Pick<IalsParams, 'alpha' | 'scaling' | 'epsilon'>, r: number): number {
  return p.scaling === 'linear' ? 1 + p.alpha * r : 1 + p.alpha * Math.log1p(r / p.epsilon);
}
