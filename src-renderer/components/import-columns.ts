/**
 * The columns each import target expects, in words, for the import screen. The field names and which are
 * required mirror src-main/ingest/fields.ts (FIELDS, REQUIRED), which the renderer may not import (layer
 * rule); test/renderer/import-screen.test.tsx checks the two agree.
 */
import type { ImportTarget } from '../state/import-slice.ts';

export interface ExpectedColumn {
  field: string;
  required: boolean;
  /** What goes in it and how it is read. */
  about: string;
}

export const EXPECTED_COLUMNS: Readonly<Record<ImportTarget, readonly ExpectedColumn[]>> = {
  items: [
    { field: 'id', required: true, about: "the shop's own item id (also read from sku, item id, product id)" },
    { field: 'title', required: false, about: 'the name shown on shelves; needed for a new item' },
    { field: 'description', required: false, about: 'free text, read for content similarity' },
    { field: 'category', required: false, about: 'one category per item' },
    { field: 'tags', required: false, about: 'a list separated by | (or ; in a comma-separated file), or a JSON array' },
    { field: 'supplier', required: false, about: 'the supplier, brand or publisher' },
    { field: 'price', required: false, about: 'a number, 0 or more' },
    { field: 'added_at', required: false, about: 'the day the item was added: an ISO 8601 date (2026-03-02), or a d/m/y or m/d/y date with its order chosen' },
    { field: 'promoted', required: false, about: 'yes/no, true/false or 1/0: a paid placement, labelled "Sponsored"' },
    { field: 'available', required: false, about: 'yes/no, true/false or 1/0: in stock' },
    {
      field: 'image',
      required: false,
      about: 'a picture file: a path (from the file\'s own folder) or file: address; web addresses are recorded, never fetched; a blank cell removes the picture',
    },
  ],
  customers: [{ field: 'id', required: true, about: "the shop's own customer id; other columns are kept as attributes" }],
  signals: [
    { field: 'customer', required: true, about: 'the customer id, as in the customers file' },
    { field: 'item', required: true, about: 'the item id, as in the items file' },
    { field: 'kind', required: true, about: 'view, basket, purchase, rating, read, click or other (or give every row one kind)' },
    { field: 'value', required: false, about: 'a number, 0 or more (a quantity or a rating); 1 when absent' },
    { field: 'at', required: false, about: 'when it happened: an ISO 8601 date and time; no zone means UTC' },
  ],
};

/** Where a reported problem sits in a sample: the row (by its file line) and the column (1-based number or header). */
export function rejectedCells(
  errors: readonly { line: number | null; column: string | number | null; reason: string }[],
  headers: readonly string[],
  sampleLines: readonly number[],
): Map<string, string> {
  const at = new Map<string, string>();
  for (const e of errors) {
    if (e.line === null || e.column === null) continue;
    const row = sampleLines.indexOf(e.line);
    const col = typeof e.column === 'number' ? e.column - 1 : headers.indexOf(e.column);
    if (row < 0 || col < 0) continue;
    const key = `${row}:${col}`;
    at.set(key, at.has(key) ? `${at.get(key)}; ${e.reason}` : e.reason);
  }
  return at;
}
