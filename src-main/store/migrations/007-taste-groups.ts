import type { Migration } from './types.ts';

/**
 * Version 7: taste groups an editor can steer and name.
 * - `taste_group_settings` (one row at most): the range the number of groups is chosen in and the history a
 *   customer needs to join a group; absent means the defaults of core/audience/taste-groups.ts.
 * - `taste_group_name` and `taste_group_member`: a name and the customers the group held when it was named.
 *   Groups are found again at every training; a name goes to the new group that overlaps its members most
 *   (core/audience/names.ts). Members cascade with their customer, so `forget` erases them too.
 */
export const tasteGroups: Migration = {
  version: 7,
  name: 'taste groups: settings and names',
  up: `
    CREATE TABLE taste_group_settings (
      id          INTEGER PRIMARY KEY CHECK (id = 1),
      min_k       INTEGER NOT NULL,
      max_k       INTEGER NOT NULL,
      min_history INTEGER NOT NULL
    ) STRICT;
    CREATE TABLE taste_group_name (
      id   INTEGER PRIMARY KEY,
      name TEXT    NOT NULL UNIQUE
    ) STRICT;
    CREATE TABLE taste_group_member (
      name_id     INTEGER NOT NULL REFERENCES taste_group_name(id) ON DELETE CASCADE,
      customer_id INTEGER NOT NULL REFERENCES customer(id) ON DELETE CASCADE,
      PRIMARY KEY (name_id, customer_id)
    ) STRICT, WITHOUT ROWID;
  `,
};
