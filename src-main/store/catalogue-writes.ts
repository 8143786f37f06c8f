import type Database from 'better-sqlite3';
import type { AttributeValue, SignalKind } from '../core/types.ts';
import { StringIdTable } from '../core/util/string-id-table.ts';
import { cut, quote } from '../core/util/cut.ts';
import { SignalAppender } from './signal-append.ts';
import type { Db } from './workspace.ts';

/**
 * Bulk writes of the catalogue, customers and signals for the importer. The caller owns the transaction;
 * everything here is synchronous and uses statements prepared once. External id -> row id maps live in
 * memory (StringIdTable) so a signal row costs two lookups and a share of one INSERT, never a SELECT.
 */
export interface ItemWrite {
  externalId: string;
  title?: string;
  description?: string;
  category?: string;
  tags?: string[];
  supplier?: string;
  price?: number | null;
  addedAt?: number | null;
  promoted?: boolean;
  available?: boolean;
  attributes?: Record<string, AttributeValue>;
}
export interface CustomerWrite {
  externalId: string;
  attributes?: Record<string, AttributeValue>;
}
export interface SignalWrite {
  customer: string;
  item: string;
  kind: SignalKind;
  value: number;
  at: number | null;
}
type Stmt = Database.Statement<unknown[]>;

/**
 * Signals resolved to row ids, column by column in typed arrays reused batch after batch (no object per
 * row), bound straight from the arrays. Row ids are Float64 so any SQLite rowid up to 2^53 fits.
 */
export interface SignalBatch {
  /** Rows used in the arrays below (they may be longer). */
  n: number;
  customer: Float64Array;
  item: Float64Array;
  /** The kind's code: its index in SIGNAL_KINDS, as stored (migration 004). */
  kind: Uint8Array;
  value: Float64Array;
  /** Unix ms; NaN = no time (stored as NULL). */
  at: Float64Array;
  /** Customers to create before these rows (unknown: 'create'), with the row ids the rows already use. */
  newCustomers: { externalIds: string[]; ids: number[] };
  /** Data rows read from the file so far, rejected ones included (for progress). */
  rowsRead: number;
}

/** External id -> row id for the catalogue and the customers, and the row id the next new customer gets. */
export interface IdMaps {
  items: StringIdTable;
  customers: StringIdTable;
  nextCustomerId: number;
}

export type WriteOutcome = 'added' | 'updated' | 'unchanged' | { reject: string };

export interface SignalCounts {
  added: number;
  updated: number;
  unchanged: number;
  customersCreated: number;
}

// Item field -> column and how it is bound. Order fixes the SQL so one statement serves a whole file.
const ITEM_COLUMNS: readonly [keyof ItemWrite, string, (v: never) => unknown][] = [
  ['title', 'title', (v: string) => v],
  ['description', 'description', (v: string) => v],
  ['category', 'category', (v: string) => v],
  ['tags', 'tags', (v: string[]) => JSON.stringify(v)],
  ['supplier', 'supplier', (v: string) => v],
  ['price', 'price', (v: number | null) => v],
  ['addedAt', 'added_at', (v: number | null) => v],
  ['promoted', 'promoted', (v: boolean) => (v ? 1 : 0)],
  ['available', 'available', (v: boolean) => (v ? 1 : 0)],
  ['attributes', 'attributes', (v: Record<string, AttributeValue>) => JSON.stringify(v)],
];

/** A signal's identity, as the unique index of migration 004 lists it (an upsert must name it exactly). */
const SIGNAL_KEY = 'item_id, customer_id, kind, ifnull(at, -1)';
/** The only signal index, dropped before a bulk load and rebuilt after it. */
const SIGNAL_INDEX = `CREATE UNIQUE INDEX signal_identity ON signal(${SIGNAL_KEY})`;
/**
 * Rows per multi-row INSERT: 5 parameters a row stays under SQLite's 32,766 bound parameters
 * (sqlite.org/limits.html, SQLITE_MAX_VARIABLE_NUMBER since 3.32.0).
 */
export const SIGNAL_BATCH = 6_000;
/**
 * Appending takes the index-less path (`startSignals`, store/signal-append.ts) when the file is expected to
 * bring at least this many rows per row already stored: below it, keeping the index up to date row by row
 * costs less than rebuilding it over the whole table. At 0.5 (200k rows into the demo's 400k) the two
 * paths tied before the append path learnt to skip the stored rows (1.24 vs 1.18 CPU-s, one run at load 19,
 * bench/import.bench.ts BENCH_SCENARIO=append BENCH_UPSERT=1, 2026-12-04); it is cheaper since, so this
 * bound errs towards the upsert. At 2.5 (1M rows) the rebuild wins clearly (README, Performance).
 */
export const APPEND_REBUILD_RATIO = 0.5;

export class CatalogueWriter {
  readonly #db: Db;
  readonly #itemIds = new StringIdTable();
  readonly #customerIds = new StringIdTable();
  readonly #itemStatements = new Map<string, { sql: Stmt; binders: ((v: never) => unknown)[]; keys: (keyof ItemWrite)[] }>();
  #customerInsert: Stmt | undefined;
  #customerUpsert: Stmt | undefined;
  #customerCreate: Stmt | undefined;
  #signalBatch: Stmt | undefined;
  #signalTail: ((n: number) => Stmt) | undefined;
  #params: unknown[] = [];
  #signalsBefore = -1;
  #signalChanges = 0;
  #customersCreated = 0;
  #bulk = false;
  /** Appending with the index dropped (store/signal-append.ts). */
  #appender: SignalAppender | undefined;

  constructor(db: Db) {
    this.#db = db;
    for (const [ext, id] of db.prepare('SELECT external_id, id FROM item').raw().iterate() as IterableIterator<[string, number]>) {
      this.#itemIds.set(ext, id);
    }
    for (const [ext, id] of db.prepare('SELECT external_id, id FROM customer').raw().iterate() as IterableIterator<[string, number]>) {
      this.#customerIds.set(ext, id);
    }
  }

  writeItem(row: ItemWrite): WriteOutcome {
    const exists = this.#itemIds.has(row.externalId);
    if (row.title === '') return { reject: 'title: an item needs a title' };
    if (!exists && row.title === undefined) return { reject: `title: item ${quote(row.externalId)} is new and needs a title` };
    const st = this.#itemStatement(row, exists);
    if (exists && st.keys.length === 0) return 'unchanged'; // an id-only row for a known item
    const params: unknown[] = [];
    for (let i = 0; i < st.keys.length; i++) params.push(st.binders[i]!(row[st.keys[i]!] as never));
    const n = params.length;
    params.push(row.externalId);
    if (exists) for (let i = 0; i < n; i++) params.push(params[i]); // the WHERE compares each value again
    if (!exists) {
      this.#itemIds.set(row.externalId, Number(st.sql.run(params).lastInsertRowid));
      return 'added';
    }
    return st.sql.run(params).changes > 0 ? 'updated' : 'unchanged';
  }

  /**
   * INSERT for a new item, UPDATE of the file's columns for a known one (known from the id map, so no
   * upsert: an upsert would trip NOT NULL on title for a file that only updates prices). The UPDATE's WHERE
   * skips identical rows, so `changes` tells updated from unchanged.
   */
  #itemStatement(row: ItemWrite, exists: boolean) {
    const present = ITEM_COLUMNS.filter(([k]) => row[k] !== undefined);
    const key = `${exists ? 'u' : 'i'}:${present.map(([k]) => k).join(',')}`;
    let st = this.#itemStatements.get(key);
    if (!st) {
      const cols = present.map(([, c]) => c);
      const sql = !exists || cols.length === 0
        ? `INSERT INTO item (${[...cols, 'external_id'].join(', ')}) VALUES (${[...cols, 'external_id'].map(() => '?').join(', ')})`
        : `UPDATE item SET ${cols.map((c) => `${c} = ?`).join(', ')} WHERE external_id = ? AND (${cols.map((c) => `${c} IS NOT ?`).join(' OR ')})`;
      st = { sql: this.#db.prepare(sql), binders: present.map(([, , b]) => b), keys: present.map(([k]) => k) };
      this.#itemStatements.set(key, st);
    }
    return st;
  }

  writeCustomer(row: CustomerWrite): WriteOutcome {
    const exists = this.#customerIds.has(row.externalId);
    let changes: number;
    if (row.attributes === undefined) {
      this.#customerInsert ??= this.#db.prepare('INSERT INTO customer (external_id) VALUES (?) ON CONFLICT(external_id) DO NOTHING');
      const r = this.#customerInsert.run(row.externalId);
      changes = r.changes;
      if (!exists) this.#customerIds.set(row.externalId, Number(r.lastInsertRowid));
    } else {
      this.#customerUpsert ??= this.#db.prepare(
        'INSERT INTO customer (external_id, attributes) VALUES (?, ?) ON CONFLICT(external_id) DO UPDATE SET ' +
          'attributes = excluded.attributes WHERE customer.attributes IS NOT excluded.attributes',
      );
      const r = this.#customerUpsert.run(row.externalId, JSON.stringify(row.attributes));
      changes = r.changes;
      if (!exists) this.#customerIds.set(row.externalId, Number(r.lastInsertRowid));
    }
    if (!exists) return 'added';
    return changes > 0 ? 'updated' : 'unchanged';
  }

  /**
   * Call once before the first signal. On an empty signal table the identity index is dropped and rebuilt
   * by `finishSignals` (inside the caller's transaction, so a rollback restores it): building a B-tree from
   * sorted data beats a million random inserts into it (SQLite docs, "CREATE INDEX" builds by sorting;
   * 1M rows: 0.9 s to build after vs 8 s kept up to date, measured 2026-12-02).
   */
  startSignals(estimatedRows = 0, appendPath?: 'upsert' | 'rebuild'): void {
    this.#signalsBefore = this.#db.prepare('SELECT count(*) FROM signal').pluck().get() as number;
    this.#bulk = this.#signalsBefore === 0;
    const append = !this.#bulk && (appendPath ?? (estimatedRows >= this.#signalsBefore * APPEND_REBUILD_RATIO ? 'rebuild' : 'upsert')) === 'rebuild';
    if (this.#bulk || append) this.#db.exec('DROP INDEX IF EXISTS signal_identity');
    this.#appender = undefined;
    // Rows go out SIGNAL_BATCH at a time in one multi-row INSERT: one statement step per batch instead of per
    // row cut the binding overhead ~2x (measured). Rows in one VALUES list are applied in order, so a
    // repeated identity later in the batch still upserts over the earlier one.
    const sql = (n: number) =>
      `INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES ${Array.from({ length: n }, () => '(?, ?, ?, ?, ?)').join(', ')}` +
      (this.#bulk || append ? '' : ` ON CONFLICT(${SIGNAL_KEY}) DO UPDATE SET value = excluded.value WHERE signal.value IS NOT excluded.value`);
    this.#signalBatch = this.#db.prepare(sql(SIGNAL_BATCH));
    const tails = new Map<number, Stmt>(); // a file's last, shorter batch (usually one size per import)
    this.#signalTail = (n) => {
      let st = tails.get(n);
      if (!st) tails.set(n, (st = this.#db.prepare(sql(n))));
      return st;
    };
    if (append) {
      const insert = (params: unknown[], n: number) => (n === SIGNAL_BATCH ? this.#signalBatch! : this.#signalTail!(n)).run(params).changes;
      this.#appender = new SignalAppender(this.#db, insert, SIGNAL_BATCH, estimatedRows);
    }
  }

  /** The id maps signal rows are resolved with (in this thread or handed to the parsing thread). */
  idMaps(): IdMaps {
    const max = this.#db.prepare('SELECT max(id) FROM customer').pluck().get() as number | null;
    // An INTEGER PRIMARY KEY without AUTOINCREMENT gets max(rowid) + 1 (sqlite.org/autoinc.html), so rows
    // created with these ids are the rows a plain INSERT would have made.
    return { items: this.#itemIds, customers: this.#customerIds, nextCustomerId: (max ?? 0) + 1 };
  }

  /** Writes one batch of resolved signals (after creating the customers it introduces). */
  writeSignalBatch(b: SignalBatch): void {
    const { externalIds, ids } = b.newCustomers;
    if (externalIds.length > 0) {
      this.#customerCreate ??= this.#db.prepare('INSERT INTO customer (id, external_id) VALUES (?, ?)');
      for (let i = 0; i < externalIds.length; i++) {
        this.#customerCreate.run(ids[i], externalIds[i]);
        this.#customerIds.set(externalIds[i]!, ids[i]!);
      }
      this.#customersCreated += externalIds.length;
    }
    if (this.#appender) {
      this.#appender.write(b);
      return;
    }
    for (let start = 0; start < b.n; start += SIGNAL_BATCH) {
      const n = Math.min(SIGNAL_BATCH, b.n - start);
      const st = n === SIGNAL_BATCH ? this.#signalBatch! : this.#signalTail!(n);
      if (this.#params.length !== n * 5) this.#params = new Array<unknown>(n * 5);
      const p = this.#params;
      for (let r = start, j = 0; r < start + n; r++, j += 5) {
        p[j] = b.customer[r];
        p[j + 1] = b.item[r];
        p[j + 2] = b.kind[r];
        p[j + 3] = b.value[r];
        const at = b.at[r]!;
        p[j + 4] = at === at ? at : null; // NaN marks a missing time
      }
      this.#signalChanges += st.run(p).changes;
    }
  }

  /**
   * Rebuilds the dropped index and splits the written rows into added / updated / unchanged, from the
   * statements' change counts instead of asking per row. In bulk mode a repeated identity within the file keeps its
   * last row (the file's order is the row id order); a repeat counts as updated when its value differs from
   * the repeat before it, as the upsert path would count it.
   */
  finishSignals(validRows: number): SignalCounts {
    let added: number;
    let updated: number;
    if (this.#appender) {
      ({ added, updated } = this.#appender.finish(() => this.#db.exec(SIGNAL_INDEX)));
      this.#appender = undefined;
    } else if (this.#bulk) {
      // No sorter helper threads (PRAGMA threads), no bigger cache_size, no temp_store = MEMORY: each made
      // the index builds slower in wall and CPU time on the shared two-core machine (1M rows; threads 1-2:
      // 3.1-4.3 s vs 2.5-3.6 s; cache_size 64 MB or temp_store MEMORY: 4.7-8.7 s; measured 2026-12-02).
      const r = this.#rebuildIndex();
      added = this.#signalChanges - r.removed; // every row was inserted; in-file repeats then removed
      updated = r.updated;
    } else {
      added = (this.#db.prepare('SELECT count(*) FROM signal').pluck().get() as number) - this.#signalsBefore;
      updated = this.#signalChanges - added;
    }
    return { added, updated, unchanged: validRows - added - updated, customersCreated: this.#customersCreated };
  }

  /**
   * Builds the identity index after a bulk load. Returns how many in-file repeats were removed (all but
   * the last of each identity) and how many of those repeats changed a value.
   */
  #rebuildIndex(): { removed: number; updated: number } {
    let updated = 0;
    let removed = 0;
    try {
      this.#db.exec(SIGNAL_INDEX);
    } catch (e) {
      if ((e as { code?: string }).code !== 'SQLITE_CONSTRAINT_UNIQUE') throw e;
      updated = this.#db
        .prepare(
          `SELECT count(*) FROM (SELECT value IS NOT lag(value) OVER w AS changed, row_number() OVER w AS n ` +
            `FROM signal WINDOW w AS (PARTITION BY ${SIGNAL_KEY} ORDER BY id)) WHERE n > 1 AND changed`,
        )
        .pluck()
        .get() as number;
      removed = this.#db.prepare(`DELETE FROM signal WHERE id NOT IN (SELECT max(id) FROM signal GROUP BY ${SIGNAL_KEY})`).run().changes;
      this.#db.exec(SIGNAL_INDEX);
    }
    return { removed, updated };
  }
}

/** Longest text kept in a stored import report: the log is history, not a copy of the file. */
const LOG_TEXT_CHARS = 500;

/**
 * Records a committed import for the workspace's history (and the stats' "last import"). Every text in the
 * report is cut to LOG_TEXT_CHARS, so a row is bounded however big the file's cells or headers were (one
 * row of 5 MB ids once grew a workspace by 100 MB through its messages).
 */
export function logImport(db: Db, target: string, file: string, report: unknown): void {
  const json = JSON.stringify(report, (_key, v: unknown) => (typeof v === 'string' ? cut(v, LOG_TEXT_CHARS) : v));
  db.prepare('INSERT INTO import_log (at, target, file, report) VALUES (?, ?, ?, ?)').run(Date.now(), target, file, json);
}
