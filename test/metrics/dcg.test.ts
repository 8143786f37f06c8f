import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { dcg, idealDcg, ndcgAtK, ndcgFromHits, ndcgGradedAtK, hitsAtK } from '../../src-main/core/metrics/index.ts';

describe('dcg', () => {
  // External check: the worked example with graded relevances 3,2,3,0,1,2 that is widely reproduced from
  // the encyclopedia article on DCG (value DCG@6 ≈ 6.861 recalled from memory, so re-derived here):
  //   3/log2(2) + 2/log2(3) + 3/log2(4) + 0/log2(5) + 1/log2(6) + 2/log2(7)
  //   = 3 + 1.26186 + 1.5 + 0 + 0.38685 + 0.71241 = 6.86112
  it('gives 6.861 for the graded example 3,2,3,0,1,2 (Järvelin & Kekäläinen 2002 formula)', () => {
    expect(dcg([3, 2, 3, 0, 1, 2], 6)).toBeCloseTo(6.86112, 4);
  });

  // The ideal ordering of the same six grades is 3,3,2,2,1,0:
  //   3 + 3/log2(3) + 2/2 + 2/log2(5) + 1/log2(6) + 0 = 3 + 1.89279 + 1 + 0.86135 + 0.38685 = 7.14099
  //   NDCG@6 = 6.86112 / 7.14099 = 0.96081
  it('gives IDCG@6 = 7.141 and NDCG@6 = 0.961 for that example', () => {
    expect(idealDcg([3, 2, 3, 0, 1, 2], 6)).toBeCloseTo(7.14099, 4);
    const gains = new Map([[10, 3], [11, 2], [12, 3], [13, 0], [14, 1], [15, 2]]);
    expect(ndcgGradedAtK([10, 11, 12, 13, 14, 15], gains, 6)).toBeCloseTo(0.96081, 4);
  });

  it('truncates at K', () => {
    expect(dcg([3, 2, 3, 0, 1, 2], 2)).toBeCloseTo(3 + 2 / Math.log2(3), 10);
  });

  it('rejects K = 0 and fractional K', () => {
    expect(() => dcg([1], 0)).toThrow(/K must be an integer >= 1/);
    expect(() => ndcgAtK([1], new Set([1]), 2.5)).toThrow(/K must be an integer >= 1/);
  });
});

describe('ndcg', () => {
  // Perfect ranking = 1 and no match = 0 (definition; the same checks as lenskit's tests/eval/test_rank_ndcg.py).
  it('is 1 for a perfect ranking and 0 when nothing matches', () => {
    expect(ndcgAtK([4, 7, 9, 1, 2], new Set([4, 7, 9]), 5)).toBeCloseTo(1, 12);
    expect(ndcgAtK([1, 2, 3], new Set([4, 7, 9]), 3)).toBe(0);
  });

  it('is 1 when the top K is all hits even with more truth than K', () => {
    expect(ndcgAtK([1, 2], new Set([1, 2, 3, 4]), 2)).toBeCloseTo(1, 12);
  });

  it('is NaN for empty truth, not 0', () => {
    expect(ndcgAtK([1, 2, 3], new Set(), 3)).toBeNaN();
    expect(ndcgFromHits([0, 0], 0, 2)).toBeNaN();
    expect(ndcgGradedAtK([1], new Map([[1, 0]]), 1)).toBeNaN();
  });

  it('hand-worked: hit at rank 2 of one relevant item gives 1/log2(3)', () => {
    expect(ndcgAtK([5, 6, 7], new Set([6]), 3)).toBeCloseTo(1 / Math.log2(3), 12);
  });

  // Property: three formulations agree — by positions (hit vector), by set lookup, and by the graded
  // definition with gains of 1 whose ideal DCG is found by sorting.
  it('agrees across formulations (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 0, max: 40 }), { minLength: 0, maxLength: 25 }),
        fc.uniqueArray(fc.integer({ min: 0, max: 40 }), { minLength: 1, maxLength: 15 }),
        fc.integer({ min: 1, max: 30 }),
        (ranked, truthList, k) => {
          const truth = new Set(truthList);
          const bySet = ndcgAtK(ranked, truth, k);
          const byHits = ndcgFromHits(hitsAtK(ranked, truth, k), truth.size, k);
          const graded = ndcgGradedAtK(ranked, new Map(truthList.map((i) => [i, 1])), k);
          // Slow reference written out from the definition: sum over ranks, ideal by sorting gains.
          let d = 0;
          for (let r = 0; r < Math.min(k, ranked.length); r++) if (truth.has(ranked[r]!)) d += 1 / Math.log2(r + 2);
          const idealGains = truthList.map(() => 1).sort((a, b) => b - a);
          let ideal = 0;
          for (let r = 0; r < Math.min(k, idealGains.length); r++) ideal += idealGains[r]! / Math.log2(r + 2);
          const ref = d / ideal;
          expect(bySet).toBeCloseTo(ref, 10);
          expect(byHits).toBeCloseTo(ref, 10);
          expect(graded).toBeCloseTo(ref, 10);
          expect(bySet).toBeGreaterThanOrEqual(0);
          expect(bySet).toBeLessThanOrEqual(1 + 1e-12);
        },
      ),
    );
  });
});
