/**
 * The edition meter (DESIGN.md "Meter readings"): distinct items, overlaps between shelves and how
 * evenly exposure is shared among suppliers.
 */
import { log2Discounts } from '../metrics/discount.ts';
import { gini } from '../stats/gini.ts';
import type { CurationContext } from './context.ts';
import type { EditionMeter } from './types.ts';

export interface EditionMeterOptions {
  /**
   * Which suppliers the Gini runs over. 'featured' (default): those with at least one slot in the
   * edition. It answers "is the exposure we give concentrated on a few of the suppliers we feature?".
   * 'catalogue': every supplier with an available item, zeros included. With a few dozen slots and
   * hundreds of suppliers that reading sits near 1 whatever the editor does, so it is opt-in.
   */
  suppliers?: 'featured' | 'catalogue';
}

/**
 * Shelves are slot arrays (-1 = empty). Overlaps list only pairs (a < b, shelf indices) that share at
 * least one item. Supplier exposure = Σ over its slots on every shelf of 1/log2(r + 1) (rank r within
 * the shelf), the same discount as the promoted-exposure reading. Gini over no exposure is NaN.
 */
export function meterEdition(
  ctx: CurationContext,
  shelves: readonly Int32Array[],
  options: EditionMeterOptions = {},
): EditionMeter {
  const distinct = new Set<number>();
  const sets = shelves.map((slots) => {
    const s = new Set<number>();
    for (const i of slots) if (i >= 0) s.add(i);
    for (const i of s) distinct.add(i);
    return s;
  });
  const overlaps: { a: number; b: number; shared: number }[] = [];
  for (let a = 0; a < sets.length; a++) {
    for (let b = a + 1; b < sets.length; b++) {
      let shared = 0;
      for (const i of sets[a] as Set<number>) if ((sets[b] as Set<number>).has(i)) shared++;
      if (shared > 0) overlaps.push({ a, b, shared });
    }
  }
  const exposure = new Float64Array(ctx.facets.supplier.values.length);
  const featured = new Uint8Array(exposure.length);
  for (const slots of shelves) {
    const disc = log2Discounts(slots.length);
    for (let s = 0; s < slots.length; s++) {
      const i = slots[s] as number;
      if (i < 0) continue;
      const sup = ctx.supplier[i] as number;
      exposure[sup] = (exposure[sup] as number) + (disc[s] as number);
      featured[sup] = 1;
    }
  }
  if ((options.suppliers ?? 'featured') === 'catalogue') {
    for (let i = 0; i < ctx.n; i++) if (ctx.available[i] === 1) featured[ctx.supplier[i] as number] = 1;
  }
  const values: number[] = [];
  for (let sup = 0; sup < exposure.length; sup++) if (featured[sup] === 1) values.push(exposure[sup] as number);
  return { distinctItems: distinct.size, overlaps, supplierExposureGini: gini(values) };
}
