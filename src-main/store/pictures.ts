import type { Db } from './workspace.ts';

/** What became of the picture an item's file named (migration 008). Only 'ready' has a thumbnail. */
export type PictureState = 'ready' | 'missing' | 'broken' | 'remote' | 'unread';

export interface Thumb {
  hash: string;
  recipe: number;
  mime: 'image/webp' | 'image/png';
  width: number;
  height: number;
  data: Buffer;
}

/** An item's stored thumbnail, by external id, as the page and the exports show it. */
export interface ItemThumb {
  externalId: string;
  mime: string;
  data: Buffer;
}

/**
 * Reads and writes of item pictures. Writes run inside the caller's transaction (the import's), so a
 * failed import leaves no picture rows behind; statements are prepared once.
 */
export class PictureRepo {
  readonly #db: Db;
  readonly #hasThumb;
  readonly #putThumb;
  readonly #setPicture;
  readonly #clearPicture;
  readonly #itemId;

  constructor(db: Db) {
    this.#db = db;
    this.#hasThumb = db.prepare('SELECT 1 FROM picture_thumb WHERE hash = ? AND recipe = ?').pluck();
    this.#putThumb = db.prepare(
      'INSERT INTO picture_thumb (hash, recipe, mime, width, height, data) VALUES (@hash, @recipe, @mime, @width, @height, @data) ' +
        'ON CONFLICT(hash) DO UPDATE SET recipe = excluded.recipe, mime = excluded.mime, width = excluded.width, height = excluded.height, data = excluded.data',
    );
    this.#setPicture = db.prepare(
      'INSERT INTO item_picture (item_id, source, state, thumb) VALUES (?, ?, ?, ?) ' +
        'ON CONFLICT(item_id) DO UPDATE SET source = excluded.source, state = excluded.state, thumb = excluded.thumb',
    );
    this.#clearPicture = db.prepare('DELETE FROM item_picture WHERE item_id = ?');
    this.#itemId = db.prepare('SELECT id FROM item WHERE external_id = ?').pluck();
  }

  /** Whether a thumbnail of these source bytes, made with this recipe, is stored already. */
  hasThumb(hash: string, recipe: number): boolean {
    return this.#hasThumb.get(hash, recipe) !== undefined;
  }

  putThumb(t: Thumb): void {
    this.#putThumb.run(t);
  }

  /** Records what the item's file named; `thumb` is the source hash, for 'ready' only. Unknown item: false. */
  setPicture(externalId: string, source: string, state: PictureState, thumb: string | null): boolean {
    const id = this.#itemId.get(externalId) as number | undefined;
    if (id === undefined) return false;
    this.#setPicture.run(id, source, state, thumb);
    return true;
  }

  /** The item's file left its picture cell blank: it has none now. Whether it had one. */
  clearPicture(externalId: string): boolean {
    const id = this.#itemId.get(externalId) as number | undefined;
    return id !== undefined && this.#clearPicture.run(id).changes > 0;
  }

  /** Thumbnails no item shows any more (replaced or cleared pictures, deleted items): removed. */
  dropUnusedThumbs(): number {
    return this.#db.prepare('DELETE FROM picture_thumb WHERE hash NOT IN (SELECT thumb FROM item_picture WHERE thumb IS NOT NULL)').run().changes;
  }

  /** The thumbnails of the given items that have one; items without (or unknown ids) are absent. */
  thumbsOf(externalIds: readonly string[]): ItemThumb[] {
    if (externalIds.length === 0) return [];
    // json_each binds the whole list as one parameter, whatever its length (SQLite's bound-parameter limit).
    return this.#db
      .prepare(
        `SELECT i.external_id AS externalId, t.mime AS mime, t.data AS data
           FROM json_each(?) j JOIN item i ON i.external_id = j.value
           JOIN item_picture p ON p.item_id = i.id JOIN picture_thumb t ON t.hash = p.thumb`,
      )
      .all(JSON.stringify(externalIds)) as ItemThumb[];
  }

  /** The item's picture row, for reports and tests. */
  pictureOf(externalId: string): { source: string; state: PictureState; thumb: string | null } | undefined {
    return this.#db
      .prepare('SELECT p.source, p.state, p.thumb FROM item_picture p JOIN item i ON i.id = p.item_id WHERE i.external_id = ?')
      .get(externalId) as { source: string; state: PictureState; thumb: string | null } | undefined;
  }

  /** How many items are in each picture state, and how many thumbnails are stored. */
  counts(): { states: Record<PictureState, number>; thumbs: number } {
    const states: Record<PictureState, number> = { ready: 0, missing: 0, broken: 0, remote: 0, unread: 0 };
    for (const r of this.#db.prepare('SELECT state, count(*) AS n FROM item_picture GROUP BY state').all() as { state: PictureState; n: number }[]) {
      states[r.state] = r.n;
    }
    const thumbs = this.#db.prepare('SELECT count(*) FROM picture_thumb').pluck().get() as number;
    return { states, thumbs };
  }
}
