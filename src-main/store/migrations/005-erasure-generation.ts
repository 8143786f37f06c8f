import type { Migration } from './types.ts';

/**
 * Version 5: a small key/value table for facts about the workspace as a whole, starting with the erasure
 * generation: a counter that `forget` raises in its own transaction. A training run reads it together with
 * its data; the transaction that saves the run compares it, so a model trained on data read before an
 * erasure can never be stored afterwards (store/erasure.ts). `scrub_pending` is 1 while an erasure's
 * freed bytes may still sit in the write-ahead log (another connection was reading when it ran).
 */
export const erasureGeneration: Migration = {
  version: 5,
  name: 'workspace facts: the erasure generation',
  up: `
    CREATE TABLE workspace_meta (
      key   TEXT    PRIMARY KEY,
      value INTEGER NOT NULL
    ) STRICT;
    INSERT INTO workspace_meta (key, value) VALUES ('erasure_generation', 0), ('scrub_pending', 0);
  `,
};
