import type { ModelRecord } from '../../store/models.ts';
import { dataFingerprint, ModelRepo } from '../../store/models.ts';
import { assertNotErasedSince } from '../../store/erasure.ts';
import type { Db } from '../../store/workspace.ts';
import { beginWriteAsync, endWrite, type WaitListener } from '../../store/write-lock.ts';

export interface SavedRun {
  ids: number[];
  /** The workspace's data changed while the run trained: the models are saved, and read as stale. */
  stale: boolean;
}

/** Said in the run's notes when the data changed under it. */
export const STALE_NOTE =
  "the workspace's data changed while these models trained (another process imported or erased data): they were " +
  'saved, marked stale; train again to bring them up to date';

/**
 * Stores a finished run. Minutes of training are not thrown away because another process (an import) holds
 * the write lock: the save waits for it, as long as it takes, until cancelled. The stale flag needs no
 * column: a model is stale when its fingerprint (the data the run read) differs from the workspace's
 * (store/models.ts `modelStatus`), so saving the run's own fingerprint marks it; this only notices it, inside
 * the same write transaction, so the answer cannot change before the commit.
 *
 * An erasure is not a change to wait out: if a customer was erased since the run read its data (generation
 * `readAt`), nothing is saved (ErasedSinceReadError, store/erasure.ts), since the models hold the erased
 * person's data.
 */
export async function saveRun(
  db: Db,
  records: readonly ModelRecord[],
  fingerprint: string,
  readAt: number,
  o: { keepHistory?: number; signal?: AbortSignal; onWait?: WaitListener; alsoStore?: (ids: number[]) => void } = {},
): Promise<SavedRun> {
  await beginWriteAsync(db, {
    waitMs: Infinity,
    work: 'saving trained models',
    ...(o.signal && { signal: o.signal }),
    ...(o.onWait && { onWait: o.onWait }),
  });
  try {
    assertNotErasedSince(db, readAt, 'training');
    const stale = dataFingerprint(db) !== fingerprint;
    const ids = new ModelRepo(db, o.keepHistory ?? 1).saveAll(records);
    o.alsoStore?.(ids); // what belongs with these models (their validated blend) commits with them
    endWrite(db, true);
    return { ids, stale };
  } catch (e) {
    endWrite(db, false);
    throw e;
  }
}
