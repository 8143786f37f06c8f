/**
 * CSV export of an edition, one row per slot and nothing else: a header line and records, as RFC 4180
 * defines the format (it has no comments), so any reader takes it as one table. What the table needs said
 * beside it (the columns, the sponsored disclosure) goes in a separate notes file (`editionCsvNotes`).
 * Quoting follows RFC 4180 (fields with comma, quote, CR or LF are quoted; quotes doubled; CRLF line ends). Cells that a spreadsheet would read as a formula —
 * beginning with =, +, -, @, tab or carriage return — are neutralised by a leading single quote, as the
 * OWASP "CSV Injection" guidance advises (DESIGN.md "Reliability and safety rules").
 */
import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { DISCLOSURE_NOTE, exportedPercentile, SPONSORED } from './labels.ts';

const FORMULA_START = new Set(['=', '+', '-', '@', '\t', '\r']);

/** One cell, neutralised then quoted. */
export function csvCell(value: string | number | boolean | null): string {
  let s = value === null ? '' : String(value);
  if (s.length > 0 && FORMULA_START.has(s[0]!)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

export const CSV_HEADER = ['edition', 'date', 'shelf', 'slot', 'item', 'title', 'category', 'supplier', 'sponsored', 'pinned', 'percentile', 'rank'] as const;

export function editionCsv(e: EditionSnapshot): string {
  const rows: (string | number | boolean | null)[][] = [[...CSV_HEADER]];
  for (const shelf of e.shelves) {
    for (const s of shelf.slots) {
      rows.push([
        e.edition.label,
        e.edition.date,
        shelf.label,
        s.slot + 1,
        s.externalId,
        s.title,
        s.category,
        s.supplier,
        s.promoted ? SPONSORED : '',
        s.pinned ? 'pinned' : '',
        exportedPercentile(s.percentile),
        s.rank ?? null,
      ]);
    }
  }
  return rows.map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

/** What each column holds, in CSV_HEADER order. */
const COLUMN_NOTES: Readonly<Record<(typeof CSV_HEADER)[number], string>> = {
  edition: 'the edition label',
  date: 'the edition date, ISO 8601 (YYYY-MM-DD)',
  shelf: 'the shelf label',
  slot: 'the position on the shelf, from 1',
  item: "the shop's own item id (empty for an empty slot)",
  title: 'the item title; a cell a spreadsheet would read as a formula starts with a single quote',
  category: 'the item category',
  supplier: 'the item supplier',
  sponsored: `"${SPONSORED}" for a promoted (paid) item, else empty`,
  pinned: '"pinned" when the editor fixed the item at this slot',
  percentile: "the item's score as a percentile of the shelf's pool when it was filled, 0 to 100",
  rank: "the item's place by score in the shelf's pool when it was filled, 1 = best (different scores never share a place); empty for an edition published before ranks were kept",
};

/** The notes that travel beside the CSV: what it is, its columns, and the sponsored disclosure. */
export function editionCsvNotes(e: EditionSnapshot): string {
  const columns = CSV_HEADER.map((c) => `  ${c}: ${COLUMN_NOTES[c]}`);
  return [`${e.edition.label} (${e.edition.date}): one row per slot.`, '', 'Columns:', ...columns, '', DISCLOSURE_NOTE, ''].join('\n');
}
