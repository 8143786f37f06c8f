import type { AttributeValue, Item } from '../core/types.ts';
import type { Db } from './workspace.ts';

/** The row as stored; `rowToItem` is the one place that turns it into the core type. */
export interface ItemRow {
  id: number;
  external_id: string;
  title: string;
  description: string;
  category: string;
  tags: string;
  supplier: string;
  price: number | null;
  added_at: number | null;
  promoted: number;
  available: number;
  attributes: string;
}

export function rowToItem(r: ItemRow): Item {
  return {
    id: r.id,
    externalId: r.external_id,
    title: r.title,
    description: r.description,
    category: r.category,
    tags: JSON.parse(r.tags) as string[],
    supplier: r.supplier,
    price: r.price,
    addedAt: r.added_at,
    promoted: r.promoted === 1,
    available: r.available === 1,
    attributes: JSON.parse(r.attributes) as Record<string, AttributeValue>,
  };
}

/** Reads of the catalogue. Statements are prepared once per repository. */
export class ItemRepo {
  readonly #all;
  readonly #byExternal;
  readonly #byId;
  readonly #count;
  readonly #names;
  constructor(db: Db) {
    // Tags are a JSON list per item; json_each spreads them (SQLite docs, "The JSON1 extension": json_each).
    this.#names = db.prepare<[], { facet: string; value: string }>(
      `SELECT DISTINCT 'category' AS facet, category AS value FROM item WHERE category <> ''
       UNION SELECT DISTINCT 'supplier', supplier FROM item WHERE supplier <> ''
       UNION SELECT DISTINCT 'tag', j.value FROM item, json_each(item.tags) AS j WHERE j.value <> ''
       ORDER BY 1, 2`,
    );
    this.#all = db.prepare<[], ItemRow>('SELECT * FROM item ORDER BY id');
    this.#byExternal = db.prepare<[string], ItemRow>('SELECT * FROM item WHERE external_id = ?');
    this.#byId = db.prepare<[number], ItemRow>('SELECT * FROM item WHERE id = ?');
    this.#count = db.prepare<[], { n: number }>('SELECT count(*) AS n FROM item');
  }
  /** The whole catalogue in id order (the dense item index of every model follows this order). */
  all(): Item[] {
    return this.#all.all().map(rowToItem);
  }
  byExternalId(externalId: string): Item | undefined {
    const r = this.#byExternal.get(externalId);
    return r ? rowToItem(r) : undefined;
  }
  byId(id: number): Item | undefined {
    const r = this.#byId.get(id);
    return r ? rowToItem(r) : undefined;
  }
  count(): number {
    return this.#count.get()!.n;
  }
  /** The distinct categories, suppliers and tags the catalogue uses, each sorted (what a brief may name). */
  names(): { categories: string[]; suppliers: string[]; tags: string[] } {
    const out = { categories: [] as string[], suppliers: [] as string[], tags: [] as string[] };
    for (const r of this.#names.all()) {
      if (r.facet === 'category') out.categories.push(r.value);
      else if (r.facet === 'supplier') out.suppliers.push(r.value);
      else out.tags.push(r.value);
    }
    return out;
  }
}

/**
 * Items whose external id or title contains `query` (case-insensitive for ASCII, SQLite's LIKE). Order:
 * exact id, then id prefix, then title prefix, then the rest, each by title. LIKE's wildcards in the query
 * are escaped, so "50%" finds "50%" and nothing else. An empty (or blank) query finds nothing.
 */
export function searchItemsByIdOrTitle(db: Db, query: string, limit: number): Item[] {
  const q = query.trim();
  if (q === '') return [];
  const esc = q.replace(/[\\%_]/g, (m) => `\\${m}`);
  const rows = db
    .prepare<{ q: string; any: string; prefix: string; limit: number }, ItemRow>(
      `SELECT * FROM item
       WHERE external_id LIKE @any ESCAPE '\\' OR title LIKE @any ESCAPE '\\'
       ORDER BY CASE WHEN external_id = @q THEN 0 WHEN external_id LIKE @prefix ESCAPE '\\' THEN 1
                     WHEN title LIKE @prefix ESCAPE '\\' THEN 2 ELSE 3 END, title, external_id
       LIMIT @limit`,
    )
    .all({ q, any: `%${esc}%`, prefix: `${esc}%`, limit });
  return rows.map(rowToItem);
}
