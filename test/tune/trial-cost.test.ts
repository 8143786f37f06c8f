import { describe, expect, it } from 'vitest';
import { easeCost, ialsCost, ialsSweepCost, itemKnnCost, type CostSizes } from '../../src-main/services/tune/trial-cost.ts';

// The two validation splits the coefficients were fitted on (trial-cost.ts), with the CPU-ms measured there.
const demo: CostSizes = { rows: 15_000, cols: 2_500, nnz: 164_332, pairs: 5_003_356, customers: 1_000 };
const retail: CostSizes = { rows: 4_097, cols: 3_624, nnz: 189_695, pairs: 28_968_439, customers: 1_000 };

describe('predicted trial costs (services/tune/trial-cost.ts)', () => {
  it('follow the methods\' work terms: EASE n³, iALS (m + n)k² + nnz·k per sweep, item-kNN its neighbour count', () => {
    // EASE's inverse is cubic in the catalogue (Steck 2019): doubling the items multiplies that term by 8.
    const big = { ...demo, cols: demo.cols * 2 };
    expect(easeCost(big) / easeCost(demo)).toBeGreaterThan(5);
    // An iALS sweep at k = 128 does 4× the Gram work and 2× the entry work of k = 64 (Hu et al. 2008 §4).
    const r = ialsSweepCost(demo, 128) / ialsSweepCost(demo, 64);
    expect(r).toBeGreaterThan(2);
    expect(r).toBeLessThan(4);
    expect(ialsCost(demo, 64, 15)).toBeCloseTo(5 * ialsCost(demo, 64, 3) - 4 * (ialsCost(demo, 64, 3) - 3 * ialsSweepCost(demo, 64)), 6);
    expect(itemKnnCost(demo, demo.cols)).toBeGreaterThan(itemKnnCost(demo, 50));
    // k above the catalogue is the catalogue ("all").
    expect(itemKnnCost(demo, 10 * demo.cols)).toBe(itemKnnCost(demo, demo.cols));
  });

  it('stay within 35% of the CPU-ms measured on the two fitting sets (2026-12-05, process.cpuUsage)', () => {
    const measured: [number, number, number][] = [
      [itemKnnCost(demo, 50), 105, 166],
      [itemKnnCost(retail, 50), 258, 299],
      [easeCost(demo), 725, 773],
      [easeCost(retail), 1_988, 2_111],
      [ialsCost(demo, 64, 3), 1_191, 1_310],
      [ialsCost(retail, 64, 3), 984, 1_061],
      [ialsCost(demo, 128, 3), 2_852, 2_864],
      [ialsCost(retail, 128, 3), 1_975, 2_034],
    ];
    for (const [predicted, lo, hi] of measured) {
      expect(predicted).toBeGreaterThan(lo / 1.35);
      expect(predicted).toBeLessThan(hi * 1.35);
    }
  });
});
