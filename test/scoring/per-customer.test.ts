import { describe, expect, it } from 'vitest';
import { blendColumnsInto, normaliseForCustomer } from '../../src-main/core/scoring/index.ts';

describe('normaliseForCustomer', () => {
  it('z-scores over the items not in the history (hand example)', () => {
    // Candidates {1, 2, 4} (item 2, value 3, is in the history): mean 7/3, population sd sqrt(14/9),
    // the standard score as scipy.stats.zscore computes it with its default ddof=0.
    const out = new Float32Array(4);
    normaliseForCustomer('zscore', Float32Array.from([1, 2, 3, 4]), [2], out, new Float64Array(4));
    const sd = Math.sqrt(14 / 9);
    expect(out[0]).toBeCloseTo((1 - 7 / 3) / sd, 6); // -1.0690
    expect(out[1]).toBeCloseTo((2 - 7 / 3) / sd, 6); // -0.2673
    expect(out[2]).toBeCloseTo((3 - 7 / 3) / sd, 6); // the history item is scaled too, never ranked
    expect(out[3]).toBeCloseTo((4 - 7 / 3) / sd, 6); // 1.3363
    expect(out[0]).toBeCloseTo(-1.069045, 5);
  });

  it('gives 0 everywhere for a constant column', () => {
    const out = new Float32Array(3).fill(9);
    normaliseForCustomer('zscore', Float32Array.from([5, 5, 5]), [], out, new Float64Array(3));
    expect(Array.from(out)).toEqual([0, 0, 0]);
  });

  it('ranks to mid-rank percentiles (hand example)', () => {
    // scipy.stats.rankdata([10, 30, 20, 20], 'average') = [1, 4, 2.5, 2.5]; (rank − 1) / (n − 1).
    const out = new Float32Array(4);
    normaliseForCustomer('rank', Float32Array.from([10, 30, 20, 20]), [], out, new Float64Array(4));
    expect(Array.from(out)).toEqual([0, 1, 0.5, 0.5]);
  });
});

describe('blendColumnsInto', () => {
  it('sums weighted columns; cold items take the content column', () => {
    const content = Float32Array.from([1, 2, 3]);
    const collab = Float32Array.from([10, 20, 30]);
    const out = new Float32Array(3);
    blendColumnsInto([content, collab], [0.25, 0.75], Uint8Array.from([0, 0, 1]), content, out);
    expect(Array.from(out)).toEqual([0.25 + 7.5, 0.5 + 15, 3]);
    // Half way: 0.5 · 3 + 0.5 · (0.75 + 22.5).
    blendColumnsInto([content, collab], [0.25, 0.75], Uint8Array.from([0, 0, 1]), content, out, 0.5);
    expect(out[2]).toBeCloseTo(0.5 * 3 + 0.5 * 23.25, 5);
  });
});
