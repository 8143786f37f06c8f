/**
 * CSV export of an edition, one row per slot. Quoting follows RFC 4180 (fields with comma, quote, CR or
 * LF are quoted; quotes doubled; CRLF line ends). Cells that a spreadsheet would read as a formula —
 * beginning with =, +, -, @, tab or carriage return — are neutralised by a leading single quote, as the
 * OWASP "CSV Injection" guidance advises (DESIGN.md "Reliability and safety rules").
 */
import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { DISCLOSURE_NOTE, SPONSORED } from './labels.ts';

const FORMULA_START = new Set(['=', '+', '-', '@', '\t', '\r']);

/** One cell, neutralised then quoted. */
export function csvCell(value: string | number | boolean | null): string {
  let s = value === null ? '' : String(value);
  if (s.length > 0 && FORMULA_START.has(s[0]!)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

export const CSV_HEADER = ['edition', 'date', 'shelf', 'slot', 'item', 'title', 'category', 'supplier', 'sponsored', 'pinned', 'percentile'];

export function editionCsv(e: EditionSnapshot): string {
  const rows: (string | number | boolean | null)[][] = [CSV_HEADER];
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
        s.percentile === null ? null : Math.round(s.percentile * 100),
      ]);
    }
  }
  rows.push([`Note: ${DISCLOSURE_NOTE}`]);
  return rows.map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
