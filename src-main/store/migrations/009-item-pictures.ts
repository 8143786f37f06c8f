import type { Migration } from './types.ts';

/**
 * Item pictures (issue 12, item 8).
 * - `picture_thumb`: one small thumbnail per distinct source picture, keyed by the sha256 of the source
 *   file's bytes, so a picture shared by many items, or imported again, is made once. `recipe` names the
 *   settings it was made with (ingest/thumbnail.ts): a thumbnail of an older recipe is made again. Its size
 *   is bounded here as well as where it is made, so no path can store a large blob.
 * - `item_picture`: what the item's file named and what became of it. Only `ready` has a thumbnail; the other
 *   states show a neutral placeholder: the file was not there (`missing`), could not be read as a picture
 *   (`broken`), is a web address that was not fetched (`remote`), or was named in a file sent by a page,
 *   which may not make the app read paths on this machine (`unread`).
 */
export const itemPictures: Migration = {
  version: 9,
  name: 'item pictures: thumbnails by content hash',
  up: `
    CREATE TABLE picture_thumb (
      hash   TEXT    PRIMARY KEY CHECK (length(hash) = 64),
      recipe INTEGER NOT NULL,
      mime   TEXT    NOT NULL CHECK (mime IN ('image/webp', 'image/png')),
      width  INTEGER NOT NULL CHECK (width BETWEEN 1 AND 256),
      height INTEGER NOT NULL CHECK (height BETWEEN 1 AND 256),
      data   BLOB    NOT NULL CHECK (length(data) BETWEEN 1 AND 32768)
    ) STRICT;
    CREATE TABLE item_picture (
      item_id INTEGER PRIMARY KEY REFERENCES item(id) ON DELETE CASCADE,
      source  TEXT    NOT NULL,
      state   TEXT    NOT NULL CHECK (state IN ('ready', 'missing', 'broken', 'remote', 'unread')),
      thumb   TEXT    REFERENCES picture_thumb(hash),
      CHECK ((state = 'ready') = (thumb IS NOT NULL))
    ) STRICT;
    CREATE INDEX item_picture_thumb ON item_picture(thumb);
  `,
};
