/**
 * Publish: freeze an edition into history (DESIGN.md "publish"). The snapshot keeps, per shelf, its brief,
 * its slots with the item's names and the sponsored flag, scores, the meter and the violations, and the
 * edition meter; the store's triggers then refuse any change to it or to the edition's shelves and slots.
 * Published items feed the rest period of later editions (store/editions.ts lastPublished).
 */
import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { InputError } from '../../core/errors.ts';
import type { CurationService } from './service.ts';

/**
 * The edition as it stands, in snapshot form; `publishedAt` 0 for a draft. Built from one read of each shelf
 * (CurationService.readEdition): the row ids come from the same slots the names and meter were read from.
 */
function snapshotNow(svc: CurationService, label: string, publishedAt: number): EditionSnapshot {
  const { edition, shelves, meter } = svc.readEdition(label);
  return {
    edition: { id: edition.id, label: edition.label, date: edition.date },
    publishedAt,
    editionMeter: meter,
    shelves: shelves.map(({ filled, view: s }) => ({
      label: s.label,
      position: s.position,
      brief: s.brief,
      meter: s.meter,
      violations: s.violations,
      // The view's slots are filled.slots one for one (views.ts shelfView), so slot k is row k.
      slots: filled.slots.map((row, k) => {
        const x = s.slots[k]!;
        return {
          slot: row.slot,
          itemId: row.itemId,
          externalId: x.item,
          title: x.title,
          category: x.category,
          supplier: x.supplier,
          promoted: x.promoted,
          pinned: row.pinned,
          score: row.score,
          percentile: row.percentile,
          rank: x.rank,
        };
      }),
    })),
  };
}

/** Freezes the edition in one transaction and returns its snapshot. */
export function publishEdition(svc: CurationService, label: string): EditionSnapshot {
  return svc.db.transaction(() => {
    const e = svc.editions.byLabel(label);
    if (e.status === 'published') throw new InputError(`edition '${label}' is already published`);
    const snapshot = snapshotNow(svc, label, svc.clock());
    svc.editions.publish(e.id, snapshot.publishedAt, snapshot);
    return snapshot;
  })();
}

/** The frozen snapshot of a published edition, or the current state of a draft in the same form. */
export function editionSnapshot(svc: CurationService, label: string): EditionSnapshot {
  const e = svc.editions.byLabel(label);
  return svc.editions.snapshot(e.id) ?? snapshotNow(svc, label, 0);
}
