import { describe, expect, it } from 'vitest';
import { adjustedRandIndex, findTasteGroups, kMeans, kMeansRestarts, matchNames, meanSilhouette, pairDistances, silhouetteValues } from '../../src-main/core/audience/index.ts';
import { seededRng } from '../../src-main/core/rng.ts';

describe('adjusted Rand index (Hubert & Arabie 1985)', () => {
  // Worked by hand from the paper's formula; scikit-learn's adjusted_rand_score documents the same pair
  // ([0, 0, 1, 1] vs [0, 0, 1, 2]) as 0.57. Contingency cells 2, 1, 1 → Σ C(n_ij) = 1; rows 2, 2 → 2;
  // columns 2, 1, 1 → 1; C(4) = 6; E = 2 · 1 / 6 = 1/3; max = (2 + 1) / 2 = 3/2; ARI = (2/3) / (7/6) = 4/7.
  it('gives 4/7 on [0,0,1,1] vs [0,0,1,2]', () => {
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 0, 1, 2])).toBeCloseTo(4 / 7, 14);
  });

  it('is 1 for the same partition under other labels, and near 0 for independent labellings', () => {
    expect(adjustedRandIndex([0, 0, 1, 1, 2], [5, 5, 3, 3, 9])).toBe(1);
    const rng = seededRng(4);
    const a = Int32Array.from({ length: 20000 }, () => rng.int(5));
    const b = Int32Array.from({ length: 20000 }, () => rng.int(5));
    expect(Math.abs(adjustedRandIndex(a, b))).toBeLessThan(0.005);
  });

  // scikit-learn's documentation: adjusted_rand_score([0, 0, 1, 1], [0, 1, 0, 1]) is -0.5 (worse than chance).
  it('is negative (-0.5) for a labelling that splits every pair the other keeps', () => {
    expect(adjustedRandIndex([0, 0, 1, 1], [0, 1, 0, 1])).toBeCloseTo(-0.5, 14);
  });

  it('leaves out points without a label and refuses labellings of different lengths', () => {
    expect(adjustedRandIndex([0, 0, 1, 1, -1], [0, 0, 1, 2, 7])).toBeCloseTo(4 / 7, 14);
    expect(() => adjustedRandIndex([0, 1], [0])).toThrow(/differ in length \(2 vs 1\)/);
  });
});

describe('silhouette (Rousseeuw 1987)', () => {
  // By hand from the definition: {0, 1 | 5, 6}. Point 0: a = 1, b = (5 + 6) / 2 = 5.5, s = 4.5 / 5.5.
  // Point 1: a = 1, b = (4 + 5) / 2 = 4.5, s = 3.5 / 4.5; points 5 and 6 mirror 1 and 0.
  it('gives (4.5/5.5 + 3.5/4.5) / 2 on {0, 1 | 5, 6}', () => {
    const pd = pairDistances(Float64Array.from([0, 1, 5, 6]), 4, 1);
    const s = silhouetteValues(pd, Int32Array.from([0, 0, 1, 1]), 2);
    expect([...s]).toEqual([4.5 / 5.5, 3.5 / 4.5, 3.5 / 4.5, 4.5 / 5.5].map((v) => expect.closeTo(v, 6)));
    expect(meanSilhouette(pd, Int32Array.from([0, 0, 1, 1]), 2)).toBeCloseTo((4.5 / 5.5 + 3.5 / 4.5) / 2, 6);
  });

  // Rousseeuw (1987), section 2: a point alone in its group has s(i) = 0.
  it('gives 0 to a point alone in its group', () => {
    const pd = pairDistances(Float64Array.from([0, 1, 9]), 3, 1);
    expect(silhouetteValues(pd, Int32Array.from([0, 0, 1]), 2)[2]).toBe(0);
  });
});

/** k directional blobs in 16 dimensions: random centre directions, each point a noisy copy at a random length. */
function blobs(k: number, perGroup: number, seed: number): { x: Float32Array; n: number; truth: Int32Array } {
  const dim = 16;
  const rng = seededRng(seed);
  const centres = Float64Array.from({ length: k * dim }, () => rng.normal());
  const n = k * perGroup;
  const x = new Float32Array(n * dim);
  const truth = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const g = i % k;
    truth[i] = g;
    const len = 0.1 + 3 * rng.next();
    for (let f = 0; f < dim; f++) x[i * dim + f] = len * ((centres[g * dim + f] as number) + 0.25 * rng.normal());
  }
  return { x, n, truth };
}

describe('choosing the number of groups by the mean silhouette (Rousseeuw 1987)', () => {
  // Rousseeuw (1987), section 4: the k with the largest average silhouette width is the natural number of
  // groups. Planted blobs with known k are the check (as scikit-learn's make_blobs examples do).
  it.each([3, 5, 8])('finds k = %i planted directional blobs, whatever the vectors’ lengths', (k) => {
    const { x, n, truth } = blobs(k, 150, 100 + k);
    const g = findTasteGroups(x, n, 16, new Int32Array(n).fill(10), { minK: 2, maxK: 10, minHistory: 3 }, { seed: 7, sample: 600 });
    expect(g.k).toBe(k);
    expect(adjustedRandIndex(g.assignment, truth)).toBeGreaterThan(0.99);
    expect(g.groups.map((s) => s.size).reduce((a, b) => a + b, 0)).toBe(n);
    for (const s of g.groups) {
      expect(s.cohesion).toBeGreaterThan(0.8);
      expect(s.separation).toBeGreaterThan(0.2);
    }
  });

  it('sets customers with too little history aside as -1 and refuses settings out of range', () => {
    const { x, n } = blobs(3, 50, 9);
    const history = Int32Array.from({ length: n }, (_, i) => (i < 30 ? 1 : 5));
    const g = findTasteGroups(x, n, 16, history, { minK: 2, maxK: 6, minHistory: 3 }, { seed: 1 });
    expect(g.notEnoughHistory).toBe(30);
    expect([...g.assignment.subarray(0, 30)].every((v) => v === -1)).toBe(true);
    expect([...g.assignment.subarray(30)].every((v) => v >= 0)).toBe(true);
    expect(() => findTasteGroups(x, n, 16, history, { minK: 1, maxK: 6, minHistory: 3 })).toThrow(/smallest number of groups must be a whole number >= 2, got 1/);
    expect(() => findTasteGroups(x, n, 16, history, { minK: 2, maxK: 6, minHistory: 6 })).toThrow(/only 0 customers have 6 or more items/);
  });

  it('gives the same groups from the same seed', () => {
    const { x, n } = blobs(4, 100, 3);
    const h = new Int32Array(n).fill(5);
    expect(findTasteGroups(x, n, 16, h, undefined, { seed: 2 }).assignment).toEqual(findTasteGroups(x, n, 16, h, undefined, { seed: 2 }).assignment);
  });
});

describe('k-means++ restarts', () => {
  it('keep the run with the lowest inertia of the seeded stream', () => {
    const { x, n } = blobs(6, 40, 21);
    const best = kMeansRestarts(x, n, 16, 6, 5, 5);
    const rng = seededRng(5);
    const runs = Array.from({ length: 5 }, () => kMeans(x, n, 16, 6, rng).inertia);
    expect(best.inertia).toBe(Math.min(...runs));
    expect(() => kMeansRestarts(x, n, 16, 6, 5, 0)).toThrow(/restarts must be a whole number >= 1, got 0/);
  });
});

describe('carrying names across trainings by overlap (Jaccard 1912)', () => {
  it('gives a name to the group sharing most of its members, and to no group below half', () => {
    // New groups: 0 = {0,1,2,3}, 1 = {4,5,6}, 2 = {7,8,9}.
    const assignment = Int32Array.from([0, 0, 0, 0, 1, 1, 1, 2, 2, 2]);
    const m = matchNames(assignment, 3, [
      { name: 'A', members: [4, 5, 6, 7] }, // group 1: |∩| 3, |∪| 4 → 0.75
      { name: 'B', members: [0, 1, 2] }, // group 0: 3 / 4 = 0.75
      { name: 'C', members: [7, 0, 4] }, // best 1/5 → no group
    ]);
    expect(m.names).toEqual(['B', 'A', null]);
    expect(m.overlap).toEqual([0.75, 0.75, 0]);
    expect(m.unmatched).toEqual(['C']);
  });

  it('lets each group take one name, the closer one', () => {
    const m = matchNames(Int32Array.from([0, 0, 0, 0, 1]), 2, [
      { name: 'old', members: [0, 1, 2] }, // 3/4
      { name: 'newer', members: [0, 1, 2, 3] }, // 4/4
    ]);
    expect(m.names).toEqual(['newer', null]);
    expect(m.unmatched).toEqual(['old']);
  });
});
