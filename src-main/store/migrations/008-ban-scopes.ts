import type { Migration } from './types.ts';

/**
 * Version 8 (brief in the app; renumber freely if another step took 8): two more ban scopes.
 * `later` (this edition and the editions copied from it on or after its date) and `until:YYYY-MM-DD`
 * (the same, up to that date) join shelf, edition and always (core/editing/ban-scope.ts). SQLite cannot
 * change a CHECK in place, so the table is rebuilt with its rows (SQLite docs, "ALTER TABLE": the
 * twelve-step generalised procedure; no other table references `ban`).
 */
export const banScopes: Migration = {
  version: 8,
  name: 'ban scopes: this edition and later, until a date',
  up: `
    CREATE TABLE ban_new (
      id         INTEGER PRIMARY KEY,
      shelf_id   INTEGER NOT NULL REFERENCES shelf(id),
      edition_id INTEGER NOT NULL REFERENCES edition(id),
      scope      TEXT    NOT NULL CHECK (
        scope IN ('shelf', 'edition', 'later', 'always') OR scope GLOB 'until:[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]'
      ),
      item_id    INTEGER REFERENCES item(id) ON DELETE CASCADE,
      facet      TEXT    CHECK (facet IN ('category', 'supplier', 'tag')),
      value      TEXT,
      CHECK ((item_id IS NULL) <> (facet IS NULL)),
      CHECK ((facet IS NULL) = (value IS NULL))
    ) STRICT;
    INSERT INTO ban_new (id, shelf_id, edition_id, scope, item_id, facet, value)
      SELECT id, shelf_id, edition_id, scope, item_id, facet, value FROM ban;
    DROP TABLE ban;
    ALTER TABLE ban_new RENAME TO ban;
    CREATE INDEX ban_scope ON ban(scope, edition_id);
  `,
};
