/**
 * Erasure that holds (DESIGN.md "Reliability and safety rules": erasure is final and leaves no bytes).
 *
 * - The erasure generation (migration 005) is raised by every `forget`, inside its transaction. Whatever
 *   reads the data to build something that is stored later (a training run) reads the generation in the
 *   same read transaction, and the transaction that stores the result checks it has not moved: a model
 *   fitted on data read before an erasure is refused, so it cannot bring the erased person back.
 * - After an erasure, `scrubFreedBytes` rewrites the file so the deleted rows leave no bytes behind.
 */
import type { Db } from './workspace.ts';

/** A result built from data read before an erasure; storing it would bring the erased person back. */
export class ErasedSinceReadError extends Error {
  override readonly name = 'ErasedSinceReadError';
}

export function erasureGeneration(db: Db): number {
  return db.prepare("SELECT value FROM workspace_meta WHERE key = 'erasure_generation'").pluck().get() as number;
}

/**
 * Raises the generation and marks the freed bytes as still to be scrubbed; call it inside the erasing
 * transaction, so readers see the erasure and the new generation together or neither.
 */
export function raiseErasureGeneration(db: Db): number {
  db.prepare("UPDATE workspace_meta SET value = 1 WHERE key = 'scrub_pending'").run();
  return db.prepare("UPDATE workspace_meta SET value = value + 1 WHERE key = 'erasure_generation' RETURNING value").pluck().get() as number;
}

/**
 * Runs `save` in one immediate transaction (the write lock is held from the check to the commit, so no
 * erasure can slip in between), after checking that no erasure happened since the data was read at
 * generation `readAt`. Otherwise nothing is written and ErasedSinceReadError says why.
 *
 * Refuse rather than restart: the run already spent its time on the erased person's data, erasures are
 * rare, and a silent restart could loop while erasures keep coming; the editor sees why and trains again.
 */
export function saveUnlessErasedSince<T>(db: Db, readAt: number, what: string, save: () => T): T {
  return db
    .transaction(() => {
      assertNotErasedSince(db, readAt, what);
      return save();
    })
    .immediate();
}

/** Throws ErasedSinceReadError when an erasure happened since generation `readAt`; call it inside the saving write transaction. */
export function assertNotErasedSince(db: Db, readAt: number, what: string): void {
  if (erasureGeneration(db) !== readAt) {
    throw new ErasedSinceReadError(
      `a customer was erased (forget) while ${what} ran, after it had read the data: nothing was saved, ` +
        `since the result was built from the erased person's data. Run it again.`,
    );
  }
}

export interface ScrubReport {
  /** The file was rewritten without free pages (VACUUM). */
  vacuumed: boolean;
  /** The write-ahead log was copied into the file and cut to zero bytes. */
  walTruncated: boolean;
}

/**
 * Leaves no bytes of deleted rows in the file or its write-ahead log (SQLite docs: "PRAGMA secure_delete",
 * "VACUUM", "PRAGMA wal_checkpoint(TRUNCATE)"). secure_delete (set at open, store/workspace.ts) zeroes
 * content as it is deleted; VACUUM rebuilds the file so no free page or stale cell remains; the TRUNCATE
 * checkpoint copies the rebuilt pages into the file and empties the log, which otherwise still holds the
 * pages as they were before (the erased rows among them).
 *
 * Must run outside any transaction. The checkpoint waits (busy_timeout) for other connections still
 * reading an older snapshot; if one is still reading after that, the log cannot be emptied yet and
 * `walTruncated` is false (SQLite empties it when the last connection closes, or at the next scrub).
 */
export function scrubFreedBytes(db: Db): ScrubReport {
  db.exec('VACUUM');
  const [r] = db.pragma('wal_checkpoint(TRUNCATE)') as { busy: number; log: number; checkpointed: number }[];
  const walTruncated = r !== undefined && r.busy === 0 && r.log === 0;
  // Cleared only once the log is empty; this small write holds no erased byte (they were zeroed and vacuumed).
  if (walTruncated) db.prepare("UPDATE workspace_meta SET value = 0 WHERE key = 'scrub_pending'").run();
  return { vacuumed: true, walTruncated };
}

/**
 * Finishes an erasure's scrub that another connection's read held up (`scrubFreedBytes` returned
 * walTruncated false). Called where such a reader has just gone: when a training run ends, and when a
 * workspace is opened for writing. Does nothing when no scrub is pending, or inside a transaction. Never
 * throws: a scrub that fails (a full disk) must not fail the opening or the training that called it; it
 * stays pending and is tried again at the next of those.
 */
export function scrubIfPending(db: Db): ScrubReport | null {
  if (db.inTransaction) return null;
  const pending = db.prepare("SELECT value FROM workspace_meta WHERE key = 'scrub_pending'").pluck().get() as number | undefined;
  if (pending !== 1) return null;
  try {
    return scrubFreedBytes(db);
  } catch {
    return { vacuumed: false, walTruncated: false };
  }
}

const REMOVED = '[removed: it named an erased customer]';

/**
 * Removes an erased customer's id from the import log, which keeps each import's report (its first
 * error messages quote cells, e.g. "unknown customer 'C-7'") and the imported file's name. Any text that
 * contains the id is replaced whole, not just the id within it: a short id ("7") is part of many
 * unrelated texts, and a half-edited message could still point at the person. Line and column numbers
 * and the counts stay. Returns how many log rows changed. Call it inside the erasing transaction.
 */
export function scrubImportLog(db: Db, externalId: string): number {
  const rows = db.prepare('SELECT id, file, report FROM import_log').all() as { id: number; file: string; report: string }[];
  const update = db.prepare('UPDATE import_log SET file = ?, report = ? WHERE id = ?');
  let changed = 0;
  for (const row of rows) {
    const scrub = (v: unknown): unknown => {
      if (typeof v === 'string') return v.includes(externalId) ? REMOVED : v;
      if (Array.isArray(v)) return v.map(scrub);
      if (v !== null && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, scrub(x)]));
      return v;
    };
    const file = scrub(row.file) as string;
    const report = JSON.stringify(scrub(JSON.parse(row.report) as unknown));
    if (file !== row.file || report !== row.report) {
      update.run(file, report, row.id);
      changed++;
    }
  }
  return changed;
}

/**
 * Deletes a customer's signals and then the customer row (signals reference it). Returns how many signals went,
 * or null when no customer has that id (nothing is changed). Call it inside the erasing transaction.
 */
export function deleteCustomerAndSignals(db: Db, externalId: string): { signals: number } | null {
  const row = db.prepare('SELECT id FROM customer WHERE external_id = ?').get(externalId) as { id: number } | undefined;
  if (!row) return null;
  const signals = db.prepare('DELETE FROM signal WHERE customer_id = ?').run(row.id).changes;
  db.prepare('DELETE FROM customer WHERE id = ?').run(row.id);
  return { signals };
}

/** Deletes every stored model of the given kinds; returns the kinds that had at least one (unsorted). */
export function deleteModelsOfKinds(db: Db, kinds: readonly string[]): string[] {
  if (kinds.length === 0) return [];
  const list = kinds.map(() => '?').join(',');
  const found = db.prepare(`SELECT DISTINCT kind FROM model WHERE kind IN (${list})`).pluck().all(...kinds) as string[];
  db.prepare(`DELETE FROM model WHERE kind IN (${list})`).run(...kinds);
  return found;
}
