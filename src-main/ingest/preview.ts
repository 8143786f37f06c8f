import { InputError } from '../core/errors.ts';
import type { SignalKind } from '../core/types.ts';
import { planColumns, type ImportTarget, type Mapping } from './fields.ts';
import { rowConverter, type Problem } from './rows.ts';
import { formatOf, readSource, type ImportFormat } from './source.ts';
import type { DateOrder } from './values.ts';

export interface PreviewOptions {
  format?: ImportFormat;
  delimiter?: string;
  mapping?: Mapping;
  dateOrder?: DateOrder;
  /** Signals: the kind of every row, for a file without a kind column. */
  kind?: SignalKind;
}

export interface ImportPreview {
  format: ImportFormat;
  delimiter: string | null;
  headers: string[];
  /** Field -> header, as the import would use it (explicit mapping first, then detected). */
  mapping: Mapping;
  /** Columns that are no field: kept as attributes for items and customers, ignored for signals. */
  extraColumns: string[];
  /** The first SAMPLE_ROWS data rows as text, for the column-mapping screen. */
  sampleRows: string[][];
  /** The file line each sample row starts on (a quoted CSV field may span lines), to point at a rejected cell. */
  sampleLines: number[];
  /** Everything wrong so far, each as `file:line:column: reason`. Empty means the sample would import. */
  problems: string[];
}

export const SAMPLE_ROWS = 20;

/**
 * Reads the header and the first rows without touching any workspace, and checks them with the same
 * column plan and converters as the import. Errors become `problems` instead of exceptions: the mapping
 * screen shows them next to the columns so the editor can fix the mapping and look again.
 */
export async function previewFile(file: string, target: ImportTarget, o: PreviewOptions = {}): Promise<ImportPreview> {
  const out: ImportPreview = { format: 'csv', delimiter: null, headers: [], mapping: {}, extraColumns: [], sampleRows: [], sampleLines: [], problems: [] };
  let convert: ReturnType<typeof rowConverter> | undefined;
  const problems: Problem[] = [];
  try {
    out.format = formatOf(file, o.format);
    const info = await readSource(
      file,
      out.format,
      {
        header(headers, delimiter) {
          out.headers = headers.map((h) => h.trim());
          out.delimiter = delimiter ?? null;
          const plan = planColumns(file, target, headers, o.mapping, o.kind);
          out.mapping = plan.mapping;
          out.extraColumns = plan.extra.map((i) => plan.headers[i]!);
          convert = rowConverter({ plan, dateOrder: o.dateOrder, delimiter });
        },
        newColumn(name) {
          out.headers.push(name);
        },
        broken(line, reason) {
          out.problems.push(new InputError(reason, { file, line }).describe());
        },
        row(values, line, record) {
          out.sampleRows.push(values.map(asText));
          out.sampleLines.push(line);
          problems.length = 0;
          convert?.(values, problems);
          const inRecord = record === undefined ? '' : `record ${record}: `;
          for (const p of problems) out.problems.push(new InputError(inRecord + p.reason, { file, line, column: p.column }).describe());
          return out.sampleRows.length < SAMPLE_ROWS;
        },
      },
      o.delimiter,
    );
    out.delimiter = info.delimiter ?? out.delimiter;
    if (out.headers.length === 0) out.problems.push(new InputError('the file is empty', { file }).describe());
    else if (out.sampleRows.length === 0) out.problems.push(new InputError('the file has a header but no data rows', { file, line: 2 }).describe());
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    out.problems.push(e.describe());
  }
  return out;
}

function asText(v: unknown): string {
  if (v === undefined || v === null) return '';
  if (typeof v === 'string') return v;
  return typeof v === 'object' ? JSON.stringify(v) : String(v);
}
