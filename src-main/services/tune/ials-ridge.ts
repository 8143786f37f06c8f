/**
 * iALS's α and λ move together: a step of the search's α axis carries λ along with the mean confidence.
 *
 * Why: in Hu, Koren & Volinsky (2008) eq. (3) each customer's factors solve (YᵀC_uY + λI) x_u = YᵀC_u p_u, so
 * multiplying the confidences c_ui by s multiplies the data term by s, and only λ·s gives back the same balance
 * of data and regularisation. A larger α raises the confidences (c = 1 + α·r, or 1 + α·log(1 + r/ε)), so the best
 * λ rises with it, and a coordinate step on α alone, at the λ chosen for the old α, lands beside that ridge.
 * Rendle, Krichene, Zhang & Koren (2022, "Revisiting the Performance of iALS on Item Recommendation Benchmarks",
 * RecSys) make the same point: the regularisation and the weighting of the observations have to be tuned
 * together, and they rescale λ so that good values stay on one scale when the weighting changes.
 * Measured on the validation splits (3-sweep trials, 64 factors), the best λ of each α lies within a half decade
 * of λ·c̄(α')/c̄(α) (c̄: the mean confidence of an observed entry): Online Retail log α 0.1, 1, 10, 100: λ 10,
 * 10–32, 100, 320; MovieLens 100K (two splits) log α 0.1, 1, 10, 100: λ 10, 10, 32, 100–320 (bench/quality/README.md).
 * So the α axis steps along that direction and λ is snapped to its own half-decade axis; λ's own line search
 * then corrects the rest. No trial is added: the α axis tries as many points as before.
 */
import type { Csr } from '../../core/matrix/csr.ts';
import type { Point } from './search.ts';

/** Mean over the observed entries of the value, and of log(1 + value/ε): c̄ = 1 + α × the scaling's mean. */
export interface ConfidenceMeans {
  linear: number;
  log: number;
}

export function confidenceMeans(train: Csr, epsilon: number): ConfidenceMeans {
  const n = train.indptr[train.rows]!;
  let linear = 0;
  let log = 0;
  for (let j = 0; j < n; j++) {
    const v = train.data[j]!;
    linear += v;
    log += Math.log1p(v / epsilon);
  }
  return n > 0 ? { linear: linear / n, log: log / n } : { linear: 0, log: 0 };
}

/** The mean confidence of an observed entry at this α and scaling. */
export function meanConfidence(means: ConfidenceMeans, alpha: number, scaling: string): number {
  return 1 + alpha * (scaling === 'linear' ? means.linear : means.log);
}

/** The value of `grid` (ascending, positive) nearest to `x` on a log scale; ties go to the smaller. */
export function snapLog(x: number, grid: readonly number[]): number {
  let best = grid[0]!;
  for (const g of grid) if (Math.abs(Math.log(g / x)) < Math.abs(Math.log(best / x)) - 1e-12) best = g;
  return best;
}

/**
 * The α axis's move (search.ts Axis.move): α to `alpha`, λ scaled by the ratio of mean confidences and snapped
 * to λ's axis.
 */
export function ridgeMove(means: ConfidenceMeans, lambdas: readonly number[]) {
  return (from: Point, alpha: number | string): Point => {
    const scaling = from['scaling'] as string;
    const ratio = meanConfidence(means, alpha as number, scaling) / meanConfidence(means, from['alpha'] as number, scaling);
    return { ...from, alpha, regularization: snapLog((from['regularization'] as number) * ratio, lambdas) };
  };
}
