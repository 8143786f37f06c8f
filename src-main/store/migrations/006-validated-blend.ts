import type { Migration } from './types.ts';

/**
 * Version 6: the validated blend (issue 10 item 3) is stored with the models it was learned for. One row
 * per training run: the blend's spec and validation figures as JSON (`spec`: kind single|blend, model,
 * weights, normalisation, the content path for cold items, NDCG@K of the hybrid and of each model alone,
 * customers, and the reason in words), the workspace fingerprint it was learned on, and the ids of the
 * models it was learned with. The newest row is current; older ones are kept one deep like models.
 */
export const validatedBlend: Migration = {
  version: 6,
  name: 'validated blend',
  up: `
    CREATE TABLE validated_blend (
      id          INTEGER PRIMARY KEY,
      created_at  INTEGER NOT NULL,
      fingerprint TEXT    NOT NULL,
      model_ids   TEXT    NOT NULL,
      spec        TEXT    NOT NULL
    ) STRICT;
  `,
};
