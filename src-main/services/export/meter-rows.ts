/**
 * A shelf's meter in an export, by the reading names of core/curation/readings.ts (the app's and the
 * command line's). A meter stored before these scales (an edition published earlier) is left out: null.
 */
import { onCurrentScales, readingRows, type MeterLike, type ReadingRow } from '../../core/curation/readings.ts';
import type { SnapshotShelf } from '../../core/editing/snapshot.ts';

export function exportedReadings(shelf: SnapshotShelf): ReadingRow[] | null {
  if (!onCurrentScales(shelf.meter)) return null;
  return readingRows(shelf.meter as unknown as MeterLike, shelf.brief);
}
