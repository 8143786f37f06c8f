import type { Migration } from './types.ts';

/**
 * Version 2: trained models. One row per training of one model kind; `current = 1` marks the model the
 * scorer uses (at most one per kind, enforced by a partial unique index). Older rows are kept as
 * history up to a limit set by the repository (store/models.ts), because factor blobs are large.
 * `fingerprint` is the data fingerprint (store/models.ts) of the workspace the model was trained on;
 * a model whose fingerprint differs from the workspace's current one is stale.
 */
export const models: Migration = {
  version: 2,
  name: 'trained models',
  up: `
    CREATE TABLE model (
      id          INTEGER PRIMARY KEY,
      kind        TEXT    NOT NULL CHECK (kind IN ('content', 'itemknn', 'ials', 'ease', 'popularity')),
      params      TEXT    NOT NULL DEFAULT '{}',
      fingerprint TEXT    NOT NULL,
      trained_at  INTEGER NOT NULL,
      train_ms    REAL    NOT NULL CHECK (train_ms >= 0),
      -- the fit report: iterations, losses per iteration, notes (JSON)
      report      TEXT    NOT NULL DEFAULT '{}',
      -- offline evaluation (JSON), filled in by the evaluator when it has run
      evaluation  TEXT,
      bytes       BLOB    NOT NULL,
      current     INTEGER NOT NULL DEFAULT 1 CHECK (current IN (0, 1))
    ) STRICT;
    CREATE UNIQUE INDEX model_current ON model(kind) WHERE current = 1;
    CREATE INDEX model_kind ON model(kind, trained_at);
  `,
};
