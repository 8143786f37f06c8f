import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { gini } from '../../src-main/core/stats/gini.ts';

/** The definition, as a slow reference: G = Σ_i Σ_j |x_i − x_j| / (2 n² x̄). */
function giniByDefinition(x: number[]): number {
  const n = x.length;
  const mean = x.reduce((a, b) => a + b, 0) / n;
  let s = 0;
  for (const a of x) for (const b of x) s += Math.abs(a - b);
  return s / (2 * n * n * mean);
}

describe('gini', () => {
  it('gives 4/15 for the values 1..5', () => {
    // Textbook-style example from the definition G = ΣΣ|x_i − x_j| / (2 n² x̄) (value derived here, not
    // copied): x̄ = 3; unordered pairs differ by 1 (4 pairs), 2 (3), 3 (2), 4 (1): 4 + 6 + 6 + 4 = 20,
    // so the ordered double sum is 40 and G = 40 / (2 · 25 · 3) = 40/150 = 4/15.
    expect(gini([1, 2, 3, 4, 5])).toBeCloseTo(4 / 15, 12);
    expect(gini([5, 3, 1, 4, 2])).toBeCloseTo(4 / 15, 12);
  });

  it('is 0 for equal shares and (n − 1)/n when one takes all', () => {
    // Both limits follow from the definition: no differences; or n − 1 pairs of |x − 0| twice over.
    expect(gini([2, 2, 2])).toBe(0);
    expect(gini([0, 0, 0, 7])).toBeCloseTo(3 / 4, 12);
  });

  it('matches the double-sum definition on random inputs', () => {
    fc.assert(
      // Exposure-like values in hundredths: subnormal doubles (e.g. 5e-324) make both formulas round to
      // different nonsense, which says nothing about the Gini coefficient.
      fc.property(fc.array(fc.integer({ min: 0, max: 10_000 }).map((v) => v / 100), { minLength: 1, maxLength: 30 }), (x) => {
        const total = x.reduce((a, b) => a + b, 0);
        if (total === 0) return Number.isNaN(gini(x));
        return Math.abs(gini(x) - giniByDefinition(x)) < 1e-9;
      }),
    );
  });

  it('gives NaN with nothing to share and rejects negative values', () => {
    expect(gini([])).toBeNaN();
    expect(gini([0, 0])).toBeNaN();
    expect(() => gini([1, -1])).toThrow(/finite values >= 0, got -1 at 1/);
  });
});
