import { BugError } from '../core/errors.ts';
import { SignalIdentityTable } from '../core/util/signal-identity-table.ts';
import type { SignalBatch } from './catalogue-writes.ts';
import type { Db } from './workspace.ts';

/**
 * Appending signals to a table that has some, with the identity index dropped (catalogue-writes.ts
 * `startSignals`) and rebuilt by `finish`: each row is resolved as the upsert would resolve it, but
 * without touching a B-tree. A new identity is INSERTed with the row id SQLite gives it (max(rowid) + 1,
 * sqlite.org/autoinc.html), in file order; a repeat (of a stored row or of an earlier row of the file)
 * only changes the value kept for its row, written back once at the end. The table then ends exactly as
 * the upserts would leave it: same rows, same row ids, last value wins, same counts.
 *
 * Repeats are found the cheapest way the file allows:
 * - ordered: while every row is timed after every stored signal and no earlier than the row before (a
 *   log's new days), a repeat can only be a row of the current run of equal times, kept in a small group;
 * - hashed: otherwise every identity goes through a hash table (SignalIdentityTable), filled on the switch
 *   with the rows this import already wrote, and with the stored rows once a row could repeat one.
 * On the demo shop (1M rows into 400k, 2026-12-04) the hash table cost about 0.2 CPU-s of 4 and reading
 * the stored rows 0.3 CPU-s: the ordered mode skips both.
 */

/** Rows of one time kept for the ordered mode; a longer run of equal times switches to the hash table. */
const GROUP_MAX = 64;

export class SignalAppender {
  readonly #db: Db;
  /** Runs the INSERT of the first `n` queued rows of `params`; returns the rows inserted. */
  readonly #insert: (params: unknown[], n: number) => number;
  readonly #batchRows: number;
  readonly #expectedRows: number;
  readonly #firstNewRowId: number;
  #nextRowId: number;
  /** The largest identity time stored (a missing one keyed -1): a row timed above it repeats no stored row. */
  readonly #storedMaxAt: number;
  #storedLoaded = false;
  #table: SignalIdentityTable | undefined;
  // The ordered mode's group: the identities of the current time, with their row ids and values.
  #lastAt = Number.NEGATIVE_INFINITY;
  #groupN = 0;
  readonly #gItem = new Float64Array(GROUP_MAX);
  readonly #gCustomer = new Float64Array(GROUP_MAX);
  readonly #gKind = new Uint8Array(GROUP_MAX);
  readonly #gRowId = new Float64Array(GROUP_MAX);
  readonly #gValue = new Float64Array(GROUP_MAX);
  /** Ordered mode: (row id, value) pairs of repeats that changed a value, written back at the end. */
  #late: number[] = [];
  readonly #pending: unknown[];
  #pendingRows = 0;
  #inserted = 0;
  updated = 0;

  constructor(db: Db, insert: (params: unknown[], n: number) => number, batchRows: number, expectedRows: number) {
    this.#db = db;
    this.#insert = insert;
    this.#batchRows = batchRows;
    this.#expectedRows = expectedRows;
    const [maxId, maxAt] = db.prepare('SELECT max(id), max(ifnull(at, -1)) FROM signal').raw().get() as [number, number];
    this.#nextRowId = this.#firstNewRowId = maxId + 1;
    this.#storedMaxAt = maxAt;
    this.#pending = new Array<unknown>(batchRows * 5);
  }

  write(b: SignalBatch): void {
    for (let r = 0; r < b.n; r++) {
      const item = b.item[r]!;
      const customer = b.customer[r]!;
      const kind = b.kind[r]!;
      const at = b.at[r]!;
      const value = b.value[r]!;
      const key = at === at ? at : -1; // the index keys a missing time as -1 (migration 004)
      if (this.#table === undefined) {
        if (key > this.#storedMaxAt && key >= this.#lastAt && this.#ordered(item, customer, kind, key, at, value)) continue;
        if (this.#table === undefined) this.#toHashed();
      }
      this.#hashed(this.#table!, item, customer, kind, key, at, value);
    }
  }

  /** The ordered mode's step; false when the row needs the hash table (a run of equal times too long). */
  #ordered(item: number, customer: number, kind: number, key: number, at: number, value: number): boolean {
    if (key > this.#lastAt) {
      this.#lastAt = key;
      this.#groupN = 0;
    } else {
      for (let g = 0; g < this.#groupN; g++) {
        if (this.#gItem[g] === item && this.#gCustomer[g] === customer && this.#gKind[g] === kind) {
          // The upsert's rule: DO UPDATE SET value = excluded.value WHERE signal.value IS NOT excluded.value.
          if (this.#gValue[g] !== value) {
            this.#gValue[g] = value;
            this.#late.push(this.#gRowId[g]!, value);
            this.updated++;
          }
          return true;
        }
      }
      if (this.#groupN === GROUP_MAX) return false;
    }
    const g = this.#groupN++;
    this.#gItem[g] = item;
    this.#gCustomer[g] = customer;
    this.#gKind[g] = kind;
    this.#gRowId[g] = this.#nextRowId;
    this.#gValue[g] = value;
    this.#queue(customer, item, kind, value, at);
    return true;
  }

  #hashed(t: SignalIdentityTable, item: number, customer: number, kind: number, key: number, at: number, value: number): void {
    if (!this.#storedLoaded && !(key > this.#storedMaxAt)) this.#loadStored(t);
    const e = t.find(item, customer, kind, key);
    if (e >= 0) {
      if (t.value(e) !== value) {
        t.setValue(e, value);
        this.updated++;
      }
      return;
    }
    t.add(item, customer, kind, key, this.#nextRowId, value);
    this.#queue(customer, item, kind, value, at);
  }

  #queue(customer: number, item: number, kind: number, value: number, at: number): void {
    this.#nextRowId++;
    const p = this.#pending;
    const j = this.#pendingRows * 5;
    p[j] = customer;
    p[j + 1] = item;
    p[j + 2] = kind;
    p[j + 3] = value;
    p[j + 4] = at === at ? at : null; // NaN marks a missing time
    if (++this.#pendingRows === this.#batchRows) this.#flush();
  }

  #flush(): void {
    const n = this.#pendingRows;
    if (n === 0) return;
    this.#inserted += this.#insert(n === this.#batchRows ? this.#pending : this.#pending.slice(0, n * 5), n);
    this.#pendingRows = 0;
  }

  /** Writes the ordered mode's changed values to their rows. */
  #writeLate(): void {
    const update = this.#db.prepare('UPDATE signal SET value = ? WHERE id = ?');
    for (let i = 0; i < this.#late.length; i += 2) update.run(this.#late[i + 1], this.#late[i]);
    this.#late = [];
  }

  /** Leaves the ordered mode: the rows written so far (values brought up to date) go into a hash table. */
  #toHashed(): void {
    this.#flush();
    this.#writeLate();
    const t = new SignalIdentityTable(this.#expectedRows);
    const rows = this.#db
      .prepare('SELECT id, item_id, customer_id, kind, at, value FROM signal WHERE id >= ? ORDER BY id')
      .raw()
      .iterate(this.#firstNewRowId) as IterableIterator<[number, number, number, number, number | null, number]>;
    for (const [id, item, customer, kind, at, value] of rows) {
      if (t.find(item, customer, kind, at ?? -1) >= 0) throw new BugError('an appended signal identity was written twice');
      t.add(item, customer, kind, at ?? -1, id, value);
    }
    this.#table = t;
  }

  /** Reads every stored identity into `t` (rows this import added are not among them: ids from `#firstNewRowId` on). */
  #loadStored(t: SignalIdentityTable): void {
    const rows = this.#db
      .prepare('SELECT id, item_id, customer_id, kind, at, value FROM signal WHERE id < ?')
      .raw()
      .iterate(this.#firstNewRowId) as IterableIterator<[number, number, number, number, number | null, number]>;
    for (const [id, item, customer, kind, at, value] of rows) {
      // Rows written so far are timed after every stored one, and stored rows are unique: none is found.
      if (t.find(item, customer, kind, at ?? -1) >= 0) throw new BugError('a stored signal identity was found twice');
      t.add(item, customer, kind, at ?? -1, id, value);
    }
    this.#storedLoaded = true;
  }

  /** The last rows written, changed values written back, the index rebuilt by `rebuildIndex`; the counts. */
  finish(rebuildIndex: () => void): { added: number; updated: number } {
    this.#flush();
    this.#writeLate();
    if (this.#table) {
      const update = this.#db.prepare('UPDATE signal SET value = ? WHERE id = ?');
      this.#table.eachChanged((id, value) => update.run(value, id));
    }
    const added = this.#nextRowId - this.#firstNewRowId;
    const max = this.#db.prepare('SELECT max(id) FROM signal').pluck().get() as number;
    if (this.#inserted !== added || max !== this.#nextRowId - 1) {
      throw new BugError(`appended rows did not get the row ids expected (${this.#inserted} of ${added} rows, last id ${max})`);
    }
    rebuildIndex();
    return { added, updated: this.updated };
  }
}
