/**
 * Erasing one customer on request (DESIGN.md "Customer data stays on the machine; a customer's data can be
 * erased on request"). One transaction removes the customer's signals and the customer row. Stored
 * models that hold a row per customer (iALS keeps a factor vector for every customer) are deleted too,
 * because the erased person's factors live inside their bytes; every other model is left in place and
 * reads as stale, since the data fingerprint (store/models.ts) covers the signal and customer tables and
 * no longer matches. Published editions hold items only, never customers, so history is untouched.
 */
import { NotFoundError } from '../core/errors.ts';
import { dataFingerprint, ModelRepo } from '../store/models.ts';
import type { Db } from '../store/workspace.ts';

export interface ForgetReport {
  customer: string;
  signals: number;
  /** Model kinds deleted because they held a row for this customer. */
  modelsDeleted: string[];
  /** Model kinds kept but now stale (retrain to bring them up to date). */
  modelsStale: string[];
}

/** Model kinds whose stored bytes include per-customer data. */
const PER_CUSTOMER_KINDS = ['ials'];

export function forgetCustomer(db: Db, externalId: string): ForgetReport {
  return db.transaction(() => {
    const row = db.prepare('SELECT id FROM customer WHERE external_id = ?').get(externalId) as { id: number } | undefined;
    if (!row) throw new NotFoundError(`no customer with id '${externalId}'`);
    const signals = db.prepare('DELETE FROM signal WHERE customer_id = ?').run(row.id).changes;
    db.prepare('DELETE FROM customer WHERE id = ?').run(row.id);
    const kinds = db.prepare(`SELECT DISTINCT kind FROM model WHERE kind IN (${PER_CUSTOMER_KINDS.map(() => '?').join(',')})`).pluck().all(...PER_CUSTOMER_KINDS) as string[];
    db.prepare(`DELETE FROM model WHERE kind IN (${PER_CUSTOMER_KINDS.map(() => '?').join(',')})`).run(...PER_CUSTOMER_KINDS);
    const now = dataFingerprint(db);
    const stale = new ModelRepo(db)
      .list()
      .filter((m) => m.current && m.fingerprint !== now)
      .map((m) => m.kind);
    return { customer: externalId, signals, modelsDeleted: kinds.sort(), modelsStale: stale.sort() };
  })();
}
