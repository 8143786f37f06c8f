import { InputError, NotFoundError } from '../core/errors.ts';
import type { Brief, RuleViolation } from '../core/curation/types.ts';
import { parseBrief } from '../core/editing/brief-schema.ts';
import type { Db } from './workspace.ts';

export interface Shelf {
  id: number;
  editionId: number;
  position: number;
  label: string;
  size: number;
  brief: Brief;
  locked: boolean;
  /** What the last fill could not meet. */
  violations: RuleViolation[];
}

/** One slot as last filled; itemId null = empty. Slots are 0-based. */
export interface SlotRow {
  slot: number;
  itemId: number | null;
  pinned: boolean;
  score: number | null;
  percentile: number | null;
  contributions: Record<string, number>;
}

interface ShelfRow {
  id: number;
  edition_id: number;
  position: number;
  label: string;
  size: number;
  brief: string;
  locked: number;
  violations: string;
}

/** The brief is parsed with its schema on every read and write: a hand-edited file cannot slip through. */
const toShelf = (r: ShelfRow): Shelf => ({
  id: r.id,
  editionId: r.edition_id,
  position: r.position,
  label: r.label,
  size: r.size,
  brief: parseBrief(JSON.parse(r.brief)),
  locked: r.locked === 1,
  violations: JSON.parse(r.violations) as RuleViolation[],
});

/** Shelves and their slots. Writes run inside the caller's transaction. */
export class ShelfRepo {
  readonly #insert;
  readonly #byId;
  readonly #byLabel;
  readonly #list;
  readonly #nextPos;
  readonly #setBrief;
  readonly #setLocked;
  readonly #setViolations;
  readonly #clearSlots;
  readonly #insertSlot;
  readonly #slots;
  constructor(db: Db) {
    this.#insert = db.prepare<{ e: number; p: number; label: string; size: number; brief: string }>(
      'INSERT INTO shelf (edition_id, position, label, size, brief) VALUES (@e, @p, @label, @size, @brief)',
    );
    this.#byId = db.prepare<[number], ShelfRow>('SELECT * FROM shelf WHERE id = ?');
    this.#byLabel = db.prepare<[number, string], ShelfRow>('SELECT * FROM shelf WHERE edition_id = ? AND label = ?');
    this.#list = db.prepare<[number], ShelfRow>('SELECT * FROM shelf WHERE edition_id = ? ORDER BY position');
    this.#nextPos = db.prepare<[number], { p: number }>('SELECT coalesce(max(position) + 1, 0) AS p FROM shelf WHERE edition_id = ?');
    this.#setBrief = db.prepare<{ id: number; size: number; brief: string }>(
      'UPDATE shelf SET brief = @brief, size = @size WHERE id = @id',
    );
    this.#setLocked = db.prepare<{ id: number; locked: number }>('UPDATE shelf SET locked = @locked WHERE id = @id');
    this.#setViolations = db.prepare<{ id: number; v: string }>('UPDATE shelf SET violations = @v WHERE id = @id');
    this.#clearSlots = db.prepare<[number]>('DELETE FROM slot WHERE shelf_id = ?');
    this.#insertSlot = db.prepare<{
      shelf: number;
      slot: number;
      item: number | null;
      pinned: number;
      score: number | null;
      percentile: number | null;
      contributions: string;
    }>(
      `INSERT INTO slot (shelf_id, slot, item_id, pinned, score, percentile, contributions)
       VALUES (@shelf, @slot, @item, @pinned, @score, @percentile, @contributions)`,
    );
    this.#slots = db.prepare<[number], { slot: number; item_id: number | null; pinned: number; score: number | null; percentile: number | null; contributions: string }>(
      'SELECT slot, item_id, pinned, score, percentile, contributions FROM slot WHERE shelf_id = ? ORDER BY slot',
    );
  }

  add(editionId: number, label: string, brief: Brief): Shelf {
    if (label.trim() === '') throw new InputError('label: give the shelf a label', { column: 'label' });
    if (this.#byLabel.get(editionId, label)) {
      throw new InputError(`label: this edition already has a shelf called '${label}'`, { column: 'label' });
    }
    const p = this.#nextPos.get(editionId)!.p;
    const id = Number(this.#insert.run({ e: editionId, p, label, size: brief.size, brief: JSON.stringify(brief) }).lastInsertRowid);
    return this.get(id);
  }

  get(id: number): Shelf {
    const r = this.#byId.get(id);
    if (!r) throw new NotFoundError(`no shelf with id ${id}`);
    return toShelf(r);
  }

  byLabel(editionId: number, label: string): Shelf {
    const r = this.#byLabel.get(editionId, label);
    if (!r) throw new NotFoundError(`no shelf called '${label}' in this edition`);
    return toShelf(r);
  }

  list(editionId: number): Shelf[] {
    return this.#list.all(editionId).map(toShelf);
  }

  setBrief(id: number, brief: Brief): void {
    this.#setBrief.run({ id, size: brief.size, brief: JSON.stringify(brief) });
  }

  setLocked(id: number, locked: boolean): void {
    this.#setLocked.run({ id, locked: locked ? 1 : 0 });
  }

  /** Stores a fill: its slots and the rules it could not meet. */
  replaceSlots(shelfId: number, slots: readonly SlotRow[], violations: readonly RuleViolation[]): void {
    this.#setViolations.run({ id: shelfId, v: JSON.stringify(violations) });
    this.#clearSlots.run(shelfId);
    for (const s of slots) {
      this.#insertSlot.run({
        shelf: shelfId,
        slot: s.slot,
        item: s.itemId,
        pinned: s.pinned ? 1 : 0,
        score: s.score,
        percentile: s.percentile,
        contributions: JSON.stringify(s.contributions),
      });
    }
  }

  slots(shelfId: number): SlotRow[] {
    return this.#slots.all(shelfId).map((r) => ({
      slot: r.slot,
      itemId: r.item_id,
      pinned: r.pinned === 1,
      score: r.score,
      percentile: r.percentile,
      contributions: JSON.parse(r.contributions) as Record<string, number>,
    }));
  }
}
