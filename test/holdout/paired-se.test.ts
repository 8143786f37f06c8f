import { describe, expect, it } from 'vitest';
import { pairedDifference, referencePerCustomer } from '../../bench/quality/paired.ts';

describe('paired standard error of the quality table', () => {
  it('is sd(a − b)/√n over the customers both sides hold, as in the paired t-test', () => {
    // Differences 0.3, 0.1, −0.1, 0.1 (customer z has no partner): mean 0.1, sample variance
    // (0.04 + 0 + 0.04 + 0) / 3 = 0.08/3, SE √(0.08/3/4) = 0.0816497 (Student's paired t-test, e.g. Montgomery & Runger,
    // Applied Statistics and Probability for Engineers, §10.4).
    const a = new Map([['w', 0.5], ['x', 0.3], ['y', 0.2], ['q', 0.4], ['z', 1]]);
    const b = new Map([['w', 0.2], ['x', 0.2], ['y', 0.3], ['q', 0.3]]);
    const d = pairedDifference(a, b);
    expect(d.n).toBe(4);
    expect(d.mean).toBeCloseTo(0.1, 12);
    expect(d.se).toBeCloseTo(Math.sqrt(0.08 / 3 / 4), 12);
    expect(d.se).toBeCloseTo(0.0816497, 6);
    expect(Number.isNaN(pairedDifference(a, new Map()).se)).toBe(true);
  });

  it("measures the reference's ranked lists per customer: a hit at rank 1 of two truth items is 1/(1 + 1/log2 3)", () => {
    const per = referencePerCustomer({ k: 2, truth: { c1: ['i1', 'i2'], c2: ['i9'] }, lists: { m: { c1: ['i1', 'i5'], c2: ['i3', 'i4'] } }, metrics: {} });
    // NDCG@2 binary, log2 discount (Järvelin & Kekäläinen 2002): DCG 1, ideal 1 + 1/log2 3.
    expect(per.m!.get('c1')).toBeCloseTo(1 / (1 + 1 / Math.log2(3)), 12);
    expect(per.m!.get('c2')).toBe(0);
  });
});
