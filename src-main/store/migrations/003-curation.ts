import type { Migration } from './types.ts';

/**
 * Version 3: editions, shelves, their slots, the editorial action log, bans, boosts and published snapshots.
 * Times are unix milliseconds (UTC); an edition's date is the calendar day it runs (YYYY-MM-DD).
 * Published history is read-only: triggers refuse to change or delete a snapshot, a published edition,
 * or the shelves and slots of one (a published list is a record of what ran).
 */
export const curation: Migration = {
  version: 3,
  name: 'editions, shelves, editorial actions, published snapshots',
  up: `
    CREATE TABLE edition (
      id           INTEGER PRIMARY KEY,
      label        TEXT    NOT NULL UNIQUE,
      date         TEXT    NOT NULL CHECK (date GLOB '[0-9][0-9][0-9][0-9]-[0-1][0-9]-[0-3][0-9]'),
      status       TEXT    NOT NULL DEFAULT 'draft' CHECK (status IN ('draft', 'published')),
      published_at INTEGER,
      created_at   INTEGER NOT NULL
    ) STRICT;

    CREATE TABLE shelf (
      id         INTEGER PRIMARY KEY,
      edition_id INTEGER NOT NULL REFERENCES edition(id),
      position   INTEGER NOT NULL,
      label      TEXT    NOT NULL,
      size       INTEGER NOT NULL CHECK (size >= 1),
      brief      TEXT    NOT NULL,
      locked     INTEGER NOT NULL DEFAULT 0 CHECK (locked IN (0, 1)),
      -- the rules the last fill could not meet (JSON list of {rule, reason})
      violations TEXT    NOT NULL DEFAULT '[]',
      UNIQUE (edition_id, position),
      UNIQUE (edition_id, label)
    ) STRICT;

    -- The shelf as last filled. item_id NULL = an empty slot (the pool ran dry).
    CREATE TABLE slot (
      shelf_id      INTEGER NOT NULL REFERENCES shelf(id),
      slot          INTEGER NOT NULL CHECK (slot >= 0),
      item_id       INTEGER REFERENCES item(id),
      pinned        INTEGER NOT NULL DEFAULT 0 CHECK (pinned IN (0, 1)),
      score         REAL,
      percentile    REAL,
      contributions TEXT    NOT NULL DEFAULT '{}',
      PRIMARY KEY (shelf_id, slot)
    ) STRICT;

    -- Every editorial action in order; undone = 1 marks the redo tail (dropped by the next new action).
    CREATE TABLE editorial_action (
      id       INTEGER PRIMARY KEY,
      shelf_id INTEGER NOT NULL REFERENCES shelf(id),
      seq      INTEGER NOT NULL,
      kind     TEXT    NOT NULL,
      payload  TEXT    NOT NULL,
      reason   TEXT,
      at       INTEGER NOT NULL,
      undone   INTEGER NOT NULL DEFAULT 0 CHECK (undone IN (0, 1)),
      UNIQUE (shelf_id, seq)
    ) STRICT;

    -- Bans and boosts as they stand after the last action (the log is the history; these are for reads).
    -- A ban names one item or one facet value; scope says how far it reaches from the shelf that made it.
    CREATE TABLE ban (
      id         INTEGER PRIMARY KEY,
      shelf_id   INTEGER NOT NULL REFERENCES shelf(id),
      edition_id INTEGER NOT NULL REFERENCES edition(id),
      scope      TEXT    NOT NULL CHECK (scope IN ('shelf', 'edition', 'always')),
      item_id    INTEGER REFERENCES item(id) ON DELETE CASCADE,
      facet      TEXT    CHECK (facet IN ('category', 'supplier', 'tag')),
      value      TEXT,
      CHECK ((item_id IS NULL) <> (facet IS NULL)),
      CHECK ((facet IS NULL) = (value IS NULL))
    ) STRICT;
    CREATE INDEX ban_scope ON ban(scope, edition_id);

    CREATE TABLE boost (
      shelf_id INTEGER NOT NULL REFERENCES shelf(id),
      item_id  INTEGER NOT NULL REFERENCES item(id) ON DELETE CASCADE,
      factor   REAL    NOT NULL CHECK (factor > 0),
      PRIMARY KEY (shelf_id, item_id)
    ) STRICT;

    CREATE TABLE edition_snapshot (
      edition_id   INTEGER PRIMARY KEY REFERENCES edition(id),
      published_at INTEGER NOT NULL,
      snapshot     TEXT    NOT NULL
    ) STRICT;

    CREATE TRIGGER snapshot_read_only_update BEFORE UPDATE ON edition_snapshot
    BEGIN SELECT RAISE(ABORT, 'published snapshots are read-only'); END;
    CREATE TRIGGER snapshot_read_only_delete BEFORE DELETE ON edition_snapshot
    BEGIN SELECT RAISE(ABORT, 'published snapshots are read-only'); END;

    CREATE TRIGGER edition_published_update BEFORE UPDATE ON edition WHEN OLD.status = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;
    CREATE TRIGGER edition_published_delete BEFORE DELETE ON edition WHEN OLD.status = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;

    CREATE TRIGGER shelf_published_insert BEFORE INSERT ON shelf
      WHEN (SELECT status FROM edition WHERE id = NEW.edition_id) = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;
    CREATE TRIGGER shelf_published_update BEFORE UPDATE ON shelf
      WHEN (SELECT status FROM edition WHERE id = OLD.edition_id) = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;
    CREATE TRIGGER shelf_published_delete BEFORE DELETE ON shelf
      WHEN (SELECT status FROM edition WHERE id = OLD.edition_id) = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;

    CREATE TRIGGER slot_published_insert BEFORE INSERT ON slot
      WHEN (SELECT e.status FROM shelf s JOIN edition e ON e.id = s.edition_id WHERE s.id = NEW.shelf_id) = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;
    CREATE TRIGGER slot_published_update BEFORE UPDATE ON slot
      WHEN (SELECT e.status FROM shelf s JOIN edition e ON e.id = s.edition_id WHERE s.id = OLD.shelf_id) = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;
    CREATE TRIGGER slot_published_delete BEFORE DELETE ON slot
      WHEN (SELECT e.status FROM shelf s JOIN edition e ON e.id = s.edition_id WHERE s.id = OLD.shelf_id) = 'published'
    BEGIN SELECT RAISE(ABORT, 'a published edition is read-only'); END;
  `,
};
