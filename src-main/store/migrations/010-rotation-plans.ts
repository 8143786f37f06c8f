import type { Migration } from './types.ts';

/**
 * Version 10 (rotation plans, issue 14): stored plans of the
 * rotation planner.
 * - `rotation_plan`: one plan by name: the edition whose shelves are its template, the shelf labels, the first
 *   week's date, the number of weeks, the horizon rules and objective (JSON, checked by the service on read),
 *   and how it was last solved.
 * - `rotation_plan_slot`: the planned item per shelf, week and slot (0-based); NULL = an empty slot.
 * - `rotation_plan_edit`: the editor's pins (item to shelf and week), bans (item from the horizon) and locks
 *   (shelf and week keep their items).
 * - `rotation_plan_draft`: which draft edition a planned week became.
 * Plans hold no customer data, so `forget` has nothing to erase here.
 */
export const rotationPlans: Migration = {
  version: 10,
  name: 'rotation plans',
  up: `
    CREATE TABLE rotation_plan (
      id        INTEGER PRIMARY KEY,
      name      TEXT    NOT NULL UNIQUE,
      edition   TEXT    NOT NULL,
      shelves   TEXT    NOT NULL,
      start     TEXT    NOT NULL CHECK (start GLOB '[0-9][0-9][0-9][0-9]-[0-1][0-9]-[0-3][0-9]'),
      weeks     INTEGER NOT NULL CHECK (weeks BETWEEN 1 AND 52),
      horizon   TEXT    NOT NULL,
      objective TEXT    NOT NULL,
      method    TEXT    NOT NULL CHECK (method IN ('exact', 'heuristic')),
      status    TEXT    NOT NULL,
      score     REAL,
      solved_at INTEGER NOT NULL
    ) STRICT;
    CREATE TABLE rotation_plan_slot (
      plan_id INTEGER NOT NULL REFERENCES rotation_plan(id) ON DELETE CASCADE,
      shelf   INTEGER NOT NULL CHECK (shelf >= 0),
      week    INTEGER NOT NULL CHECK (week >= 0),
      slot    INTEGER NOT NULL CHECK (slot >= 0),
      item_id INTEGER REFERENCES item(id) ON DELETE SET NULL,
      PRIMARY KEY (plan_id, shelf, week, slot)
    ) STRICT, WITHOUT ROWID;
    CREATE TABLE rotation_plan_edit (
      id      INTEGER PRIMARY KEY,
      plan_id INTEGER NOT NULL REFERENCES rotation_plan(id) ON DELETE CASCADE,
      kind    TEXT    NOT NULL CHECK (kind IN ('pin', 'ban', 'lock')),
      shelf   INTEGER,
      week    INTEGER,
      item_id INTEGER REFERENCES item(id) ON DELETE CASCADE,
      CHECK ((kind = 'ban') = (week IS NULL)),
      CHECK ((kind = 'lock') = (item_id IS NULL))
    ) STRICT;
    CREATE TABLE rotation_plan_draft (
      plan_id    INTEGER NOT NULL REFERENCES rotation_plan(id) ON DELETE CASCADE,
      week       INTEGER NOT NULL,
      edition_id INTEGER NOT NULL REFERENCES edition(id),
      PRIMARY KEY (plan_id, week)
    ) STRICT, WITHOUT ROWID;
  `,
};
