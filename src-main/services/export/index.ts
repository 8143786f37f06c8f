import type { EditionSnapshot } from '../../core/editing/snapshot.ts';
import { editionCsv, editionCsvNotes } from './csv.ts';
import { editionHtml } from './html.ts';
import { editionJson } from './json.ts';

export type ExportFormat = 'csv' | 'json' | 'html';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['csv', 'json', 'html'];

/** The edition in one of the export formats, as text; `pictures` (data: URLs by external id) embed in HTML. */
export function exportEdition(e: EditionSnapshot, format: ExportFormat, pictures?: ReadonlyMap<string, string>): string {
  return format === 'csv' ? editionCsv(e) : format === 'json' ? editionJson(e) : editionHtml(e, pictures);
}

/**
 * The notes file that goes beside an export, or null: only the CSV needs one, since a CSV is a bare table
 * (JSON and HTML carry their note inside).
 */
export function exportNotes(e: EditionSnapshot, format: ExportFormat): string | null {
  return format === 'csv' ? editionCsvNotes(e) : null;
}

export { csvCell } from './csv.ts';
export { EXPORT_CSP, escapeHtml } from './html.ts';
export { DISCLOSURE_NOTE, SPONSORED } from './labels.ts';
