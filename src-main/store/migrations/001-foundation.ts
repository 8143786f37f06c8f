import type { Migration } from './types.ts';

/**
 * Version 1: the catalogue, the people and their signals.
 * Times are unix milliseconds (UTC). Tags and free attributes are JSON text: the scorer reads the
 * whole catalogue into memory anyway, and JSON keeps free attributes free.
 */
export const foundation: Migration = {
  version: 1,
  name: 'catalogue, customers, signals',
  up: `
    CREATE TABLE item (
      id          INTEGER PRIMARY KEY,
      external_id TEXT    NOT NULL UNIQUE,
      title       TEXT    NOT NULL,
      description TEXT    NOT NULL DEFAULT '',
      category    TEXT    NOT NULL DEFAULT '',
      tags        TEXT    NOT NULL DEFAULT '[]',
      supplier    TEXT    NOT NULL DEFAULT '',
      price       REAL,
      added_at    INTEGER,
      promoted    INTEGER NOT NULL DEFAULT 0 CHECK (promoted IN (0, 1)),
      available   INTEGER NOT NULL DEFAULT 1 CHECK (available IN (0, 1)),
      attributes  TEXT    NOT NULL DEFAULT '{}'
    ) STRICT;
    CREATE INDEX item_category ON item(category);
    CREATE INDEX item_supplier ON item(supplier);

    CREATE TABLE customer (
      id          INTEGER PRIMARY KEY,
      external_id TEXT NOT NULL UNIQUE,
      attributes  TEXT NOT NULL DEFAULT '{}'
    ) STRICT;

    CREATE TABLE signal (
      id          INTEGER PRIMARY KEY,
      customer_id INTEGER NOT NULL REFERENCES customer(id) ON DELETE CASCADE,
      item_id     INTEGER NOT NULL REFERENCES item(id) ON DELETE CASCADE,
      kind        TEXT    NOT NULL CHECK (kind IN ('view','basket','purchase','rating','read','click','other')),
      value       REAL    NOT NULL DEFAULT 1,
      at          INTEGER
    ) STRICT;
    -- One signal per (customer, item, kind, time): re-importing a file upserts instead of doubling.
    -- A timeless signal (at IS NULL) is keyed with -1 so it, too, is unique.
    CREATE UNIQUE INDEX signal_identity ON signal(customer_id, item_id, kind, ifnull(at, -1));
    -- Bulk reads for the scorer: by item (popularity, item-kNN), by time (splits, windows).
    CREATE INDEX signal_item ON signal(item_id);
    CREATE INDEX signal_at ON signal(at);

    CREATE TABLE import_log (
      id        INTEGER PRIMARY KEY,
      at        INTEGER NOT NULL,
      target    TEXT    NOT NULL,
      file      TEXT    NOT NULL,
      report    TEXT    NOT NULL
    ) STRICT;
  `,
};
