import { InputError, NotFoundError } from '../core/errors.ts';
import type { EditionSnapshot } from '../core/editing/snapshot.ts';
import type { Db } from './workspace.ts';

export type EditionStatus = 'draft' | 'published';

export interface Edition {
  id: number;
  label: string;
  /** The calendar day the edition runs, YYYY-MM-DD. */
  date: string;
  status: EditionStatus;
  publishedAt: number | null;
  createdAt: number;
}

interface EditionRow {
  id: number;
  label: string;
  date: string;
  status: EditionStatus;
  published_at: number | null;
  created_at: number;
}

const toEdition = (r: EditionRow): Edition => ({
  id: r.id,
  label: r.label,
  date: r.date,
  status: r.status,
  publishedAt: r.published_at,
  createdAt: r.created_at,
});

/** A calendar date YYYY-MM-DD that exists (2026-02-30 does not). */
export function checkDate(date: string, field = 'date'): void {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  const t = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : NaN;
  if (!m || Number.isNaN(t) || new Date(t).toISOString().slice(0, 10) !== date) {
    throw new InputError(`${field}: expected a calendar date YYYY-MM-DD, got '${date}'`, { column: field });
  }
}

/** Unix ms of midnight UTC on an edition's date. */
export function dateMs(date: string): number {
  return Date.parse(`${date}T00:00:00Z`);
}

/** Editions and their published snapshots. Writes run inside the caller's transaction. */
export class EditionRepo {
  readonly #insert;
  readonly #byId;
  readonly #byLabel;
  readonly #list;
  readonly #publish;
  readonly #insertSnapshot;
  readonly #snapshot;
  readonly #lastPublished;
  constructor(db: Db) {
    this.#insert = db.prepare<{ label: string; date: string; at: number }>(
      'INSERT INTO edition (label, date, created_at) VALUES (@label, @date, @at)',
    );
    this.#byId = db.prepare<[number], EditionRow>('SELECT * FROM edition WHERE id = ?');
    this.#byLabel = db.prepare<[string], EditionRow>('SELECT * FROM edition WHERE label = ?');
    this.#list = db.prepare<[], EditionRow>('SELECT * FROM edition ORDER BY date, id');
    this.#publish = db.prepare<{ id: number; at: number }>(
      "UPDATE edition SET status = 'published', published_at = @at WHERE id = @id",
    );
    this.#insertSnapshot = db.prepare<{ id: number; at: number; json: string }>(
      'INSERT INTO edition_snapshot (edition_id, published_at, snapshot) VALUES (@id, @at, @json)',
    );
    this.#snapshot = db.prepare<[number], { snapshot: string }>('SELECT snapshot FROM edition_snapshot WHERE edition_id = ?');
    this.#lastPublished = db.prepare<[string, number], { snapshot: string }>(
      `SELECT s.snapshot FROM edition_snapshot s JOIN edition e ON e.id = s.edition_id
       WHERE e.date <= ? ORDER BY e.date DESC, s.published_at DESC LIMIT ?`,
    );
  }

  create(label: string, date: string, at: number): Edition {
    checkDate(date);
    if (label.trim() === '') throw new InputError('label: give the edition a label', { column: 'label' });
    if (this.#byLabel.get(label)) throw new InputError(`an edition called '${label}' already exists: choose another name`, { column: 'label' });
    const id = Number(this.#insert.run({ label, date, at }).lastInsertRowid);
    return this.get(id);
  }

  get(id: number): Edition {
    const r = this.#byId.get(id);
    if (!r) throw new NotFoundError(`no edition with id ${id}`);
    return toEdition(r);
  }

  byLabel(label: string): Edition {
    const r = this.#byLabel.get(label);
    if (!r) throw new NotFoundError(`no edition called '${label}'`);
    return toEdition(r);
  }

  list(): Edition[] {
    return this.#list.all().map(toEdition);
  }

  /** Marks the edition published and stores its frozen snapshot (both refuse change afterwards). */
  publish(id: number, at: number, snapshot: EditionSnapshot): void {
    this.#insertSnapshot.run({ id, at, json: JSON.stringify(snapshot) });
    this.#publish.run({ id, at });
  }

  snapshot(id: number): EditionSnapshot | undefined {
    const r = this.#snapshot.get(id);
    return r ? (JSON.parse(r.snapshot) as EditionSnapshot) : undefined;
  }

  /** The last `w` published editions dated on or before `date`, newest first (the rest period's window). */
  lastPublished(date: string, w: number): EditionSnapshot[] {
    if (w <= 0) return [];
    return this.#lastPublished.all(date, w).map((r) => JSON.parse(r.snapshot) as EditionSnapshot);
  }
}
