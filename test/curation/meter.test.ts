import { describe, expect, it } from 'vitest';
import { buildCurationContext } from '../../src-main/core/curation/context.ts';
import { intraListDistance, meterShelf, promotedShares } from '../../src-main/core/curation/meter.ts';
import { log2Discounts } from '../../src-main/core/metrics/discount.ts';
import { context, EDITION, item } from './helpers.ts';

const DAY = 86_400_000;

describe('intraListDistance', () => {
  it('is the mean pairwise 1 − cosine, worked by hand', () => {
    // Ziegler, McNee, Konstan & Lausen (2005), intra-list similarity, read as a distance: mean over pairs
    // of 1 − cos. A = (1, 0), B = (0.8, 0.6), C = (0, 1): cos AB 0.8, AC 0, BC 0.6 → distances 0.2, 1, 0.4;
    // mean 1.6 / 3 = 0.5333. The empty slot is skipped; fewer than two items → NaN.
    const ctx = context([item(1), item(2), item(3)], [[1, 0], [0.8, 0.6], [0, 1]]);
    expect(intraListDistance(ctx, Int32Array.of(0, -1, 2, 1))).toBeCloseTo(1.6 / 3, 6);
    expect(intraListDistance(ctx, Int32Array.of(0, -1))).toBeNaN();
  });
});

describe('promotedShares', () => {
  it('weighs slots by the DCG discount 1, 1/log2 3, 1/2, 1/log2 5', () => {
    // Järvelin & Kekäläinen (2002): the discount of rank r is 1/log2(r + 1) → 1, 0.6309, 0.5, 0.4307.
    expect(Array.from(log2Discounts(4))).toEqual([1, 1 / Math.log2(3), 0.5, 1 / Math.log2(5)]);
    const ctx = context([item(1, { promoted: true }), item(2), item(3, { promoted: true }), item(4)]);
    const shares = promotedShares(ctx, Int32Array.of(0, 1, 2, 3));
    expect(shares.count).toBe(0.5);
    expect(shares.exposure).toBeCloseTo(1.5 / (1 + 1 / Math.log2(3) + 0.5 + 1 / Math.log2(5)), 12);
    expect(shares.exposure).toBeCloseTo(0.58557, 5);
  });
});

describe('meterShelf', () => {
  const items = [
    item(1, { addedAt: EDITION - 10 * DAY, category: 'Lamps' }),
    item(2, { addedAt: EDITION - 20 * DAY, category: 'Lamps', promoted: true }),
    item(3, { addedAt: EDITION - 40 * DAY, category: 'Rugs' }),
    item(4, { addedAt: EDITION - 100 * DAY, category: 'Lamps' }),
    item(5, { addedAt: null, category: 'Lamps' }),
  ];
  const ctx = buildCurationContext(items, {
    vectors: Float32Array.of(1, 0, 0.8, 0.6, 0, 1, 0.6, 0.8, 1, 1),
    dim: 2,
    popularity: [0.5, 0.25, 0.125, 0.5, 0.25],
  });
  const inputs = {
    editionDate: EDITION,
    relevance: Float64Array.of(0.9, 0.7, NaN, 0.5, 0.1),
    audienceCategories: Float64Array.of(1, 1),
    ownedShare: Float64Array.of(0.6, 0.2, 0.5, 0.9, 0),
  };

  it('reads a four-item shelf as worked by hand', () => {
    const m = meterShelf(ctx, Int32Array.of(0, 1, 2, 3), inputs);
    // Ages 10, 20, 40, 100 days: median (20 + 40)/2 = 30, mean 42.5, two of four under 30 days.
    expect(m.age).toEqual({ medianDays: 30, meanDays: 42.5, newestDays: 10, oldestDays: 100, shareUnder30Days: 0.5 });
    // Zhou et al. (2010): self-information −log2 p = 1, 2, 3, 1 → mean 1.75 bits. The ceiling is −log2 of
    // the floor, half the smallest share (0.125 / 2 → 4 bits), so novelty on [0, 1] is 1.75 / 4.
    expect(m.noveltyBits).toBeCloseTo(1.75, 12);
    expect(m.novelty).toBeCloseTo(1.75 / 4, 12);
    expect(m.promotedShareCount).toBe(0.25);
    expect(m.promotedShareExposure).toBeCloseTo(
      1 / Math.log2(3) / (1 + 1 / Math.log2(3) + 0.5 + 1 / Math.log2(5)),
      12,
    );
    // Steck (2018), α = 0.01: audience (0.5, 0.5), shelf 3 Lamps : 1 Rug = (0.75, 0.25); by hand 0.140535
    // nats, over the ceiling ln(1/α) = ln 100 = 4.605170 → 0.030517.
    expect(m.calibrationGap).toBeCloseTo(0.140535 / Math.log(100), 6);
    expect(m.categoryMix).toEqual([
      { category: 'Lamps', shelf: 0.75, audience: 0.5 },
      { category: 'Rugs', shelf: 0.25, audience: 0.5 },
    ]);
    // Ages 10, 20, 40, 100 days → bins under 1 week, 1–4 weeks (10, 20), 1–3 months (40), 3–12 months (100).
    expect(m.ageHistogram).toEqual([0, 2, 1, 1, 0]);
    // Relevance of the scored items only (the Rug is outside the pool): (0.9 + 0.7 + 0.5) / 3.
    expect(m.predictedRelevance).toBeCloseTo(0.7, 12);
    expect(m.saturation).toEqual([0.6, 0.2, 0.5, 0.9]);
    // Strictly above 0.5: 0.5 itself is not flagged.
    expect(m.saturatedSlots).toEqual([0, 3]);
    // cos: AB .8, AC 0, AD .6, BC .6, BD .96, CD .8 → mean distance (0.2 + 1 + 0.4 + 0.4 + 0.04 + 0.2) / 6,
    // halved onto [0, 1] as variety.
    expect(m.intraListDistance).toBeCloseTo(2.24 / 12, 6);
  });

  it('skips unknown dates and empty slots, and gives NaN where there is no data', () => {
    const m = meterShelf(ctx, Int32Array.of(4, -1, 0), inputs);
    expect(m.age.medianDays).toBe(10);
    expect(m.saturation[1]).toBeNaN();
    const empty = meterShelf(ctx, Int32Array.of(-1, -1), inputs);
    expect(empty.intraListDistance).toBeNaN();
    expect(empty.age.medianDays).toBeNaN();
    expect(empty.age.newestDays).toBeNaN();
    expect(empty.novelty).toBeNaN();
    expect(empty.promotedShareCount).toBeNaN();
    expect(empty.promotedShareExposure).toBeNaN();
    expect(empty.calibrationGap).toBeNaN();
    expect(empty.predictedRelevance).toBeNaN();
    expect(empty.saturatedSlots).toEqual([]);
  });
});
