/**
 * Taste groups from customer factors, in cosine geometry.
 *
 * 1. Customers with fewer than `minHistory` distinct items are set aside as "not enough history yet":
 *    their iALS vectors are short and noisy, and on raw factors they piled into one group.
 * 2. The rest are scaled to unit length, so k-means on them groups by direction (cosine), not by how
 *    much a customer has done.
 * 3. The number of groups is chosen by the mean silhouette (Rousseeuw 1987; silhouette.ts) over a seeded
 *    sample: for each k in [minK, maxK], `restarts` seeded k-means++ runs on the sample keep the best
 *    (lowest inertia), and the k with the largest mean silhouette wins.
 * 4. Lloyd's iterations on every eligible customer start from the chosen sample centres. Running every
 *    restart on every customer would cost restarts × k-range full passes; the sample fit is the start,
 *    the full pass settles it (the usual use of a sample for seeding; no source for the split).
 * 5. Groups are numbered by size, largest first, and each is measured: cohesion = mean cosine of its
 *    members to the group's direction (for unit vectors this is ‖centre‖), separation = cosine distance
 *    1 − cos from its direction to the nearest other group's, and its members' mean silhouette on the sample.
 */
import { InputError } from '../errors.ts';
import { seededRng } from '../rng.ts';
import { kMeans, kMeansRestarts } from './kmeans.ts';
import { pairDistances, silhouetteValues } from './silhouette.ts';

export interface GroupSettings {
  minK: number;
  maxK: number;
  /** Distinct items a customer needs before joining a group. */
  minHistory: number;
}

/**
 * Defaults: 2 to 12 groups (a dozen is about as many as an editor can name and tell apart: common practice,
 * no source); 3 distinct items before a taste is read (common practice, no source; measured on the demo shop
 * in the README's groups section).
 */
export const GROUP_DEFAULTS: Readonly<GroupSettings> = { minK: 2, maxK: 12, minHistory: 3 };

export interface GroupingOptions {
  seed?: number;
  /** Customers in the silhouette and restart sample (default 3,000). */
  sample?: number;
  /** k-means++ restarts per k on the sample (default 4). */
  restarts?: number;
}

export interface GroupStats {
  group: number;
  size: number;
  cohesion: number;
  nearest: number;
  separation: number;
  /** Mean silhouette of the group's sampled members (NaN when none was sampled). */
  silhouette: number;
}

export interface TasteGrouping {
  k: number;
  settings: GroupSettings;
  /** Group of each customer; -1 = not enough history yet. */
  assignment: Int32Array;
  notEnoughHistory: number;
  groups: GroupStats[];
  /** Mean silhouette on the sample for every k tried. */
  tried: { k: number; silhouette: number }[];
  silhouette: number;
  sampled: number;
  /** Unit-length centres, k × dim. */
  centres: Float64Array;
  /** Milliseconds spent choosing k on the sample and fitting every customer. */
  timings: { chooseMs: number; fullMs: number };
}

export function checkSettings(s: GroupSettings): void {
  if (!Number.isInteger(s.minK) || s.minK < 2) throw new InputError(`groups: the smallest number of groups must be a whole number >= 2, got ${s.minK}`);
  if (!Number.isInteger(s.maxK) || s.maxK < s.minK) throw new InputError(`groups: the largest number of groups must be a whole number >= the smallest (${s.minK}), got ${s.maxK}`);
  if (s.maxK > 50) throw new InputError(`groups: at most 50 groups, got ${s.maxK}`);
  if (!Number.isInteger(s.minHistory) || s.minHistory < 1) throw new InputError(`groups: the history needed must be a whole number >= 1, got ${s.minHistory}`);
}

export function findTasteGroups(factors: Float32Array, customers: number, dim: number, history: Int32Array, settings: GroupSettings = GROUP_DEFAULTS, options: GroupingOptions = {}): TasteGrouping {
  checkSettings(settings);
  if (factors.length !== customers * dim) throw new InputError(`groups: expected ${customers} × ${dim} factors, got ${factors.length}`);
  const seed = options.seed ?? 20260101;
  const sampleSize = options.sample ?? 3000;
  const restarts = options.restarts ?? 4;
  // 1-2: eligible customers as unit rows.
  const rows: number[] = [];
  for (let u = 0; u < customers; u++) {
    if ((history[u] ?? 0) < settings.minHistory) continue;
    let s = 0;
    for (let f = 0; f < dim; f++) s += (factors[u * dim + f] as number) ** 2;
    if (s > 0) rows.push(u);
  }
  const m = rows.length;
  if (m < 2 * settings.minK) {
    throw new InputError(`groups: only ${m} customers have ${settings.minHistory} or more items, too few for ${settings.minK} groups`);
  }
  const unit = new Float32Array(m * dim);
  for (let r = 0; r < m; r++) {
    const u = rows[r] as number;
    let s = 0;
    for (let f = 0; f < dim; f++) s += (factors[u * dim + f] as number) ** 2;
    const inv = 1 / Math.sqrt(s);
    for (let f = 0; f < dim; f++) unit[r * dim + f] = (factors[u * dim + f] as number) * inv;
  }
  // 3: a seeded sample (partial Fisher-Yates), its distances once, the silhouette of each k.
  const rng = seededRng(seed);
  const order = Int32Array.from({ length: m }, (_, i) => i);
  const s = Math.min(m, sampleSize);
  for (let i = 0; i < s; i++) {
    const j = i + rng.int(m - i);
    const t = order[i] as number;
    order[i] = order[j] as number;
    order[j] = t;
  }
  const picked = order.subarray(0, s);
  const sample = new Float32Array(s * dim);
  for (let i = 0; i < s; i++) sample.set(unit.subarray((picked[i] as number) * dim, ((picked[i] as number) + 1) * dim), i * dim);
  const started = performance.now();
  const pd = pairDistances(sample, s, dim);
  const tried: { k: number; silhouette: number }[] = [];
  let bestK = settings.minK;
  let bestSil = -Infinity;
  let bestCentres: Float64Array | null = null;
  for (let k = settings.minK; k <= Math.min(settings.maxK, s - 1); k++) {
    const r = kMeansRestarts(sample, s, dim, k, seed + k, restarts, 50);
    const sv = silhouetteValues(pd, r.assignment, k);
    let mean = 0;
    for (const v of sv) mean += v;
    mean /= s;
    tried.push({ k, silhouette: mean });
    if (mean > bestSil) {
      bestSil = mean;
      bestK = k;
      bestCentres = r.centroids;
    }
  }
  // 4: every eligible customer, from the sample's centres.
  const chosen = performance.now();
  const full = kMeans(unit, m, dim, bestK, rng, { init: bestCentres as Float64Array, maxIterations: 50, settle: Math.floor(m * 1e-4) });
  const fullMs = performance.now() - chosen;
  // 5: number groups by size, largest first.
  // A group left empty (fewer distinct directions than k) is dropped, so every group listed has members.
  const byId = Array.from({ length: full.k }, (_, j) => j)
    .filter((j) => (full.sizes[j] as number) > 0)
    .sort((a, b) => (full.sizes[b] as number) - (full.sizes[a] as number) || a - b);
  bestK = byId.length;
  const rename = new Int32Array(full.k).fill(-1);
  byId.forEach((old, neu) => (rename[old] = neu));
  const assignment = new Int32Array(customers).fill(-1);
  for (let r = 0; r < m; r++) assignment[rows[r] as number] = rename[full.assignment[r] as number] as number;
  const centres = new Float64Array(bestK * dim);
  const cohesion = new Float64Array(bestK);
  for (let j = 0; j < bestK; j++) {
    const old = byId[j] as number;
    let len = 0;
    for (let f = 0; f < dim; f++) len += (full.centroids[old * dim + f] as number) ** 2;
    len = Math.sqrt(len);
    cohesion[j] = len;
    for (let f = 0; f < dim; f++) centres[j * dim + f] = len > 0 ? (full.centroids[old * dim + f] as number) / len : 0;
  }
  const sampleLabels = Int32Array.from(picked, (r) => rename[full.assignment[r] as number] as number);
  const sv = silhouetteValues(pd, sampleLabels, bestK);
  const silSum = new Float64Array(bestK);
  const silCount = new Int32Array(bestK);
  let silAll = 0;
  for (let i = 0; i < s; i++) {
    silSum[sampleLabels[i] as number]! += sv[i] as number;
    silCount[sampleLabels[i] as number]!++;
    silAll += sv[i] as number;
  }
  const groups: GroupStats[] = [];
  for (let j = 0; j < bestK; j++) {
    let nearest = -1;
    let bestCos = -Infinity;
    for (let h = 0; h < bestK; h++) {
      if (h === j) continue;
      let c = 0;
      for (let f = 0; f < dim; f++) c += (centres[j * dim + f] as number) * (centres[h * dim + f] as number);
      if (c > bestCos) {
        bestCos = c;
        nearest = h;
      }
    }
    groups.push({
      group: j,
      size: full.sizes[byId[j] as number] as number,
      cohesion: cohesion[j] as number,
      nearest,
      separation: 1 - bestCos,
      silhouette: (silCount[j] as number) > 0 ? (silSum[j] as number) / (silCount[j] as number) : NaN,
    });
  }
  return { k: bestK, settings: { ...settings }, assignment, notEnoughHistory: customers - m, groups, tried, silhouette: silAll / s, sampled: s, centres, timings: { chooseMs: chosen - started, fullMs } };
}
