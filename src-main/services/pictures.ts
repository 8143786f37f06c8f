import { PictureRepo } from '../store/pictures.ts';
import type { Db } from '../store/workspace.ts';

/**
 * Item thumbnails as `data:` URLs: the page and the HTML export show the bytes they are given and never
 * fetch a picture (the content security policy allows images from `data:` and the app's own files only).
 * Items without a stored thumbnail are absent: the page draws its neutral placeholder for them.
 */
export function pictureUrls(db: Db, externalIds: readonly string[]): Map<string, string> {
  const out = new Map<string, string>();
  for (const t of new PictureRepo(db).thumbsOf([...new Set(externalIds)])) out.set(t.externalId, `data:${t.mime};base64,${t.data.toString('base64')}`);
  return out;
}
