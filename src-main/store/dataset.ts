import type { Dataset } from '../core/types.ts';
import { ItemRepo } from './items.ts';
import type { Db } from './workspace.ts';

/**
 * Loads everything the models train on, densely indexed: items in id order, customers in id order,
 * signals as typed-array columns. Signals are streamed with `iterate()` and `raw()` so a few million
 * rows cost their typed arrays and nothing per row.
 */
export function loadDataset(db: Db): Dataset {
  // One snapshot for the counts and every page of signals (a deferred read: it takes no write lock).
  if (!db.inTransaction) return db.transaction(() => loadDataset(db)).deferred();
  const items = new ItemRepo(db).all();
  const itemIndex = denseIndex(Int32Array.from(items, (it) => it.id));

  const customers = db.prepare('SELECT id, external_id FROM customer ORDER BY id').raw().all() as [number, string][];
  const customerIds = new Int32Array(customers.length);
  const customerExternalIds: string[] = new Array<string>(customers.length);
  customers.forEach(([id, ext], i) => {
    customerIds[i] = id;
    customerExternalIds[i] = ext;
  });
  const customerIndex = denseIndex(customerIds);

  const n = (db.prepare('SELECT count(*) FROM signal').pluck().get() as number) ?? 0;
  const customer = new Int32Array(n);
  const item = new Int32Array(n);
  const kind = new Uint8Array(n);
  const value = new Float32Array(n);
  const at = new Float64Array(n);
  // Read in row-id order by pages of rows: one call per page, where iterate() paid a step into the engine per row.
  const page = db.prepare('SELECT id, customer_id, item_id, kind, value, at FROM signal WHERE id > ? ORDER BY id LIMIT 65536').raw();
  let k = 0;
  let after = -1;
  for (;;) {
    const rows = page.all(after) as [number, number, number, number, number, number | null][];
    for (const row of rows) {
      customer[k] = customerIndex(row[1]);
      item[k] = itemIndex(row[2]);
      kind[k] = row[3]; // stored as the SIGNAL_KINDS code (migration 004)
      value[k] = row[4];
      at[k] = row[5] ?? Number.NaN;
      k++;
    }
    if (rows.length < 65536) break;
    after = rows[rows.length - 1]![0];
  }
  return {
    items,
    customerIds,
    customerExternalIds,
    signals: { length: k, customer, item, kind, value, at },
  };
}

/**
 * Row id -> dense index. Row ids are ascending integers, dense unless many rows were deleted: a typed array over
 * 0..max id is a load and a compare per signal where a Map's hashing cost a third of loading a large log; ids
 * spread too thinly (max id over 4 × count + 1M) fall back to a Map.
 */
function denseIndex(ids: Int32Array): (id: number) => number {
  let max = 0;
  for (let i = 0; i < ids.length; i++) if (ids[i]! > max) max = ids[i]!;
  if (max <= 4 * ids.length + 1_000_000) {
    const at = new Int32Array(max + 1).fill(-1);
    ids.forEach((id, i) => (at[id] = i));
    return (id) => at[id]!;
  }
  const map = new Map<number, number>();
  ids.forEach((id, i) => map.set(id, i));
  return (id) => map.get(id)!;
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
