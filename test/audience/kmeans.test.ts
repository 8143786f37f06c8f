import { describe, expect, it } from 'vitest';
import { describeGroups, kMeans } from '../../src-main/core/audience/index.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Dataset, Item } from '../../src-main/core/types.ts';

/** Three planted groups in 2-D around (0,0), (10,0) and (0,10), σ = 0.5, 50 points each. */
function planted(seed: number): { x: Float32Array; truth: Int32Array } {
  const rng = seededRng(seed);
  const centres = [[0, 0], [10, 0], [0, 10]];
  const x = new Float32Array(150 * 2);
  const truth = new Int32Array(150);
  for (let i = 0; i < 150; i++) {
    const g = i % 3;
    truth[i] = g;
    x[i * 2] = centres[g]![0]! + 0.5 * rng.normal();
    x[i * 2 + 1] = centres[g]![1]! + 0.5 * rng.normal();
  }
  return { x, truth };
}

describe('k-means++', () => {
  it('recovers a planted 3-group set exactly (up to the groups’ numbering) for several seeds', () => {
    for (const seed of [1, 2, 3, 4, 5]) {
      const { x, truth } = planted(seed);
      const r = kMeans(x, 150, 2, 3, seededRng(seed * 17));
      const map = new Map<number, number>();
      for (let i = 0; i < 150; i++) {
        const got = r.assignment[i]!;
        if (!map.has(got)) map.set(got, truth[i]!);
        expect(map.get(got)).toBe(truth[i]);
      }
      expect(new Set(map.values()).size).toBe(3);
      expect([...r.sizes].sort()).toEqual([50, 50, 50]);
    }
  });

  // Worked by hand from the definition (Lloyd 1982): {1, 2, 10, 11} in one dimension with k = 2 has the
  // optimum {1, 2} | {10, 11}, centres 1.5 and 10.5, within-group sum of squares 4 × 0.5² = 1.
  it('finds centres 1.5 and 10.5 with inertia 1 on {1, 2, 10, 11}', () => {
    const r = kMeans(Float64Array.from([1, 2, 10, 11]), 4, 1, 2, seededRng(9));
    expect([...r.centroids].sort((a, b) => a - b)).toEqual([1.5, 10.5]);
    expect(r.inertia).toBeCloseTo(1, 12);
  });

  // Reference: exhaustive search over every 2-partition of 10 random points; k-means is a local method,
  // but on two well-separated blobs it must reach the global optimum.
  it('matches the exhaustive optimum on two separated blobs', () => {
    const rng = seededRng(11);
    const pts = Array.from({ length: 10 }, (_, i) => (i < 5 ? 0 : 20) + rng.normal());
    let best = Infinity;
    for (let mask = 1; mask < 1 << 10; mask++) {
      const a = pts.filter((_, i) => mask & (1 << i));
      const b = pts.filter((_, i) => !(mask & (1 << i)));
      if (b.length === 0) continue;
      const sse = (g: number[]) => {
        const m = g.reduce((s, v) => s + v, 0) / g.length;
        return g.reduce((s, v) => s + (v - m) ** 2, 0);
      };
      best = Math.min(best, sse(a) + sse(b));
    }
    expect(kMeans(Float64Array.from(pts), 10, 1, 2, seededRng(3)).inertia).toBeCloseTo(best, 9);
  });

  it('is reproducible from its seed and refuses more groups than points', () => {
    const { x } = planted(8);
    expect(kMeans(x, 150, 2, 4, seededRng(5)).assignment).toEqual(kMeans(x, 150, 2, 4, seededRng(5)).assignment);
    expect(() => kMeans(x.subarray(0, 4), 2, 2, 3, seededRng(1))).toThrow(/cannot form 3 groups from 2 customers/);
  });
});

describe('describing groups by lift', () => {
  it('ranks the categories a group over-uses, lift = P(c | group) / P(c)', () => {
    const item = (id: number, category: string, tags: string[]): Item => ({
      id, externalId: `I${id}`, title: '', description: '', category, tags, supplier: '', price: null, addedAt: null, promoted: false, available: true, attributes: {},
    });
    const items = [item(1, 'kites', ['windy']), item(2, 'teapots', ['warm']), item(3, 'lanterns', ['warm'])];
    // Customer 0 (group 0): kites ×3, teapots ×1. Customer 1 (group 1): teapots ×2, lanterns ×2.
    const pairs = [[0, 0], [0, 0], [0, 0], [0, 1], [1, 1], [1, 1], [1, 2], [1, 2]] as const;
    const ds: Dataset = {
      items,
      customerIds: Int32Array.from([1, 2]),
      customerExternalIds: ['a', 'b'],
      signals: {
        length: pairs.length,
        customer: Int32Array.from(pairs.map((p) => p[0])),
        item: Int32Array.from(pairs.map((p) => p[1])),
        kind: new Uint8Array(pairs.length),
        value: new Float32Array(pairs.length).fill(1),
        at: new Float64Array(pairs.length),
      },
    };
    const [g0, g1] = describeGroups(ds, Int32Array.from([0, 1]), 2);
    // kites: 3/4 of group 0's signals, 3/8 overall → lift 2; teapots: 1/4 vs 3/8 → 2/3.
    expect(g0!.categories[0]).toEqual({ value: 'kites', share: 0.75, lift: 2 });
    expect(g0!.categories[1]!.lift).toBeCloseTo(2 / 3, 12);
    // lanterns: 2/4 vs 2/8 → 2; teapots 2/4 vs 3/8 → 4/3.
    expect(g1!.categories.map((c) => c.value)).toEqual(['lanterns', 'teapots']);
    expect(g1!.tags[0]).toEqual({ value: 'warm', share: 1, lift: 8 / 5 });
    expect(g0!.customers).toBe(1);
  });
});
