/**
 * k-means over row-major vectors (customers × dim), for discovering taste groups from iALS customer
 * factors. Seeding is k-means++ (Arthur & Vassilvitskii 2007, "k-means++: the advantages of careful
 * seeding"): the first centre uniformly at random, each next one drawn with probability proportional to
 * D(x)², the squared distance to the nearest centre so far. Then Lloyd's iterations (Lloyd 1982): assign
 * each point to its nearest centre, move each centre to its points' mean, until no assignment changes.
 * Each Lloyd step never increases the within-group sum of squares, so the loop ends.
 * An emptied group takes the point farthest from its centre (common practice, no source), so k groups
 * always come back when there are at least k distinct points.
 */
import { InputError } from '../errors.ts';
import type { Rng } from '../rng.ts';

export interface KMeansResult {
  k: number;
  dim: number;
  /** k × dim, row-major. */
  centroids: Float64Array;
  /** Group of each point. */
  assignment: Int32Array;
  /** Points per group. */
  sizes: Int32Array;
  /** Within-group sum of squared distances. */
  inertia: number;
  iterations: number;
}

function dist2(x: ArrayLike<number>, xo: number, c: Float64Array, co: number, dim: number): number {
  let s = 0;
  for (let f = 0; f < dim; f++) {
    const d = (x[xo + f] as number) - (c[co + f] as number);
    s += d * d;
  }
  return s;
}

export function kMeans(x: Float32Array | Float64Array, n: number, dim: number, k: number, rng: Rng, maxIterations = 100): KMeansResult {
  if (!Number.isInteger(k) || k < 1) throw new InputError(`groups: k must be a whole number >= 1, got ${k}`);
  if (n < k) throw new InputError(`groups: cannot form ${k} groups from ${n} customers`);
  if (x.length !== n * dim) throw new InputError(`groups: expected ${n} × ${dim} values, got ${x.length}`);
  const c = new Float64Array(k * dim);
  const d2 = new Float64Array(n);
  // k-means++ seeding.
  const first = rng.int(n);
  for (let f = 0; f < dim; f++) c[f] = x[first * dim + f] as number;
  for (let i = 0; i < n; i++) d2[i] = dist2(x, i * dim, c, 0, dim);
  for (let j = 1; j < k; j++) {
    let total = 0;
    for (let i = 0; i < n; i++) total += d2[i] as number;
    let pick = n - 1;
    if (total > 0) {
      let r = rng.next() * total;
      for (let i = 0; i < n; i++) {
        r -= d2[i] as number;
        if (r < 0) {
          pick = i;
          break;
        }
      }
    } else pick = rng.int(n);
    for (let f = 0; f < dim; f++) c[j * dim + f] = x[pick * dim + f] as number;
    for (let i = 0; i < n; i++) {
      const d = dist2(x, i * dim, c, j * dim, dim);
      if (d < (d2[i] as number)) d2[i] = d;
    }
  }
  const assignment = new Int32Array(n).fill(-1);
  const sizes = new Int32Array(k);
  const sums = new Float64Array(k * dim);
  let iterations = 0;
  let inertia = 0;
  for (; iterations < maxIterations; iterations++) {
    let changed = 0;
    inertia = 0;
    for (let i = 0; i < n; i++) {
      let best = 0;
      let bestD = Infinity;
      for (let j = 0; j < k; j++) {
        const d = dist2(x, i * dim, c, j * dim, dim);
        if (d < bestD) {
          bestD = d;
          best = j;
        }
      }
      d2[i] = bestD;
      inertia += bestD;
      if (assignment[i] !== best) {
        assignment[i] = best;
        changed++;
      }
    }
    if (changed === 0 && iterations > 0) break;
    sizes.fill(0);
    sums.fill(0);
    for (let i = 0; i < n; i++) {
      const j = assignment[i] as number;
      sizes[j]!++;
      for (let f = 0; f < dim; f++) sums[j * dim + f]! += x[i * dim + f] as number;
    }
    for (let j = 0; j < k; j++) {
      if (sizes[j] === 0) {
        // Re-seed an empty group with the point farthest from its centre.
        let far = 0;
        for (let i = 1; i < n; i++) if ((d2[i] as number) > (d2[far] as number)) far = i;
        for (let f = 0; f < dim; f++) c[j * dim + f] = x[far * dim + f] as number;
        d2[far] = 0;
        continue;
      }
      for (let f = 0; f < dim; f++) c[j * dim + f] = (sums[j * dim + f] as number) / (sizes[j] as number);
    }
  }
  sizes.fill(0);
  for (let i = 0; i < n; i++) sizes[assignment[i] as number]!++;
  return { k, dim, centroids: c, assignment, sizes, inertia, iterations };
}
