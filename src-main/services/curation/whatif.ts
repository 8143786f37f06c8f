/**
 * What-if for one slot of a shelf: the best pool candidates not already on the shelf, each with the change
 * it would make to every meter reading if placed there (core/curation/whatif.ts does the arithmetic).
 */
import { WHAT_IF_READINGS, type ShelfReadings, type WhatIfReading } from '../../core/curation/types.ts';
import { whatIfBatch } from '../../core/curation/whatif.ts';
import { InputError } from '../../core/errors.ts';
import type { Reason } from '../../core/curation/reasons.ts';
import type { CurationService } from './service.ts';
import { fillAndMeter, readShelf } from './shelf-fill.ts';

export interface WhatIfView {
  slot: number;
  before: ShelfReadings;
  candidates: { item: string; title: string; promoted: boolean; percentile: number; rank: number; reason: Reason | null; delta: ShelfReadings }[];
}

/** `slot` is 1-based; `n` candidates, best first by boosted score. Reads only. */
export function shelfWhatIf(svc: CurationService, edition: string, label: string, slot: number, n = 20): WhatIfView {
  const world = svc.world();
  const e = svc.editions.byLabel(edition);
  const shelf = svc.shelves.byLabel(e.id, label);
  if (!Number.isInteger(slot) || slot < 1 || slot > shelf.size) {
    throw new InputError(`slot: must be between 1 and ${shelf.size}, got ${slot}`, { column: 'slot' });
  }
  const filled = fillAndMeter(world, shelf, e, readShelf(svc.db, shelf, e), svc.editsOf(shelf), false);
  const on = new Set(filled.dense);
  const picks = filled.ranked().filter((c) => !on.has(c.index)).slice(0, n);
  const batch = whatIfBatch(world.ctx, filled.dense, slot - 1, Int32Array.from(picks, (c) => c.index), filled.inputs);
  const items = world.ds.items;
  return {
    slot,
    before: batch.before,
    candidates: picks.map((c, q) => {
      const delta = {} as Record<WhatIfReading, number>;
      for (const r of WHAT_IF_READINGS) delta[r] = batch.delta[r][q]!;
      const it = items[c.index]!;
      return { item: it.externalId, title: it.title, promoted: it.promoted, percentile: c.percentile, rank: c.rank, reason: filled.explain(c.index).reason, delta };
    }),
  };
}
