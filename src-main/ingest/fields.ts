import { InputError } from '../core/errors.ts';
import type { SignalKind } from '../core/types.ts';
import { cut, quote } from '../core/util/cut.ts';

/**
 * The canonical fields of each import target and the header words that name them. A file's headers are
 * matched after folding case and dropping spaces, underscores and hyphens ("Item ID" = "item_id" = "itemid").
 */
export type ImportTarget = 'items' | 'customers' | 'signals';

export const FIELDS = {
  items: ['id', 'title', 'description', 'category', 'tags', 'supplier', 'price', 'added_at', 'promoted', 'available', 'image'],
  customers: ['id'],
  signals: ['customer', 'item', 'kind', 'value', 'at'],
} as const satisfies Record<ImportTarget, readonly string[]>;

export type FieldOf<T extends ImportTarget> = (typeof FIELDS)[T][number];
export type AnyField = FieldOf<ImportTarget>;
/** Field -> source header. */
export type Mapping = Partial<Record<AnyField, string>>;

/** Columns a file must have. A new item also needs a title; that is checked per row (see rows.ts). */
export const REQUIRED: Readonly<Record<ImportTarget, readonly string[]>> = {
  items: ['id'],
  customers: ['id'],
  signals: ['customer', 'item', 'kind'],
};

const SYNONYMS: Readonly<Record<ImportTarget, Readonly<Record<string, readonly string[]>>>> = {
  items: {
    // Beside the generic names, the id columns of common exports (a stock code, a track's or a book's id).
    id: ['id', 'itemid', 'sku', 'productid', 'item', 'externalid', 'articleid', 'stockcode', 'productcode', 'itemcode', 'trackid', 'songid', 'artistid', 'bookid', 'isbn', 'movieid', 'filmid', 'gameid'],
    title: ['title', 'name', 'productname', 'itemname', 'headline'],
    description: ['description', 'desc', 'summary', 'body', 'text'],
    category: ['category', 'section', 'department', 'genre'],
    tags: ['tags', 'tag', 'keywords', 'labels'],
    supplier: ['supplier', 'vendor', 'brand', 'publisher', 'author', 'maker'],
    price: ['price', 'cost', 'amount', 'unitprice'],
    added_at: ['addedat', 'added', 'dateadded', 'createdat', 'created', 'publishedat', 'published', 'releasedate'],
    promoted: ['promoted', 'sponsored', 'ispromoted', 'promo'],
    available: ['available', 'instock', 'isavailable', 'availability', 'active'],
    // A picture file's path or address (ingest/pictures.ts decides which are read).
    image: ['image', 'imagepath', 'imagefile', 'imageurl', 'imagelink', 'picture', 'photo', 'img'],
  },
  customers: {
    id: ['id', 'customerid', 'userid', 'reader', 'readerid', 'customer', 'user', 'externalid', 'memberid'],
  },
  signals: {
    customer: ['customer', 'customerid', 'userid', 'user', 'username', 'reader', 'readerid', 'memberid', 'visitorid', 'listener', 'listenerid', 'buyerid', 'clientid', 'accountid'],
    // What a play-count, basket or library export names the thing counted. Two of them in one file (artist and
    // track) are refused as ambiguous below: which one the shelf is about is the editor's call (--map item=...).
    item: ['item', 'itemid', 'sku', 'productid', 'product', 'articleid', 'article', 'stockcode', 'productcode', 'itemcode', 'artist', 'artistid', 'track', 'trackid', 'song', 'songid', 'book', 'bookid', 'isbn', 'movie', 'movieid', 'film', 'filmid', 'game', 'gameid'],
    kind: ['kind', 'event', 'eventtype', 'type', 'action', 'interaction'],
    value: ['value', 'rating', 'bookrating', 'score', 'qty', 'quantity', 'count', 'weight', 'plays', 'playcount', 'playcounts', 'numplays', 'listens', 'listencount', 'times', 'timesplayed', 'timesbought', 'units'],
    at: ['at', 'timestamp', 'time', 'date', 'when', 'datetime', 'eventtime', 'createdat', 'ts', 'invoicedate', 'orderdate'],
  },
};

export const foldHeader = (h: string): string => h.toLowerCase().replace(/[\s_-]+/g, '');

/** How a file's columns feed a target: the column index of each field, and the columns kept as attributes. */
export interface ColumnPlan {
  target: ImportTarget;
  headers: string[];
  /** Field -> header actually used (explicit or detected). */
  mapping: Mapping;
  /** Field -> column index, -1 when the file lacks it. */
  index: Record<string, number>;
  /** Columns that are no field: item and customer attributes; ignored for signals. */
  extra: number[];
  /** Signals from a file without a kind column: the kind every row gets (`kind` of the import options). */
  everyRowKind?: SignalKind;
}

/**
 * Checks the header row and matches it to the target's fields. Explicit `mapping` entries win; the rest are
 * detected by synonym. Everything wrong with the header is a file-level InputError (line 1): no row could
 * be read correctly under a wrong header.
 *
 * `everyRowKind` (signals only) stands in for a kind column that a shop's export often lacks (a file of
 * purchases only: customer, item, count). A file that has a kind column AND a kind for every row is
 * refused rather than one silently overriding the other: the two disagree about where the kind comes from.
 */
export function planColumns(file: string, target: ImportTarget, headers: string[], explicit: Mapping = {}, everyRowKind?: SignalKind): ColumnPlan {
  if (everyRowKind !== undefined && target !== 'signals') {
    throw new InputError(`a kind for every row is for signals only, not ${target}`, { file });
  }
  const fields: readonly string[] = FIELDS[target];
  const seen = new Map<string, number>();
  headers.forEach((raw, i) => {
    const h = raw.trim();
    if (h === '') throw new InputError(`column ${i + 1} has no header name`, { file, line: 1, column: i + 1 });
    const prev = seen.get(h);
    if (prev !== undefined) {
      throw new InputError(`duplicate header ${quote(h)} (columns ${prev + 1} and ${i + 1})`, { file, line: 1, column: i + 1 });
    }
    seen.set(h, i);
  });
  const trimmed = headers.map((h) => h.trim());
  const index: Record<string, number> = {};
  const mapping: Mapping = {};
  for (const [field, header] of Object.entries(explicit)) {
    if (!fields.includes(field)) {
      throw new InputError(`mapping names ${quote(field)}, which is not a field of ${target} (fields: ${fields.join(', ')})`, { file });
    }
    if (header === undefined) continue;
    const at = trimmed.indexOf(header.trim());
    if (at < 0) {
      throw new InputError(`mapping names column ${quote(header)} for ${field}, but the file has no such column (columns: ${cut(trimmed.join(', '))})`, {
        file,
        line: 1,
      });
    }
    index[field] = at;
    mapping[field as AnyField] = trimmed[at]!;
  }
  const taken = new Set(Object.values(index));
  for (const field of fields) {
    if (index[field] !== undefined) continue;
    const words = SYNONYMS[target][field] ?? [];
    const hits = trimmed.map((h, i) => (words.includes(foldHeader(h)) && !taken.has(i) ? i : -1)).filter((i) => i >= 0);
    if (hits.length > 1) {
      // Prefer the column named exactly like the field; otherwise refuse to guess.
      const exact = hits.filter((i) => foldHeader(trimmed[i]!) === foldHeader(field));
      if (exact.length !== 1) {
        const names = hits.map((i) => quote(trimmed[i]!)).join(' and ');
        throw new InputError(`columns ${names} could both be ${field}; pass a mapping`, { file, line: 1, column: hits[1]! + 1 });
      }
      hits.splice(0, hits.length, exact[0]!);
    }
    if (hits.length === 1) {
      index[field] = hits[0]!;
      mapping[field as AnyField] = trimmed[hits[0]!]!;
      taken.add(hits[0]!);
    } else index[field] = -1;
  }
  if (everyRowKind !== undefined && index.kind! >= 0) {
    throw new InputError(
      `the file has a kind column (${quote(trimmed[index.kind!]!)}), and every row was also given the kind ${everyRowKind} ` +
        '(--kind on the command line); that is only for files without one: leave it out to read the kind from the column',
      { file, line: 1, column: index.kind! + 1 },
    );
  }
  const missing = REQUIRED[target].filter((f) => index[f] === -1 && !(f === 'kind' && everyRowKind !== undefined));
  if (missing.length > 0) {
    const kindHint = missing.includes('kind') ? ', or give every row one kind (--kind on the command line)' : '';
    throw new InputError(
      `missing required column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} for ${target} (columns: ${cut(trimmed.join(', '))}); rename them or pass a mapping${kindHint}`,
      { file, line: 1 },
    );
  }
  const extra = trimmed.map((_, i) => i).filter((i) => !taken.has(i));
  return { target, headers: trimmed, mapping, index, extra, ...(everyRowKind !== undefined && { everyRowKind }) };
}
