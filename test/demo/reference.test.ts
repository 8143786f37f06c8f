import { describe, expect, it } from 'vitest';
import { neighbourAgreement, type DemoFiles } from './reference.ts';

/** A four-item shop whose cosines are worked out by hand below. */
function tiny(): DemoFiles {
  const sig = (customer: string, item: string): Record<string, string> => ({ customer, item, kind: 'view', value: '1', at: '' });
  return {
    header: { items: [], customers: [], signals: [] },
    items: ['A', 'B', 'C', 'D'].map((id) => ({ id })),
    customers: ['u1', 'u2', 'u3'].map((id) => ({ id })),
    // u1: A B; u2: A B C (A twice: binary, counted once); u3: C D
    signals: [sig('u1', 'A'), sig('u1', 'B'), sig('u2', 'A'), sig('u2', 'A'), sig('u2', 'B'), sig('u2', 'C'), sig('u3', 'C'), sig('u3', 'D')],
    truth: { seed: 0, groups: [], itemGroup: { A: 'x', B: 'x', C: 'y', D: 'y' }, customerGroup: {} },
  };
}

describe('neighbourAgreement (test reference)', () => {
  // Cosine of binary customer vectors, Sarwar et al. (2001) section 3.1.1: cos(a, b) = a.b / (|a| |b|).
  // A=(1,1,0) B=(1,1,0) C=(0,1,1) D=(0,0,1): cos(A,B)=1, cos(A,C)=cos(B,C)=1/2, cos(C,D)=1/sqrt(2), A.D=B.D=0.
  it('with one neighbour, every item finds its own group', () => {
    expect(neighbourAgreement(tiny(), 1)).toEqual({ mean: 1, items: 4 });
  });

  it('with two neighbours, matches the hand-worked shares', () => {
    // A: B(1), C(1/2) -> 1/2; B: A, C -> 1/2; C: D(0.707), then A (tie with B at 1/2, lower index) -> 1/2;
    // D: only C -> 1. Mean (1/2 + 1/2 + 1/2 + 1) / 4 = 0.625.
    expect(neighbourAgreement(tiny(), 2).mean).toBeCloseTo(0.625, 12);
  });
});
