import { describe, expect, it } from 'vitest';
import { calibrationGap, klDivergence } from '../../src-main/core/stats/kl.ts';
import { mean, median } from '../../src-main/core/stats/summary.ts';

describe('klDivergence', () => {
  it('matches a hand computation of relative entropy', () => {
    // Cover & Thomas, Elements of Information Theory, definition of relative entropy:
    // D(p‖q) = Σ p log(p/q). p = (1/2, 1/2), q = (3/4, 1/4), natural log:
    // 0.5·ln(2/3) + 0.5·ln(2) = 0.5·(−0.405465) + 0.5·0.693147 = 0.143841.
    expect(klDivergence([0.5, 0.5], [0.75, 0.25])).toBeCloseTo(0.5 * Math.log(2 / 3) + 0.5 * Math.log(2), 12);
    expect(klDivergence([0.5, 0.5], [0.75, 0.25])).toBeCloseTo(0.143841, 6);
  });

  it('is 0 for equal distributions, skips p = 0 and is infinite where q = 0 < p', () => {
    // Conventions 0·log(0/q) = 0 and p·log(p/0) = ∞ (Cover & Thomas, same definition).
    expect(klDivergence([0.2, 0.8], [0.2, 0.8])).toBe(0);
    expect(klDivergence([0, 1], [0.5, 0.5])).toBeCloseTo(Math.log(2), 12);
    expect(klDivergence([0.5, 0.5], [1, 0])).toBe(Infinity);
  });
});

describe('calibrationGap', () => {
  it('mixes α = 0.01 of p into q before the divergence', () => {
    // Steck (2018), "Calibrated recommendations": C_KL = KL(p‖q̃), q̃ = (1 − α)q + αp, α = 0.01.
    // p = (0.5, 0.5), q = (0.75, 0.25): q̃ = (0.7475, 0.2525);
    // 0.5·ln(0.5/0.7475) + 0.5·ln(0.5/0.2525) = 0.5·(−0.402126) + 0.5·0.683197 = 0.140535 (by hand, 6 d.p.).
    expect(calibrationGap([0.5, 0.5], [0.75, 0.25])).toBeCloseTo(0.140535, 6);
  });

  it('stays finite when the list misses a category, normalises counts, NaN without data', () => {
    // q = (1, 0) counts 3:0; q̃ = (0.995, 0.005): 0.5·ln(0.5/0.995) + 0.5·ln(0.5/0.005).
    const expected = 0.5 * Math.log(0.5 / 0.995) + 0.5 * Math.log(100);
    expect(calibrationGap([1, 1], [3, 0])).toBeCloseTo(expected, 12);
    expect(calibrationGap([1, 1], [0, 0])).toBeNaN();
    expect(() => calibrationGap([1], [1, 2])).toThrow(/lengths differ/);
  });
});

describe('summary', () => {
  it('takes the middle value, or the mean of the two middle ones', () => {
    expect(median([5, 1, 3])).toBe(3);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBeNaN();
    expect(mean([1, 2, 6])).toBe(3);
    expect(mean([])).toBeNaN();
  });
});
