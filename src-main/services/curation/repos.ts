/**
 * The curation repositories of one connection, made once. Each repository only holds statements prepared
 * on its connection (better-sqlite3 docs/api.md: prepare once, run many), so sharing them is safe, and an
 * editorial action no longer prepares some forty statements before it starts.
 */
import { EditionRepo } from '../../store/editions.ts';
import { EditorialRepo } from '../../store/editorial-actions.ts';
import { ItemRepo } from '../../store/items.ts';
import { ShelfRepo } from '../../store/shelves.ts';
import type { Db } from '../../store/workspace.ts';

export interface CurationRepos {
  editions: EditionRepo;
  shelves: ShelfRepo;
  editorial: EditorialRepo;
  items: ItemRepo;
}

const byDb = new WeakMap<Db, CurationRepos>();

export function curationRepos(db: Db): CurationRepos {
  let r = byDb.get(db);
  if (!r) {
    r = { editions: new EditionRepo(db), shelves: new ShelfRepo(db), editorial: new EditorialRepo(db), items: new ItemRepo(db) };
    byDb.set(db, r);
  }
  return r;
}
