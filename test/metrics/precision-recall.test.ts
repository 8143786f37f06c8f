import { describe, expect, it } from 'vitest';
import {
  averagePrecisionFromHits,
  cappedRecallFromHits,
  hitRateFromHits,
  hitsAtK,
  meanAveragePrecision,
  precisionFromHits,
  recallFromHits,
} from '../../src-main/core/metrics/index.ts';

// Ranked list 1..10; relevant items 1, 3, 6 and one never retrieved (99): hits at ranks 1, 3, 6.
const ranked = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
const truth = new Set([1, 3, 6, 99]);
const hits = hitsAtK(ranked, truth, 10);

describe('precision and recall (Manning, Raghavan & Schütze, IIR 2008, ch. 8)', () => {
  it('P@5 = 2/5 and P@10 = 3/10', () => {
    expect(precisionFromHits(hits, truth.size, 5)).toBeCloseTo(0.4, 12);
    expect(precisionFromHits(hits, truth.size, 10)).toBeCloseTo(0.3, 12);
  });
  it('classic R@5 = 2/4; capped R@2 (Liang et al. 2018) = 1/min(2,4) = 0.5', () => {
    expect(recallFromHits(hits, truth.size, 5)).toBeCloseTo(0.5, 12);
    expect(recallFromHits(hits, truth.size, 2)).toBeCloseTo(0.25, 12);
    expect(cappedRecallFromHits(hits, truth.size, 2)).toBeCloseTo(0.5, 12);
  });
  it('capped recall reaches 1 when the top K is all hits with more truth than K', () => {
    const h = hitsAtK([1, 3], truth, 2);
    expect(cappedRecallFromHits(h, truth.size, 2)).toBe(1);
    expect(recallFromHits(h, truth.size, 2)).toBe(0.5);
  });
  it('divides precision by K when fewer than K items were ranked', () => {
    expect(precisionFromHits(hitsAtK([1], truth, 4), truth.size, 4)).toBe(0.25);
  });
  it('gives NaN for empty truth', () => {
    expect(precisionFromHits(hits, 0, 5)).toBeNaN();
    expect(recallFromHits(hits, 0, 5)).toBeNaN();
    expect(cappedRecallFromHits(hits, 0, 5)).toBeNaN();
    expect(hitRateFromHits(hits, 0, 5)).toBeNaN();
    expect(averagePrecisionFromHits(hits, 0, 5)).toBeNaN();
  });
});

describe('average precision (IIR 2008, section 8.4, MAP definition)', () => {
  // Hand-worked from the definition: precision at each relevant rank is 1/1, 2/3, 3/6; the fourth
  // relevant item is never retrieved and contributes 0; divide by |truth| = 4:
  //   AP = (1 + 0.666667 + 0.5) / 4 = 0.541667
  it('AP@10 = 0.541667 on the hand-worked ranking', () => {
    expect(averagePrecisionFromHits(hits, truth.size, 10)).toBeCloseTo(0.541667, 6);
  });
  it('AP@3 counts only ranks up to 3: (1 + 2/3) / 4; with min denominator / 3', () => {
    expect(averagePrecisionFromHits(hits, truth.size, 3)).toBeCloseTo((1 + 2 / 3) / 4, 12);
    expect(averagePrecisionFromHits(hits, truth.size, 3, 'min')).toBeCloseTo((1 + 2 / 3) / 3, 12);
  });
  it('is 1 for a perfect ranking and 0 for no match', () => {
    expect(averagePrecisionFromHits(hitsAtK([1, 3, 6, 99], truth, 4), 4, 4)).toBe(1);
    expect(averagePrecisionFromHits(hitsAtK([2, 4], truth, 2), 4, 2)).toBe(0);
  });
  it('MAP skips customers with undefined AP', () => {
    expect(meanAveragePrecision([0.5, Number.NaN, 1])).toBe(0.75);
    expect(meanAveragePrecision([Number.NaN])).toBeNaN();
  });
});

describe('hit rate', () => {
  it('is 1 with any hit in the top K, else 0', () => {
    expect(hitRateFromHits(hits, 4, 2)).toBe(1);
    expect(hitRateFromHits(hitsAtK([2, 4, 5], truth, 3), 4, 3)).toBe(0);
  });
});
