/**
 * Stored rotation plans (schema 10): the plan's settings, its slots, the editor's pins, bans and locks, and the
 * draft editions made from its weeks. JSON columns are written from typed values and read back as unknown
 * for the service to check.
 */
import { NotFoundError } from '../core/errors.ts';
import type { Db } from './workspace.ts';

export interface StoredPlan {
  id: number;
  name: string;
  edition: string;
  shelves: string[];
  start: string;
  weeks: number;
  horizon: unknown;
  objective: unknown;
  method: 'exact' | 'heuristic';
  status: string;
  score: number | null;
  solvedAt: number;
}

export interface PlanSlotRow {
  shelf: number;
  week: number;
  slot: number;
  itemId: number | null;
}

export type PlanEditRow =
  | { kind: 'pin'; shelf: number; week: number; itemId: number }
  | { kind: 'ban'; itemId: number }
  | { kind: 'lock'; shelf: number; week: number };

interface PlanRow {
  id: number;
  name: string;
  edition: string;
  shelves: string;
  start: string;
  weeks: number;
  horizon: string;
  objective: string;
  method: 'exact' | 'heuristic';
  status: string;
  score: number | null;
  solved_at: number;
}

const toPlan = (r: PlanRow): StoredPlan => ({
  id: r.id,
  name: r.name,
  edition: r.edition,
  shelves: JSON.parse(r.shelves) as string[],
  start: r.start,
  weeks: r.weeks,
  horizon: JSON.parse(r.horizon) as unknown,
  objective: JSON.parse(r.objective) as unknown,
  method: r.method,
  status: r.status,
  score: r.score,
  solvedAt: r.solved_at,
});

export class RotationPlanRepo {
  readonly #db: Db;
  constructor(db: Db) {
    this.#db = db;
  }

  find(name: string): StoredPlan | undefined {
    const r = this.#db.prepare('SELECT * FROM rotation_plan WHERE name = ?').get(name) as PlanRow | undefined;
    return r ? toPlan(r) : undefined;
  }

  byName(name: string): StoredPlan {
    const p = this.find(name);
    if (!p) throw new NotFoundError(`no plan named '${name}'`);
    return p;
  }

  list(): StoredPlan[] {
    return (this.#db.prepare('SELECT * FROM rotation_plan ORDER BY name').all() as PlanRow[]).map(toPlan);
  }

  /** Creates or replaces the plan's settings and slots; edits stay. Call inside the caller's transaction. */
  save(p: Omit<StoredPlan, 'id'>, slots: readonly PlanSlotRow[]): number {
    const row = {
      name: p.name,
      edition: p.edition,
      shelves: JSON.stringify(p.shelves),
      start: p.start,
      weeks: p.weeks,
      horizon: JSON.stringify(p.horizon),
      objective: JSON.stringify(p.objective),
      method: p.method,
      status: p.status,
      score: p.score,
      solved_at: p.solvedAt,
    };
    this.#db
      .prepare(
        `INSERT INTO rotation_plan (name, edition, shelves, start, weeks, horizon, objective, method, status, score, solved_at)
         VALUES (@name, @edition, @shelves, @start, @weeks, @horizon, @objective, @method, @status, @score, @solved_at)
         ON CONFLICT(name) DO UPDATE SET edition = excluded.edition, shelves = excluded.shelves, start = excluded.start,
           weeks = excluded.weeks, horizon = excluded.horizon, objective = excluded.objective, method = excluded.method,
           status = excluded.status, score = excluded.score, solved_at = excluded.solved_at`,
      )
      .run(row);
    const id = (this.#db.prepare('SELECT id FROM rotation_plan WHERE name = ?').pluck().get(p.name) as number);
    this.#db.prepare('DELETE FROM rotation_plan_slot WHERE plan_id = ?').run(id);
    const ins = this.#db.prepare('INSERT INTO rotation_plan_slot (plan_id, shelf, week, slot, item_id) VALUES (?, ?, ?, ?, ?)');
    for (const s of slots) ins.run(id, s.shelf, s.week, s.slot, s.itemId);
    return id;
  }

  slots(planId: number): PlanSlotRow[] {
    return this.#db
      .prepare('SELECT shelf, week, slot, item_id AS itemId FROM rotation_plan_slot WHERE plan_id = ? ORDER BY shelf, week, slot')
      .all(planId) as PlanSlotRow[];
  }

  edits(planId: number): PlanEditRow[] {
    const rows = this.#db.prepare('SELECT kind, shelf, week, item_id AS itemId FROM rotation_plan_edit WHERE plan_id = ? ORDER BY id').all(planId) as {
      kind: 'pin' | 'ban' | 'lock';
      shelf: number | null;
      week: number | null;
      itemId: number | null;
    }[];
    return rows.map((r) =>
      r.kind === 'pin' ? { kind: 'pin', shelf: r.shelf!, week: r.week!, itemId: r.itemId! } : r.kind === 'ban' ? { kind: 'ban', itemId: r.itemId! } : { kind: 'lock', shelf: r.shelf!, week: r.week! },
    );
  }

  /** Replaces the plan's edits (the service merges new ones with the stored). Inside the caller's transaction. */
  setEdits(planId: number, edits: readonly PlanEditRow[]): void {
    this.#db.prepare('DELETE FROM rotation_plan_edit WHERE plan_id = ?').run(planId);
    const ins = this.#db.prepare('INSERT INTO rotation_plan_edit (plan_id, kind, shelf, week, item_id) VALUES (?, ?, ?, ?, ?)');
    for (const e of edits) {
      if (e.kind === 'pin') ins.run(planId, 'pin', e.shelf, e.week, e.itemId);
      else if (e.kind === 'ban') ins.run(planId, 'ban', null, null, e.itemId);
      else ins.run(planId, 'lock', e.shelf, e.week, null);
    }
  }

  recordDraft(planId: number, week: number, editionId: number): void {
    this.#db.prepare('INSERT INTO rotation_plan_draft (plan_id, week, edition_id) VALUES (?, ?, ?) ON CONFLICT(plan_id, week) DO UPDATE SET edition_id = excluded.edition_id').run(planId, week, editionId);
  }

  drafts(planId: number): { week: number; editionId: number }[] {
    return this.#db.prepare('SELECT week, edition_id AS editionId FROM rotation_plan_draft WHERE plan_id = ? ORDER BY week').all(planId) as { week: number; editionId: number }[];
  }
}
