/**
 * The taste-group settings and names an editor keeps (schema 7). Members are stored by customer row id,
 * so they cascade with `forget`.
 */
import { checkSettings, GROUP_DEFAULTS, type GroupSettings } from '../core/audience/taste-groups.ts';
import type { Db } from './workspace.ts';

export function readGroupSettings(db: Db): GroupSettings {
  const r = db.prepare('SELECT min_k AS minK, max_k AS maxK, min_history AS minHistory FROM taste_group_settings WHERE id = 1').get() as GroupSettings | undefined;
  return r ? { minK: r.minK, maxK: r.maxK, minHistory: r.minHistory } : { ...GROUP_DEFAULTS };
}

/** Checks, then saves; bad settings change nothing. */
export function writeGroupSettings(db: Db, s: GroupSettings): void {
  checkSettings(s);
  db.transaction(() => {
    db.prepare('INSERT INTO taste_group_settings (id, min_k, max_k, min_history) VALUES (1, ?, ?, ?) ON CONFLICT(id) DO UPDATE SET min_k = excluded.min_k, max_k = excluded.max_k, min_history = excluded.min_history').run(s.minK, s.maxK, s.minHistory);
  })();
}

export interface StoredGroupName {
  name: string;
  /** Customer row ids (customer.id). */
  members: number[];
}

export function readGroupNames(db: Db): StoredGroupName[] {
  const names = db.prepare('SELECT id, name FROM taste_group_name ORDER BY name').all() as { id: number; name: string }[];
  const members = db.prepare('SELECT customer_id AS c FROM taste_group_member WHERE name_id = ? ORDER BY customer_id').pluck();
  return names.map((n) => ({ name: n.name, members: members.all(n.id) as number[] }));
}

/** Names a set of customers, replacing any name given before to `replacing` and any earlier use of `name`. */
export function writeGroupName(db: Db, name: string, customerIds: ArrayLike<number>, replacing: string | null): void {
  db.transaction(() => {
    const del = db.prepare('DELETE FROM taste_group_name WHERE name = ?');
    del.run(name);
    if (replacing !== null) del.run(replacing);
    const id = Number(db.prepare('INSERT INTO taste_group_name (name) VALUES (?)').run(name).lastInsertRowid);
    const ins = db.prepare('INSERT INTO taste_group_member (name_id, customer_id) VALUES (?, ?)');
    for (let i = 0; i < customerIds.length; i++) ins.run(id, customerIds[i]);
  })();
}

export function deleteGroupName(db: Db, name: string): boolean {
  return db.transaction(() => db.prepare('DELETE FROM taste_group_name WHERE name = ?').run(name).changes > 0)();
}

/** What the groups depend on besides the models (for the curation world's stamp). */
export function groupSettingsStamp(db: Db): string {
  const s = readGroupSettings(db);
  return `${s.minK}:${s.maxK}:${s.minHistory}`;
}
