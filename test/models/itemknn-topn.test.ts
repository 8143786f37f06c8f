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

describe("collectNeighbours with ties: 'all'", () => {
  it('keeps the k best and every candidate tied with the k-th (float32), best first, lower index first among equals (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -2, max: 4 }), { minLength: 0, maxLength: 30 }), fc.integer({ min: 1, max: 8 }), (raw, k) => {
        const n = raw.length;
        const scores = raw.map((v) => v / 3); // few distinct values: many ties
        const nb = collectNeighbours(1, k, (_i, sink) => scores.forEach((s, j) => sink.push(j, s)), { ties: 'all' });
        const sorted = scores.map((s, j) => [Math.fround(s), j] as const).sort((a, b) => b[0] - a[0] || a[1] - b[1]);
        const kth = n >= k ? sorted[k - 1]![0] : -Infinity;
        const expected = n > k ? sorted.filter(([s]) => s >= kth) : sorted;
        expect(Array.from(nb.indices)).toEqual(expected.map(([, j]) => j));
        expect(Array.from(nb.data)).toEqual(expected.map(([s]) => s));
      }),
    );
  });

  it('gives the same neighbour set when the candidates are renumbered (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 3 }), { minLength: 1, maxLength: 25 }), fc.integer({ min: 1, max: 6 }), (raw, k) => {
        const n = raw.length;
        const a = collectNeighbours(1, k, (_i, sink) => raw.forEach((s, j) => sink.push(j, s)), { ties: 'all' });
        const b = collectNeighbours(1, k, (_i, sink) => raw.forEach((s, j) => sink.push(n - 1 - j, s)), { ties: 'all' });
        expect(new Set(Array.from(b.indices).map((j) => n - 1 - j))).toEqual(new Set(a.indices));
      }),
    );
  });
});
