/**
 * Erasing one customer on request (DESIGN.md "Customer data stays on the machine; a customer's data can be
 * erased on request": erasure is final and leaves no bytes). One transaction removes the customer's
 * signals and the customer row, deletes stored models that hold a row per customer (iALS keeps a factor
 * vector for every customer, so the person's factors live inside its bytes), removes the id from the
 * import log, and raises the erasure generation, so a training run that read the data before this moment
 * cannot store its models afterwards (store/erasure.ts). Every other model is left in place and reads as
 * stale, since the data fingerprint (store/models.ts) covers the signal and customer tables and no longer
 * matches. Published editions hold items only, never customers, so history is untouched.
 *
 * Then the file is rewritten (VACUUM) and its write-ahead log emptied, so the deleted rows leave no bytes
 * in the workspace's files. Copies made outside the tool (backups, exports of the source systems) are out
 * of its reach; the README's "Responsible use" says so.
 */
import { BugError, NotFoundError } from '../core/errors.ts';
import { refuseWhileAppWrites } from '../store/write-lock.ts';
import { deleteCustomerAndSignals, deleteModelsOfKinds, raiseErasureGeneration, scrubFreedBytes, scrubImportLog } from '../store/erasure.ts';
import { dataFingerprint, ModelRepo } from '../store/models.ts';
import type { Db } from '../store/workspace.ts';

export interface ForgetReport {
  customer: string;
  signals: number;
  /** Model kinds deleted because they held a row for this customer. */
  modelsDeleted: string[];
  /** Model kinds kept but now stale (retrain to bring them up to date). */
  modelsStale: string[];
  /** Import log entries whose file name or messages named the customer, now replaced. */
  importLogScrubbed: number;
  /** The file was rewritten and its write-ahead log emptied: no byte of the erased rows is left. */
  bytesRemoved: boolean;
  /** What was done, in a sentence an editor reads. */
  message: string;
}

/**
 * Model kinds whose stored bytes include per-customer data. An iALS model imported from a cluster
 * (services/cluster/import-model.ts) is stored as kind 'ials' with a factor row per customer, so it is
 * deleted here too; its id map stays in the export folder, outside the workspace, and `import model`
 * refuses a model fitted on signals exported before an erasure.
 */
const PER_CUSTOMER_KINDS = ['ials'];

const NAMES: Record<string, string> = { ials: 'iALS', itemknn: 'item-kNN', ease: 'EASE', content: 'content', popularity: 'popularity' };
const named = (kinds: string[]) => kinds.map((k) => NAMES[k] ?? k).join(', ');

export function forgetCustomer(db: Db, externalId: string): ForgetReport {
  refuseWhileAppWrites(db); // this app's import still writing: busy, not a bug
  // VACUUM cannot run inside a transaction; a caller that wraps this in one is a bug, not user input.
  if (db.inTransaction) throw new BugError('forgetCustomer must not run inside a transaction');
  const erased = db.transaction(() => eraseCustomerRows(db, externalId))();
  // The erasure has committed; a scrub that fails (a full disk) stays pending (store/erasure.ts) and is said so.
  let lingering: string | null;
  try {
    lingering = scrubFreedBytes(db).walTruncated
      ? null
      : 'another program is still reading the workspace, so the erased rows may linger in its log file until that reading is over (the next training run or opening of the workspace clears it)';
  } catch (e) {
    lingering = `the file could not be rewritten (${(e as Error).message}), so the erased rows may linger in its free space until it is next opened`;
  }
  return { customer: externalId, ...erased, bytesRemoved: lingering === null, message: describe(externalId, erased, lingering) };
}

/**
 * The transactional part of an erasure: the customer's signals and row, per-customer models, the import log's
 * mentions and the erasure generation. Runs inside the caller's write transaction; `forgetCustomer` wraps it
 * in one and then scrubs the freed bytes, which must happen after the commit.
 */
export function eraseCustomerRows(db: Db, externalId: string): Omit<ForgetReport, 'customer' | 'bytesRemoved' | 'message'> {
  const deleted = deleteCustomerAndSignals(db, externalId);
  if (!deleted) throw new NotFoundError(`no customer with id '${externalId}'`);
  const { signals } = deleted;
  const kinds = deleteModelsOfKinds(db, PER_CUSTOMER_KINDS);
  const importLogScrubbed = scrubImportLog(db, externalId);
  raiseErasureGeneration(db);
  const now = dataFingerprint(db);
  const stale = new ModelRepo(db)
    .list()
    .filter((m) => m.current && m.fingerprint !== now)
    .map((m) => m.kind);
  return { signals, modelsDeleted: kinds.sort(), modelsStale: stale.sort(), importLogScrubbed };
}

function describe(customer: string, r: { signals: number; modelsDeleted: string[]; modelsStale: string[] }, lingering: string | null): string {
  const parts = [`erased customer ${customer}: ${r.signals} signal${r.signals === 1 ? '' : 's'} and the customer row`];
  if (r.modelsDeleted.length) parts.push(`deleted the ${named(r.modelsDeleted)} model (it kept a row for every customer)`);
  if (r.modelsStale.length) {
    const one = r.modelsStale.length === 1;
    parts.push(
      `the ${named(r.modelsStale)} model${one ? ' is' : 's are'} out of date until you train again ` +
        `(trained with this customer's signals, though holding no row for them)`,
    );
  }
  parts.push(lingering ?? 'the workspace file was rewritten, so no trace of the erased rows is left in it');
  return parts.join('; ');
}
