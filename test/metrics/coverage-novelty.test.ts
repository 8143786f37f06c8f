import { describe, expect, it } from 'vitest';
import { catalogueCoverage, novelty, selfInformation } from '../../src-main/core/metrics/index.ts';

describe('catalogue coverage (Herlocker et al. 2004, catalog coverage)', () => {
  it('counts distinct items over all lists', () => {
    expect(catalogueCoverage([[0, 1], [1, 2], [2, -1]], 10)).toBeCloseTo(0.3, 12);
    expect(catalogueCoverage([], 4)).toBe(0);
  });
  it('rejects an empty catalogue and out-of-range items', () => {
    expect(() => catalogueCoverage([[0]], 0)).toThrow(/itemCount/);
    expect(() => catalogueCoverage([[5]], 4)).toThrow(/outside/);
  });
});

describe('novelty (Zhou et al. 2010, mean self-information)', () => {
  // Hand-worked from the definition with 8 customers: an item held by 4 has p = 1/2 → 1 bit; an item held
  // by 1 has p = 1/8 → 3 bits; mean over the recommended items [a, b, b] = (1 + 3 + 3) / 3.
  it('averages −log2 p over every recommended item', () => {
    const counts = [4, 1];
    expect(novelty([[0, 1], [1]], counts, 8)).toBeCloseTo(7 / 3, 12);
  });
  it('clips an item nobody has to the rarest finite value log2(customers)', () => {
    expect(selfInformation(0, 8)).toBe(3);
    expect(selfInformation(8, 8)).toBe(0);
  });
  it('is NaN with no recommended items and rejects zero customers', () => {
    expect(novelty([[]], [1], 8)).toBeNaN();
    expect(() => selfInformation(1, 0)).toThrow(/customerCount/);
  });
});
