import { parse, CsvError } from 'csv-parse';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.ts';
import { readJsonArray, readJsonLines } from './json-source.ts';
import { TextCheck } from './text-check.ts';

/**
 * Reads a CSV, JSON or JSON Lines file as a header plus rows of values, with the 1-based line where each
 * row starts. CSV and JSON Lines stream (constant memory whatever the size); a JSON array is read whole,
 * which is fine for catalogues (use JSON Lines for big signal files).
 */
export type ImportFormat = 'csv' | 'json' | 'jsonl';

export interface RowSink {
  /** The header row (CSV, with its delimiter) or the keys of the records (JSON). May throw InputError. */
  header(headers: string[], delimiter?: string): void;
  /** A JSON record brought a key the header lacked; it becomes the next column. */
  newColumn(name: string): void;
  /** One data row; return false to stop reading (the preview does). */
  row(values: unknown[], line: number): boolean | void;
  /** A row that could not even be split into values (JSON Lines: invalid JSON on that line). */
  broken(line: number, reason: string): void;
}

export interface SourceInfo {
  format: ImportFormat;
  delimiter?: string;
}

export function formatOf(file: string, format?: ImportFormat): ImportFormat {
  if (format) return format;
  const ext = path.extname(file).toLowerCase();
  if (ext === '.csv' || ext === '.tsv' || ext === '.txt') return 'csv';
  if (ext === '.json') return 'json';
  if (ext === '.jsonl' || ext === '.ndjson') return 'jsonl';
  throw new InputError(`cannot tell the format from '${ext || 'no extension'}'; pass format csv, json or jsonl`, { file });
}

// 1 MiB reads, handed to csv-parse as Buffers: feeding it the decoded strings instead measured ~3.5x slower
// on 1M rows (csv-parse 7), so the UTF-8 check decodes beside the parser rather than in front of it.
const CHUNK = 1 << 20;

export async function readSource(file: string, format: ImportFormat, sink: RowSink, delimiter?: string): Promise<SourceInfo> {
  if (!fs.existsSync(file)) throw new InputError('no such file', { file });
  if (format === 'csv') return readCsv(file, sink, delimiter);
  if (format === 'jsonl') return readJsonLines(file, sink);
  return readJsonArray(file, sink);
}

/** Picks ',', ';' or tab by counting them outside quotes in the header line; a .tsv file defaults to tab. */
export function detectDelimiter(firstLine: string, file: string): string {
  const counts = new Map<string, number>([[',', 0], [';', 0], ['\t', 0]]);
  let quoted = false;
  for (const ch of firstLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && counts.has(ch)) counts.set(ch, counts.get(ch)! + 1);
  }
  let best = path.extname(file).toLowerCase() === '.tsv' ? '\t' : ',';
  let bestN = counts.get(best)!;
  for (const [d, n] of counts) if (n > bestN) [best, bestN] = [d, n];
  return best;
}

async function readCsv(file: string, sink: RowSink, given?: string): Promise<SourceInfo> {
  const check = new TextCheck(file);
  const stream = fs.createReadStream(file, { highWaterMark: CHUNK });
  let parser: ReturnType<typeof parse> | undefined;
  let delimiter = given ?? ',';
  let line = 1; // where the next record starts
  let headerDone = false;
  let stopped = false;
  /** One record starting at `start`; false when the sink asked to stop. */
  const deliver = (rec: string[], start: number): boolean => {
    if (rec.length === 1 && rec[0] === '') return true; // a blank line
    if (!headerDone) {
      headerDone = true;
      sink.header(rec, delimiter);
      return true;
    }
    return sink.row(rec, start) !== false;
  };
  const done = new Promise<void>((resolve, reject) => {
    const fail = (e: unknown) => {
      stream.destroy();
      parser?.destroy();
      reject(e instanceof CsvError ? csvInputError(file, e) : e);
    };
    const stop = () => {
      stopped = true;
      stream.destroy();
      parser?.destroy();
      resolve();
    };
    const startParser = () => {
      const p = makeParser(delimiter);
      parser = p;
      p.on('error', fail);
      p.on('end', () => resolve());
      p.on('readable', () => {
        try {
          let rec: string[] | null;
          while (!stopped && (rec = p.read() as string[] | null) !== null) {
            const start = line;
            // csv-parse's own per-record line info (on_record/info) costs ~3x its parse time; count instead:
            // a record spans one line plus the line breaks inside its quoted fields (RFC 4180 rule 6).
            line += 1;
            for (const f of rec) for (let i = f.indexOf('\n'); i >= 0; i = f.indexOf('\n', i + 1)) line++;
            if (!deliver(rec, start)) stop();
          }
        } catch (e) {
          fail(e);
        }
      });
    };
    /** Passes one chunk of raw bytes (csv-parse decodes them; TextCheck has already proved them UTF-8). */
    const take = (bytes: Buffer, last: boolean) => {
      if (bytes.length > 0 && !parser!.write(bytes)) {
        stream.pause();
        parser!.once('drain', () => stream.resume());
      }
      if (last) parser!.end();
    };
    stream.on('error', fail);
    stream.on('data', (chunk) => {
      try {
        const bytes = chunk as Buffer;
        const text = check.chunk(bytes);
        if (!parser) {
          const nl = text.indexOf('\n');
          if (!given) delimiter = detectDelimiter((nl < 0 ? text : text.slice(0, nl)).replace(/^\uFEFF/, ''), file);
          startParser();
        }
        if (!stopped) take(bytes, false);
      } catch (e) {
        fail(e);
      }
    });
    stream.on('end', () => {
      try {
        check.end();
        if (stopped) return;
        if (parser) take(Buffer.alloc(0), true);
        else resolve();
      } catch (e) {
        fail(e);
      }
    });
  });
  await done;
  return { format: 'csv', delimiter };
}

function makeParser(delimiter: string) {
  // RFC 4180 quoting ('"' doubled inside quoted fields); a BOM is dropped; rows of the wrong width are
  // passed on (relax_column_count) so each is rejected with its own line instead of stopping the file.
  return parse({ delimiter, bom: true, relax_column_count: true, skip_empty_lines: false });
}

function csvInputError(file: string, e: CsvError): InputError {
  const ctx = e as CsvError & { lines?: number; column?: number | string };
  const reason = e.message.replace(/^Invalid [^:]*: /, '').replace(/ at line \d+.*$/, '');
  const where: { file: string; line?: number; column?: number } = { file };
  if (typeof ctx.lines === 'number') where.line = ctx.lines;
  if (typeof ctx.column === 'number') where.column = ctx.column + 1;
  return new InputError(`not readable as CSV: ${reason}`, where);
}
