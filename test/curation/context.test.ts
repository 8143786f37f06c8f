import { describe, expect, it } from 'vitest';
import { buildCurationContext, hasFacet, similarity } from '../../src-main/core/curation/context.ts';
import { context, item } from './helpers.ts';
import { selfInformation } from '../../src-main/core/metrics/novelty.ts';

describe('buildCurationContext', () => {
  it('codes facets densely and keeps tags as CSR-like lists', () => {
    const ctx = context([
      item(10, { category: 'Rugs', tags: ['wool', 'oak', 'wool'], supplier: 'Harrow Loom' }),
      item(11, { category: 'Lamps', tags: [], price: null, addedAt: null, promoted: true, available: false }),
      item(12, { category: 'Rugs', tags: ['oak'] }),
    ]);
    expect(Array.from(ctx.category)).toEqual([0, 1, 0]);
    expect(ctx.facets.category.values).toEqual(['Rugs', 'Lamps']);
    expect(Array.from(ctx.tagPtr)).toEqual([0, 2, 2, 3]);
    expect(ctx.facets.tag.values).toEqual(['wool', 'oak']);
    expect(hasFacet(ctx, 'tag', 2, 1)).toBe(true);
    expect(hasFacet(ctx, 'tag', 2, 0)).toBe(false);
    expect(ctx.price[1]).toBeNaN();
    expect(ctx.addedAt[1]).toBeNaN();
    expect(Array.from(ctx.promoted)).toEqual([0, 1, 0]);
    expect(Array.from(ctx.available)).toEqual([1, 0, 1]);
    expect(ctx.indexOfId.get(12)).toBe(2);
  });

  it('l2-normalises rows so similarity is the cosine', () => {
    const ctx = context([item(1), item(2), item(3)], [[3, 4], [0, 2], [0, 0]]);
    // cos((3,4), (0,2)) = 8 / (5 · 2) = 0.8; an all-zero row has similarity 0 to everything.
    expect(similarity(ctx, 0, 1)).toBeCloseTo(0.8, 6);
    expect(similarity(ctx, 0, 0)).toBeCloseTo(1, 6);
    expect(similarity(ctx, 2, 0)).toBe(0);
  });

  it('gives self-information −log2 p, counting an item nobody has as one customer, as the offline novelty does', () => {
    const items = [item(1), item(2)];
    const ctx = buildCurationContext(items, { vectors: new Float32Array(2), dim: 1, popularity: [0.25, 0], customerCount: 8 });
    expect(ctx.selfInformation[0]).toBeCloseTo(2, 12);
    // One floor for the meter and the evaluation: log2(8 / 1) = 3, the ceiling the meter scales by.
    expect(ctx.selfInformation[1]).toBeCloseTo(selfInformation(0, 8), 12);
    expect(ctx.selfInformation[1]).toBeCloseTo(3, 12);
    expect(ctx.selfInformationCeiling).toBeCloseTo(3, 12);
  });

  it('rejects vectors of the wrong size and shares outside [0, 1]', () => {
    expect(() => buildCurationContext([item(1)], { vectors: new Float32Array(3), dim: 2, popularity: [0] })).toThrow(
      /expected 1 × 2/,
    );
    expect(() => buildCurationContext([item(1)], { vectors: new Float32Array(1), dim: 1, popularity: [2] })).toThrow(
      /popularity\[0\] = 2/,
    );
    expect(() => buildCurationContext([item(1)], { vectors: new Float32Array(0), dim: 0, popularity: [0] })).toThrow(
      /dim must be an integer >= 1/,
    );
  });
});
