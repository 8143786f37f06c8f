import { describe, expect, it } from 'vitest';
import { meterShelf } from '../../src-main/core/curation/meter.ts';
import type { MeterInputs } from '../../src-main/core/curation/meter.ts';
import { flatReadings, whatIf, whatIfBatch } from '../../src-main/core/curation/whatif.ts';
import { bestRelevanceSums } from '../../src-main/core/curation/choice-cost.ts';
import { WHAT_IF_READINGS } from '../../src-main/core/curation/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { EDITION, randomContext } from './helpers.ts';

function close(a: number, b: number): boolean {
  return (Number.isNaN(a) && Number.isNaN(b)) || Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

function inputsFor(seed: number, n: number, categories: number): MeterInputs {
  const rng = seededRng(seed);
  const relevance = Float64Array.from({ length: n }, () => (rng.next() < 0.1 ? NaN : rng.next()));
  return {
    editionDate: EDITION,
    relevance,
    // The price of choices is checked against the full meter like every other reading.
    bestRelevance: bestRelevanceSums(relevance, n),
    audienceCategories: Float64Array.from({ length: categories }, () => (rng.next() < 0.2 ? 0 : rng.next())),
    ownedShare: Float64Array.from({ length: n }, () => rng.next()),
  };
}

describe('whatIfBatch', () => {
  it('equals meter(after) − meter(before) computed in full, for every slot and 200 candidates', () => {
    for (const seed of [1, 2, 3]) {
      const ctx = randomContext(seed, 300, 16);
      const inputs = inputsFor(seed, ctx.n, ctx.facets.category.values.length);
      const rng = seededRng(seed + 10);
      const slots = Int32Array.from({ length: 12 }, () => (rng.next() < 0.15 ? -1 : rng.int(ctx.n)));
      const candidates = Int32Array.from({ length: 200 }, () => rng.int(ctx.n));
      candidates[0] = slots.find((i) => i >= 0) ?? 0; // a candidate already on the shelf
      const before = meterShelf(ctx, slots, inputs);
      for (let slot = 0; slot < slots.length; slot++) {
        const batch = whatIfBatch(ctx, slots, slot, candidates, inputs);
        for (let k = 0; k < candidates.length; k++) {
          const afterSlots = slots.slice();
          afterSlots[slot] = candidates[k]!;
          const after = flatReadings(meterShelf(ctx, afterSlots, inputs), slot);
          const b = flatReadings(before, slot);
          for (const r of WHAT_IF_READINGS) {
            const want = after[r] - b[r];
            const got = batch.delta[r][k]!;
            if (!close(got, want)) throw new Error(`seed ${seed} slot ${slot} candidate ${k} ${r}: ${got} vs ${want}`);
            expect(close(batch.after[r][k]!, after[r])).toBe(true);
          }
        }
      }
    }
  });

  it('handles a shelf with one filled slot and a single what-if', () => {
    const ctx = randomContext(9, 20, 4);
    const inputs = inputsFor(9, ctx.n, ctx.facets.category.values.length);
    const slots = Int32Array.of(-1, 3, -1);
    const w = whatIf(ctx, slots, 0, 5, inputs);
    const full = flatReadings(meterShelf(ctx, Int32Array.of(5, 3, -1), inputs), 0);
    for (const r of WHAT_IF_READINGS) expect(close(w.after[r], full[r])).toBe(true);
    // Before: one item, so intra-list distance had no data; the delta is NaN, the after value is not.
    expect(w.delta.intraListDistance).toBeNaN();
    expect(Number.isNaN(w.after.intraListDistance)).toBe(false);
    const replaced = whatIf(ctx, slots, 1, 5, inputs);
    expect(replaced.after.intraListDistance).toBeNaN();
  });
});
