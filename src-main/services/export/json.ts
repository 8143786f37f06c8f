/** JSON export of an edition: the snapshot's shelves and slots, each slot saying in words whether it is sponsored, and each shelf's meter. */
import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { DISCLOSURE_NOTE, exportedPercentile, SPONSORED } from './labels.ts';
import { exportedReadings } from './meter-rows.ts';

export function editionJson(e: EditionSnapshot): string {
  const doc = {
    edition: e.edition.label,
    date: e.edition.date,
    publishedAt: e.publishedAt > 0 ? new Date(e.publishedAt).toISOString() : null,
    note: DISCLOSURE_NOTE,
    shelves: e.shelves.map((shelf) => ({
      label: shelf.label,
      slots: shelf.slots.map((s) => ({
        slot: s.slot + 1,
        item: s.externalId,
        title: s.title,
        category: s.category,
        supplier: s.supplier,
        sponsored: s.promoted ? SPONSORED : null,
        pinned: s.pinned,
        percentile: exportedPercentile(s.percentile),
        rank: s.rank ?? null,
      })),
      // Each reading by its one name, on its scale, with its range and the shelf's target band.
      meter:
        exportedReadings(shelf)?.map((r) => ({ reading: r.key, name: r.name, value: r.value, shown: r.text, range: r.range, target: r.target, targetText: r.targetText, status: r.status })) ??
        null,
    })),
  };
  return JSON.stringify(doc, null, 2) + '\n';
}
