import type { SignalKind } from '../core/types.ts';
import type { Db } from './workspace.ts';

/** A workspace at a glance, for the overview screen and `shelfwright stats`. Times are unix ms UTC. */
export interface WorkspaceStats {
  items: number;
  customers: number;
  signals: number;
  availableItems: number;
  promotedItems: number;
  /** Earliest and latest signal time; null when no signal has a time. */
  firstSignalAt: number | null;
  lastSignalAt: number | null;
  /** signals / (customers x items); 0 for an empty workspace. Repeats of one pair count each time. */
  density: number;
  signalsByKind: Partial<Record<SignalKind, number>>;
  topCategoriesByItems: { category: string; items: number }[];
  topCategoriesBySignals: { category: string; signals: number }[];
  /** See `longTailShare` below; null when there are no signals. */
  longTailShare: number | null;
  /** Items that no signal names (cold start for collaborative models). */
  coldItems: number;
  /** When the last committed import finished; null when nothing was imported. */
  lastImportAt: number | null;
}

export const TOP_CATEGORIES = 10;
/** The "head" of the catalogue: the most-interacted 20% of items (the 80/20 cut, common practice, no source). */
export const HEAD_SHARE = 0.2;

export function workspaceStats(db: Db): WorkspaceStats {
  const one = <T>(sql: string): T => db.prepare(sql).pluck().get() as T;
  const items = one<number>('SELECT count(*) FROM item');
  const customers = one<number>('SELECT count(*) FROM customer');
  const signals = one<number>('SELECT count(*) FROM signal');
  const range = db.prepare('SELECT min(at) AS lo, max(at) AS hi FROM signal').get() as { lo: number | null; hi: number | null };
  const byKind: Partial<Record<SignalKind, number>> = {};
  const byKindSql = 'SELECT k.name AS kind, n FROM (SELECT kind, count(*) AS n FROM signal GROUP BY kind) JOIN signal_kind k ON k.code = kind ORDER BY k.name';
  for (const r of db.prepare(byKindSql).all() as { kind: SignalKind; n: number }[]) {
    byKind[r.kind] = r.n;
  }
  return {
    items,
    customers,
    signals,
    availableItems: one<number>('SELECT count(*) FROM item WHERE available = 1'),
    promotedItems: one<number>('SELECT count(*) FROM item WHERE promoted = 1'),
    firstSignalAt: range.lo,
    lastSignalAt: range.hi,
    density: customers > 0 && items > 0 ? signals / (customers * items) : 0,
    signalsByKind: byKind,
    topCategoriesByItems: db
      .prepare('SELECT category, count(*) AS items FROM item GROUP BY category ORDER BY items DESC, category LIMIT ?')
      .all(TOP_CATEGORIES) as { category: string; items: number }[],
    topCategoriesBySignals: db
      .prepare(
        'SELECT i.category AS category, count(*) AS signals FROM signal s JOIN item i ON i.id = s.item_id ' +
          'GROUP BY i.category ORDER BY signals DESC, category LIMIT ?',
      )
      .all(TOP_CATEGORIES) as { category: string; signals: number }[],
    longTailShare: longTailShare(db, items, signals),
    // Leads with item_id, so the identity index answers this by item (migration 004).
    coldItems: one<number>('SELECT count(*) FROM item WHERE NOT EXISTS (SELECT 1 FROM signal s WHERE s.item_id = item.id)'),
    lastImportAt: one<number | null>('SELECT max(at) FROM import_log'),
  };
}

/**
 * Long-tail share: the share of all signals that go to items outside the head, where the head is the
 * ceil(20%) of the whole catalogue (cold items included) with the most signals, ties broken by lower row id.
 * 0 means every signal lands on the head; with uniform interest it tends to 0.8.
 */
function longTailShare(db: Db, items: number, signals: number): number | null {
  if (signals === 0) return null;
  const head = Math.ceil(items * HEAD_SHARE);
  const headSignals = db
    .prepare(
      'SELECT coalesce(sum(n), 0) FROM (SELECT count(*) AS n FROM signal GROUP BY item_id ORDER BY n DESC, item_id LIMIT ?)',
    )
    .pluck()
    .get(head) as number;
  return (signals - headSignals) / signals;
}

/** The three row counts a title bar shows; cheap (no scan beyond SQLite's count). */
export function countWorkspaceRows(db: Db): { items: number; customers: number; signals: number } {
  const count = (table: 'item' | 'customer' | 'signal') => db.prepare(`SELECT count(*) FROM ${table}`).pluck().get() as number;
  return { items: count('item'), customers: count('customer'), signals: count('signal') };
}

/** How many signals there are and how many carry a time (`at` is NULL for a signal without one). */
export function signalTimeCoverage(db: Db): { signals: number; timed: number } {
  return db.prepare('SELECT count(*) AS signals, count(at) AS timed FROM signal').get() as { signals: number; timed: number };
}

/** The three counts a training's cost is predicted from (services/train/outlook.ts): no scan beyond count(*). */
export function trainingSizes(db: Db): { items: number; customers: number; signals: number } {
  const one = (sql: string): number => db.prepare(sql).pluck().get() as number;
  return { items: one('SELECT count(*) FROM item'), customers: one('SELECT count(*) FROM customer'), signals: one('SELECT count(*) FROM signal') };
}
