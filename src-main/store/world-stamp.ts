import type { Db } from './workspace.ts';

/**
 * What a curation world depends on, read in one query (under a millisecond on the demo shop): the catalogue,
 * the signals, the customers, and the trained models (the newest model id, the current ones and their
 * training times, so a retrain or a rollback to an older model both show), and the taste-group settings.
 * Item flags are weighted by the item's id, so one item going out of stock as another comes back changes the
 * stamp. An item's text or price edited in place is not seen: this runs on every editorial action, and reading
 * every item's fields (as the data fingerprint in models.ts does) costs tens of milliseconds.
 */
const STAMP_SQL = `SELECT (SELECT count(*) FROM item) AS i, (SELECT coalesce(max(id), 0) FROM item) AS mi,
        (SELECT count(*) FROM signal) AS s, (SELECT coalesce(max(id), 0) FROM signal) AS ms,
        (SELECT count(*) FROM customer) AS c,
        (SELECT total(id * (1 + promoted + 2 * available)) FROM item) AS f,
        (SELECT coalesce(max(id), 0) FROM model) AS mm,
        (SELECT min_k || ':' || max_k || ':' || min_history FROM taste_group_settings) AS g,
        (SELECT coalesce(group_concat(id || ':' || name), '') FROM taste_group_name) AS gn,
        (SELECT coalesce(group_concat(id || ':' || trained_at), '') FROM (SELECT id, trained_at FROM model WHERE current = 1 ORDER BY id)) AS cm`;

const stampQuery = new WeakMap<Db, { get(): unknown }>();

/** A string that changes whenever the data a curation world is built from changes (statement prepared once per connection). */
export function readWorldStamp(db: Db): string {
  let q = stampQuery.get(db);
  if (!q) stampQuery.set(db, (q = db.prepare(STAMP_SQL)));
  return JSON.stringify(q.get());
}
