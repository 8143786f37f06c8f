import { BugError } from '../core/errors.ts';
import type { Facet } from '../core/curation/types.ts';
import type { EditLog, EditRecord, ShelfEdits } from '../core/editing/index.ts';
import type { Db } from './workspace.ts';

/** One stored action with its time and the editor's reason. */
export interface ActionEntry {
  seq: number;
  kind: string;
  record: EditRecord;
  reason: string | null;
  at: number;
  undone: boolean;
}

/**
 * The editorial action log of each shelf, and the bans and boosts standing after its last action.
 * Writes run inside the caller's transaction (services/curation/act.ts wraps each action in one).
 */
export class EditorialRepo {
  readonly #entries;
  readonly #dropTail;
  readonly #insert;
  readonly #setUndone;
  readonly #updatePayload;
  readonly #clearBans;
  readonly #insertBan;
  readonly #clearBoosts;
  readonly #insertBoost;
  readonly #activeBans;
  readonly #boosts;
  constructor(db: Db) {
    this.#entries = db.prepare<[number], { seq: number; kind: string; payload: string; reason: string | null; at: number; undone: number }>(
      'SELECT seq, kind, payload, reason, at, undone FROM editorial_action WHERE shelf_id = ? ORDER BY seq',
    );
    this.#dropTail = db.prepare<[number]>('DELETE FROM editorial_action WHERE shelf_id = ? AND undone = 1');
    this.#insert = db.prepare<{ shelf: number; kind: string; payload: string; reason: string | null; at: number }>(
      `INSERT INTO editorial_action (shelf_id, seq, kind, payload, reason, at)
       VALUES (@shelf, (SELECT coalesce(max(seq), 0) + 1 FROM editorial_action WHERE shelf_id = @shelf), @kind, @payload, @reason, @at)`,
    );
    this.#setUndone = db.prepare<{ shelf: number; seq: number; undone: number }>(
      'UPDATE editorial_action SET undone = @undone WHERE shelf_id = @shelf AND seq = @seq',
    );
    this.#updatePayload = db.prepare<{ shelf: number; seq: number; payload: string }>(
      'UPDATE editorial_action SET payload = @payload WHERE shelf_id = @shelf AND seq = @seq',
    );
    this.#clearBans = db.prepare<[number]>('DELETE FROM ban WHERE shelf_id = ?');
    this.#insertBan = db.prepare<{ shelf: number; edition: number; scope: string; item: number | null; facet: string | null; value: string | null }>(
      'INSERT INTO ban (shelf_id, edition_id, scope, item_id, facet, value) VALUES (@shelf, @edition, @scope, @item, @facet, @value)',
    );
    this.#clearBoosts = db.prepare<[number]>('DELETE FROM boost WHERE shelf_id = ?');
    this.#insertBoost = db.prepare<{ shelf: number; item: number; factor: number }>(
      'INSERT INTO boost (shelf_id, item_id, factor) VALUES (@shelf, @item, @factor)',
    );
    this.#activeBans = db.prepare<{ shelf: number; edition: number }, { item_id: number | null; facet: Facet | null; value: string | null }>(
      `SELECT item_id, facet, value FROM ban
       WHERE shelf_id = @shelf OR (scope <> 'shelf' AND edition_id = @edition) OR scope = 'always'`,
    );
    this.#boosts = db.prepare<[number], { item_id: number; factor: number }>('SELECT item_id, factor FROM boost WHERE shelf_id = ?');
  }

  entries(shelfId: number): ActionEntry[] {
    return this.#entries.all(shelfId).map((r) => ({
      seq: r.seq,
      kind: r.kind,
      record: JSON.parse(r.payload) as EditRecord,
      reason: r.reason,
      at: r.at,
      undone: r.undone === 1,
    }));
  }

  /** The log as the core reducer sees it: undone entries must form the tail. */
  log(shelfId: number): EditLog {
    const es = this.entries(shelfId);
    const cursor = es.filter((e) => !e.undone).length;
    if (es.slice(0, cursor).some((e) => e.undone)) throw new BugError(`shelf ${shelfId}: undone actions are not the log's tail`);
    return { records: es.map((e) => e.record), cursor };
  }

  /** Appends an action, dropping the redo tail first. */
  append(shelfId: number, record: EditRecord, reason: string | null, at: number): void {
    this.#dropTail.run(shelfId);
    this.#insert.run({ shelf: shelfId, kind: record.action.kind, payload: JSON.stringify(record), reason, at });
  }

  /** Marks entry number `index` (0-based, log order) undone or done again, storing its record. */
  mark(shelfId: number, index: number, undone: boolean, record?: EditRecord): void {
    const seq = this.entries(shelfId)[index]?.seq;
    if (seq === undefined) throw new BugError(`shelf ${shelfId}: no action at ${index}`);
    this.#setUndone.run({ shelf: shelfId, seq, undone: undone ? 1 : 0 });
    if (record) this.#updatePayload.run({ shelf: shelfId, seq, payload: JSON.stringify(record) });
  }

  /** Rewrites the shelf's bans and boosts from its editorial state. */
  materialise(shelfId: number, editionId: number, edits: ShelfEdits): void {
    this.#clearBans.run(shelfId);
    for (const [item, scope] of Object.entries(edits.bans)) {
      this.#insertBan.run({ shelf: shelfId, edition: editionId, scope, item: Number(item), facet: null, value: null });
    }
    for (const r of Object.values(edits.banRules)) {
      this.#insertBan.run({ shelf: shelfId, edition: editionId, scope: r.scope, item: null, facet: r.facet, value: r.value });
    }
    this.#clearBoosts.run(shelfId);
    for (const [item, factor] of Object.entries(edits.boosts)) this.#insertBoost.run({ shelf: shelfId, item: Number(item), factor });
  }

  /** Bans reaching this shelf: its own, every edition-wide one of its edition (all scopes but shelf), and every "always" ban. */
  activeBans(shelfId: number, editionId: number): { items: Set<number>; rules: { facet: Facet; value: string }[] } {
    const items = new Set<number>();
    const rules: { facet: Facet; value: string }[] = [];
    const seen = new Set<string>();
    for (const r of this.#activeBans.all({ shelf: shelfId, edition: editionId })) {
      if (r.item_id !== null) items.add(r.item_id);
      else if (r.facet !== null && r.value !== null && !seen.has(`${r.facet}:${r.value}`)) {
        seen.add(`${r.facet}:${r.value}`);
        rules.push({ facet: r.facet, value: r.value });
      }
    }
    return { items, rules };
  }

  boosts(shelfId: number): Map<number, number> {
    return new Map(this.#boosts.all(shelfId).map((r) => [r.item_id, r.factor]));
  }
}
