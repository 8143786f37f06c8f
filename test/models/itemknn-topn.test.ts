import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { collectNeighbours, topN } from '../../src-main/core/models/topn.ts';

/** The slow reference: sort everything (score descending, index ascending on ties) and cut. */
function sortedReference(scores: number[], n: number, exclude: number, skip: Set<number>): number[] {
  return scores
    .map((s, i) => [Math.fround(s), i] as const)
    .filter(([s, i]) => i !== exclude && !skip.has(i) && !Number.isNaN(s))
    .sort((a, b) => b[0] - a[0] || a[1] - b[1])
    .slice(0, n)
    .map(([, i]) => i);
}

describe('topN (the selection under item-kNN, content, EASE and popularity)', () => {
  it('equals a full sort with ties broken by the lower index (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.integer({ min: -3, max: 3 }), fc.double({ noNaN: false })), { maxLength: 80 }),
        fc.nat(20),
        fc.integer({ min: -1, max: 80 }),
        fc.array(fc.nat(80), { maxLength: 10 }),
        (scores, n, exclude, skipList) => {
          const skip = new Set(skipList);
          const mask = new Uint8Array(scores.length);
          for (const s of skip) if (s < scores.length) mask[s] = 1;
          const got = topN(Float32Array.from(scores), n, exclude, mask);
          expect(Array.from(got.items)).toEqual(sortedReference(scores, n, exclude, skip));
          got.items.forEach((i, q) => expect(got.scores[q]).toBe(Math.fround(scores[i]!)));
        },
      ),
    );
  });

  it('builds neighbour lists of at most k per row, best first', () => {
    const nb = collectNeighbours(3, 2, (i, heap) => {
      for (let j = 0; j < 5; j++) heap.push(j, (i + 1) * j);
    });
    expect(Array.from(nb.indptr)).toEqual([0, 2, 4, 6]);
    expect(Array.from(nb.indices)).toEqual([4, 3, 4, 3, 4, 3]);
    expect(Array.from(nb.data)).toEqual([4, 3, 8, 6, 12, 9]);
  });
});
