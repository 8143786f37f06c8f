import { InputError } from '../../core/errors.ts';
import { curationRepos } from './repos.ts';
import type { Db } from '../../store/workspace.ts';

/**
 * Briefs store anchors as workspace row ids (stable under re-imports that change nothing else); people and
 * the api name items by the shop's own ids. These two functions are the only crossing between the two.
 */
export function anchorRowIds(db: Db, externalIds: readonly string[]): number[] {
  const items = curationRepos(db).items;
  return externalIds.map((ext) => {
    const item = items.byExternalId(ext);
    if (!item) throw new InputError(`anchor '${ext}': no item with this id in the workspace`, { column: 'anchors' });
    return item.id;
  });
}

export function anchorExternalIds(db: Db, rowIds: readonly number[]): string[] {
  const items = curationRepos(db).items;
  return rowIds.map((id) => items.byId(id)?.externalId ?? `#${id}`);
}
