import type { Dataset } from '../core/types.ts';
import { ItemRepo } from './items.ts';
import type { Db } from './workspace.ts';

/**
 * Loads everything the models train on, densely indexed: items in id order, customers in id order,
 * signals as typed-array columns. Signals are streamed with `iterate()` and `raw()` so a few million
 * rows cost their typed arrays and nothing per row.
 */
export function loadDataset(db: Db): Dataset {
  const items = new ItemRepo(db).all();
  const itemIndex = new Map<number, number>();
  items.forEach((it, i) => itemIndex.set(it.id, i));

  const customers = db.prepare('SELECT id, external_id FROM customer ORDER BY id').raw().all() as [number, string][];
  const customerIds = new Int32Array(customers.length);
  const customerExternalIds: string[] = new Array<string>(customers.length);
  const customerIndex = new Map<number, number>();
  customers.forEach(([id, ext], i) => {
    customerIds[i] = id;
    customerExternalIds[i] = ext;
    customerIndex.set(id, i);
  });

  const n = (db.prepare('SELECT count(*) FROM signal').pluck().get() as number) ?? 0;
  const customer = new Int32Array(n);
  const item = new Int32Array(n);
  const kind = new Uint8Array(n);
  const value = new Float32Array(n);
  const at = new Float64Array(n);
  const stmt = db.prepare('SELECT customer_id, item_id, kind, value, at FROM signal ORDER BY id').raw();
  let k = 0;
  for (const row of stmt.iterate() as IterableIterator<[number, number, number, number, number | null]>) {
    customer[k] = customerIndex.get(row[0])!;
    item[k] = itemIndex.get(row[1])!;
    kind[k] = row[2]; // stored as the SIGNAL_KINDS code (migration 004)
    value[k] = row[3];
    at[k] = row[4] ?? Number.NaN;
    k++;
  }
  return {
    items,
    customerIds,
    customerExternalIds,
    signals: { length: k, customer, item, kind, value, at },
  };
}

/**
 * Only the external ids of items and customers, in the dense order every model follows (row id, as
 * `loadDataset` reads them): placing a model's factors needs no titles.
 */
export function externalIdsInModelOrder(db: Db): { items: string[]; customers: string[] } {
  const items = db.prepare('SELECT external_id FROM item ORDER BY id').pluck().all() as string[];
  const customers = db.prepare('SELECT external_id FROM customer ORDER BY id').pluck().all() as string[];
  return { items, customers };
}
