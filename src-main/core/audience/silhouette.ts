/**
 * Silhouette (Rousseeuw 1987, "Silhouettes: a graphical aid to the interpretation and validation of
 * cluster analysis", J. Comput. Appl. Math. 20:53-65). For point i in group A: a(i) is its mean distance
 * to the other members of A, b(i) the smallest mean distance to the members of another group, and
 * s(i) = (b − a) / max(a, b); a point alone in its group has s = 0 (Rousseeuw's convention). The mean
 * s over all points is the criterion for the number of groups: take the k with the largest mean.
 * Distances are Euclidean; on unit vectors ‖x − y‖ = √(2 − 2 cos), so this is cosine geometry.
 *
 * The pairwise distances of a sample are computed once (`pairDistances`) and reused for every k.
 */
import { InputError } from '../errors.ts';

/** Upper triangle of the n × n distance matrix, row by row (i < j), as one Float32Array. */
export interface PairDistances {
  n: number;
  d: Float32Array;
}

export function pairDistances(x: Float32Array | Float64Array, n: number, dim: number): PairDistances {
  if (x.length !== n * dim) throw new InputError(`silhouette: expected ${n} × ${dim} values, got ${x.length}`);
  const d = new Float32Array((n * (n - 1)) / 2);
  let p = 0;
  for (let i = 0; i < n; i++) {
    const io = i * dim;
    for (let j = i + 1; j < n; j++) {
      const jo = j * dim;
      let s = 0;
      for (let f = 0; f < dim; f++) {
        const t = (x[io + f] as number) - (x[jo + f] as number);
        s += t * t;
      }
      d[p++] = Math.sqrt(s);
    }
  }
  return { n, d };
}

/** s(i) for every point of the sample given its group in [0, k). */
export function silhouetteValues(pd: PairDistances, labels: Int32Array, k: number): Float64Array {
  const { n, d } = pd;
  if (labels.length !== n) throw new InputError(`silhouette: expected ${n} labels, got ${labels.length}`);
  const sizes = new Int32Array(k);
  for (let i = 0; i < n; i++) sizes[labels[i] as number]!++;
  // sum[i * k + g] = Σ distance from i to the members of group g.
  const sum = new Float64Array(n * k);
  let p = 0;
  for (let i = 0; i < n; i++) {
    const gi = labels[i] as number;
    for (let j = i + 1; j < n; j++) {
      const v = d[p++] as number;
      sum[i * k + (labels[j] as number)]! += v;
      sum[j * k + gi]! += v;
    }
  }
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const g = labels[i] as number;
    const own = sizes[g] as number;
    if (own <= 1) continue;
    const a = (sum[i * k + g] as number) / (own - 1);
    let b = Infinity;
    for (let h = 0; h < k; h++) if (h !== g && (sizes[h] as number) > 0) b = Math.min(b, (sum[i * k + h] as number) / (sizes[h] as number));
    if (!Number.isFinite(b)) continue;
    const m = Math.max(a, b);
    s[i] = m === 0 ? 0 : (b - a) / m;
  }
  return s;
}

export function meanSilhouette(pd: PairDistances, labels: Int32Array, k: number): number {
  const s = silhouetteValues(pd, labels, k);
  let t = 0;
  for (const v of s) t += v;
  return pd.n === 0 ? 0 : t / pd.n;
}
