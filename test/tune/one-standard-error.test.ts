import { describe, expect, it } from 'vitest';
import { oneStandardErrorUp } from '../../src-main/services/tune/model-search.ts';

const key = (lambda: number, values = 'presence') => JSON.stringify({ lambda, values });

describe('oneStandardErrorUp (Hastie, Tibshirani & Friedman, ESL 2nd ed. §7.10, the one-standard-error rule)', () => {
  it('takes the largest λ whose paired validation loss against the best is within one standard error', () => {
    // Per-customer NDCG of four customers. Against λ 300 (the best, mean 0.5):
    //   λ 1000: differences -0.1, 0, +0.1, -0.2: mean -0.05, sd 0.1291, se 0.0645: within one se;
    //   λ 3000: differences -0.4, -0.3, -0.5, -0.4: mean -0.4, se 0.0408: not within.
    const per = new Map<string, Float64Array>([
      [key(300), Float64Array.from([0.5, 0.5, 0.5, 0.5])],
      [key(100), Float64Array.from([0.5, 0.5, 0.5, 0.49])],
      [key(1000), Float64Array.from([0.4, 0.5, 0.6, 0.3])],
      [key(3000), Float64Array.from([0.1, 0.2, 0.0, 0.1])],
      [key(10_000, 'log'), Float64Array.from([0.5, 0.5, 0.5, 0.5])], // another transform: never a candidate
    ]);
    const r = oneStandardErrorUp({ lambda: 300, values: 'presence' }, 'lambda', per)!;
    expect(r.point).toEqual({ lambda: 1000, values: 'presence' });
    expect(r.note).toBe('EASE λ 1000 chosen over 300 by the one-standard-error rule (validation NDCG -0.0500 ± 0.0645 against it)');
  });

  it('keeps the best when no larger λ is within one standard error, or none was tried', () => {
    const per = new Map<string, Float64Array>([
      [key(300), Float64Array.from([0.5, 0.6, 0.5, 0.6])],
      [key(1000), Float64Array.from([0.3, 0.4, 0.3, 0.4])],
    ]);
    expect(oneStandardErrorUp({ lambda: 300, values: 'presence' }, 'lambda', per)).toBeNull();
    expect(oneStandardErrorUp({ lambda: 1000, values: 'presence' }, 'lambda', per)).toBeNull();
  });
});
