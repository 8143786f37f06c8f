/**
 * k-means over row-major vectors (customers × dim), for discovering taste groups from iALS customer
 * factors. Seeding is k-means++ (Arthur & Vassilvitskii 2007, "k-means++: the advantages of careful
 * seeding"): the first centre uniformly at random, each next one drawn with probability proportional to
 * D(x)², the squared distance to the nearest centre so far. Then Lloyd's iterations (Lloyd 1982): assign
 * each point to its nearest centre, move each centre to its points' mean, until no assignment changes.
 * Each Lloyd step never increases the within-group sum of squares, so the loop ends.
 * An emptied group takes the point farthest from its centre (common practice, no source), so k groups
 * always come back when there are at least k distinct points.
 *
 * Distances are computed as ‖x‖² − 2x·c + ‖c‖² with ‖x‖² computed once, so the inner loop is one dot
 * product per point and centre over the Float32Array rows, with no allocation.
 */
import { InputError } from '../errors.ts';
import { seededRng, type Rng } from '../rng.ts';

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

export interface KMeansOptions {
  maxIterations?: number;
  /** Start Lloyd's iterations from these k × dim centres instead of k-means++ seeding. */
  init?: Float64Array;
  /** Stop once at most this many points change group in a pass (default 0: until none changes). */
  settle?: number;
}

function dot(x: Float32Array | Float64Array, xo: number, c: Float64Array, co: number, dim: number): number {
  let s = 0;
  for (let f = 0; f < dim; f++) s += (x[xo + f] as number) * (c[co + f] as number);
  return s;
}

function checkShape(x: Float32Array | Float64Array, n: number, dim: number, k: number): void {
  if (!Number.isInteger(k) || k < 1) throw new InputError(`groups: k must be a whole number >= 1, got ${k}`);
  if (n < k) throw new InputError(`groups: cannot form ${k} groups from ${n} customers`);
  if (x.length !== n * dim) throw new InputError(`groups: expected ${n} × ${dim} values, got ${x.length}`);
}

/** k-means++ seeding (Arthur & Vassilvitskii 2007, section 2.2); `d2` is filled with D(x)². */
function seedPlusPlus(x: Float32Array | Float64Array, n: number, dim: number, k: number, rng: Rng, xx: Float64Array, c: Float64Array, d2: Float64Array): void {
  const first = rng.int(n);
  for (let f = 0; f < dim; f++) c[f] = x[first * dim + f] as number;
  let cc = dot(c, 0, c, 0, dim);
  for (let i = 0; i < n; i++) d2[i] = Math.max(0, (xx[i] as number) - 2 * dot(x, i * dim, c, 0, dim) + cc);
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
    cc = dot(c, j * dim, c, j * dim, dim);
    for (let i = 0; i < n; i++) {
      const d = Math.max(0, (xx[i] as number) - 2 * dot(x, i * dim, c, j * dim, dim) + cc);
      if (d < (d2[i] as number)) d2[i] = d;
    }
  }
}

/** The k-means++ starting centres alone (k × dim), as `kMeans` draws them from the same stream. */
export function kMeansPlusPlus(x: Float32Array | Float64Array, n: number, dim: number, k: number, rng: Rng): Float64Array {
  checkShape(x, n, dim, k);
  const xx = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let f = 0; f < dim; f++) s += (x[i * dim + f] as number) ** 2;
    xx[i] = s;
  }
  const c = new Float64Array(k * dim);
  seedPlusPlus(x, n, dim, k, rng, xx, c, new Float64Array(n));
  return c;
}

export function kMeans(x: Float32Array | Float64Array, n: number, dim: number, k: number, rng: Rng, options: KMeansOptions | number = {}): KMeansResult {
  checkShape(x, n, dim, k);
  const opts: KMeansOptions = typeof options === 'number' ? { maxIterations: options } : options;
  const maxIterations = opts.maxIterations ?? 100;
  const settle = opts.settle ?? 0;
  const xx = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let f = 0; f < dim; f++) s += (x[i * dim + f] as number) ** 2;
    xx[i] = s;
  }
  const c = new Float64Array(k * dim);
  const cc = new Float64Array(k);
  const d2 = new Float64Array(n);
  if (opts.init) {
    if (opts.init.length !== k * dim) throw new InputError(`groups: initial centres must be ${k} × ${dim} values, got ${opts.init.length}`);
    c.set(opts.init);
  } else seedPlusPlus(x, n, dim, k, rng, xx, c, d2);
  const assignment = new Int32Array(n).fill(-1);
  const sizes = new Int32Array(k);
  const sums = new Float64Array(k * dim);
  let iterations = 0;
  let inertia = 0;
  for (; iterations < maxIterations; iterations++) {
    for (let j = 0; j < k; j++) cc[j] = dot(c, j * dim, c, j * dim, dim);
    let changed = 0;
    inertia = 0;
    for (let i = 0; i < n; i++) {
      const xo = i * dim;
      let best = 0;
      let bestD = Infinity;
      for (let j = 0; j < k; j++) {
        const d = (cc[j] as number) - 2 * dot(x, xo, c, j * dim, dim);
        if (d < bestD) {
          bestD = d;
          best = j;
        }
      }
      const d = Math.max(0, bestD + (xx[i] as number));
      d2[i] = d;
      inertia += d;
      if (assignment[i] !== best) {
        assignment[i] = best;
        changed++;
      }
    }
    if (changed <= settle && iterations > 0) break;
    sizes.fill(0);
    sums.fill(0);
    for (let i = 0; i < n; i++) {
      const j = assignment[i] as number;
      sizes[j]!++;
      const xo = i * dim;
      const so = j * dim;
      for (let f = 0; f < dim; f++) sums[so + f]! += x[xo + f] as number;
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
      const inv = 1 / (sizes[j] as number);
      for (let f = 0; f < dim; f++) c[j * dim + f] = (sums[j * dim + f] as number) * inv;
    }
  }
  sizes.fill(0);
  for (let i = 0; i < n; i++) sizes[assignment[i] as number]!++;
  return { k, dim, centroids: c, assignment, sizes, inertia, iterations };
}

/**
 * Several k-means++ restarts from one seeded stream, keeping the lowest inertia (the "n_init" of
 * scikit-learn's KMeans; Arthur & Vassilvitskii's guarantee is in expectation, so restarts cut the
 * chance of a poor seeding).
 */
export function kMeansRestarts(x: Float32Array | Float64Array, n: number, dim: number, k: number, seed: number, restarts: number, maxIterations = 100): KMeansResult {
  if (!Number.isInteger(restarts) || restarts < 1) throw new InputError(`groups: restarts must be a whole number >= 1, got ${restarts}`);
  const rng = seededRng(seed);
  let best: KMeansResult | null = null;
  for (let r = 0; r < restarts; r++) {
    const run = kMeans(x, n, dim, k, rng, { maxIterations });
    if (!best || run.inertia < best.inertia) best = run;
  }
  return best as KMeansResult;
}
