import { describe, expect, it } from 'vitest';
import { bestRelevanceSums, choiceCost, describeChoiceCost } from '../../src-main/core/curation/choice-cost.ts';
import { meterShelf } from '../../src-main/core/curation/meter.ts';
import { context, EDITION, item } from './helpers.ts';

/**
 * The price of the editor's choices (issue 10 item 4), worked by hand: five items with validated relevance
 * 0.9, 0.8, 0.5, 0.2 and (out of stock, so in no list) NaN. The most relevant 2-item list is {0.9, 0.8} = 1.7.
 */
describe('choiceCost', () => {
  const relevance = Float64Array.of(0.9, 0.8, 0.5, 0.2, NaN);
  const best = bestRelevanceSums(relevance, 4);

  it('prefixes the best sums: 0, 0.9, 1.7, 2.2, 2.4', () => {
    expect(Array.from(best).map((x) => Math.round(x * 1e9) / 1e9)).toEqual([0, 0.9, 1.7, 2.2, 2.4]);
  });

  it('is 0 for the unconstrained best list, in any order', () => {
    expect(choiceCost(Int32Array.of(0, 1), relevance, best)).toBe(0);
    expect(choiceCost(Int32Array.of(1, 0), relevance, best)).toBe(0);
    expect(describeChoiceCost(0)).toBe('These choices cost nothing in predicted relevance: no list for this audience is more relevant.');
  });

  it('is above 0 when a dial puts a less relevant item in: 1 − (0.9 + 0.2) / 1.7', () => {
    // A popularity dial that lifts item 3 (relevance 0.2) over item 1 (0.8): the shelf holds 0.9 + 0.2.
    const cost = choiceCost(Int32Array.of(3, 0), relevance, best);
    expect(cost).toBeCloseTo(1 - 1.1 / 1.7, 12); // 0.3529
    expect(describeChoiceCost(cost)).toBe('These choices cost 35% of predicted relevance against the most relevant list for this audience.');
  });

  it('skips empty slots and counts an item no list could hold as no relevance', () => {
    expect(choiceCost(Int32Array.of(0, -1, 4), relevance, best)).toBeCloseTo(1 - 0.9 / 1.7, 12);
    expect(choiceCost(Int32Array.of(-1, -1), relevance, best)).toBeNaN();
    expect(describeChoiceCost(NaN)).toMatch(/^No trained model/);
  });

  it('is the meter reading of the same name', () => {
    const ctx = context([item(1), item(2), item(3), item(4), item(5)]);
    const inputs = { editionDate: EDITION, relevance, bestRelevance: best, audienceCategories: Float64Array.of(1), ownedShare: new Float64Array(5) };
    expect(meterShelf(ctx, Int32Array.of(3, 0), inputs).choiceCost).toBeCloseTo(1 - 1.1 / 1.7, 12);
    expect(meterShelf(ctx, Int32Array.of(0, 1, 2), inputs).choiceCost).toBe(0);
    const { bestRelevance: _none, ...withoutPrice } = inputs;
    expect(meterShelf(ctx, Int32Array.of(3, 0), withoutPrice).choiceCost).toBeNaN();
  });
});
