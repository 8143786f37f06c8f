import fs from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import Papa from 'papaparse';
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
  /**
   * One data row; return false to stop reading (the preview does). `record` is the 1-based record number
   * in a JSON array, where many records may share a line (a minified file is one line): messages name it.
   */
  row(values: unknown[], line: number, record?: number): boolean | void;
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

// 1 MiB reads: big enough that per-chunk costs vanish, small enough that memory stays flat on any file.
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

/**
 * CSV through Papa Parse, fed the text TextCheck has proved to be UTF-8 (so a character split across two
 * 1 MiB reads is decoded whole). Papa Parse was chosen over csv-parse for throughput: on 1M signal rows
 * (42 MB) it read in 0.9 s against 1.7 s (measured 2026-12-02, bench/import.bench.ts data). Both follow
 * RFC 4180 for quoted fields; tests compare our records with csv-parse's on the whole file.
 *
 * Records are split on LF and one CR before it is dropped from the record's last field, so CRLF, LF and
 * files that mix them all read as csv-parse reads them (a bare CR elsewhere is data). A file with no LF
 * at all in its first read is taken to use CR alone.
 */
async function readCsv(file: string, sink: RowSink, given?: string): Promise<SourceInfo> {
  const check = new TextCheck(file);
  const bytes = fs.createReadStream(file, { highWaterMark: CHUNK });
  const chunks = (async function* decoded() {
    for await (const chunk of bytes) yield check.chunk(chunk as Buffer);
    yield check.end();
  })();
  // The delimiter and the line break are read from the first text, before Papa Parse starts (it copies
  // its options when it starts).
  let head = '';
  try {
    for (let c = await chunks.next(); !c.done; c = await chunks.next()) {
      head = c.value.replace(/^\uFEFF/, '');
      if (head.length > 0) break;
    }
  } catch (e) {
    bytes.destroy(); // a binary or non-UTF-8 start: close the file now, not when collected
    throw e;
  }
  const nl = head.indexOf('\n');
  const delimiter = given ?? detectDelimiter(nl < 0 ? head : head.slice(0, nl), file);
  const newline = nl < 0 && head.includes('\r') ? '\r' : '\n';
  const text = Readable.from(
    (async function* all() {
      yield head;
      yield* chunks;
    })(),
    { objectMode: true },
  );
  let line = 1; // where the next record starts
  let headerDone = false;
  let stopped = false;
  await new Promise<void>((resolve, reject) => {
    let settled = false;
    const settle = (fn: () => void) => {
      if (settled) return;
      settled = true;
      stopped = true;
      bytes.destroy();
      text.destroy();
      fn();
    };
    const fail = (e: unknown) => settle(() => reject(e));
    Papa.parse<string[]>(text, {
      delimiter,
      newline,
      quoteChar: '"',
      escapeChar: '"',
      skipEmptyLines: false,
      step(result, parser) {
        if (stopped) return;
        try {
          const rec = result.data;
          const start = line;
          // A record spans one line plus the line breaks inside its quoted fields (RFC 4180 rule 6).
          line += 1;
          for (const f of rec) for (let i = f.indexOf('\n'); i >= 0; i = f.indexOf('\n', i + 1)) line++;
          if (result.errors.length > 0) throw csvInputError(file, result.errors[0]!, start);
          const last = rec.length - 1;
          if (newline === '\n' && rec[last]!.endsWith('\r')) rec[last] = rec[last]!.slice(0, -1); // CRLF
          if (last === 0 && rec[0] === '') return; // a blank line
          if (!headerDone) {
            headerDone = true;
            sink.header(rec, delimiter);
          } else if (sink.row(rec, start) === false) {
            settle(resolve);
            parser.abort();
          }
        } catch (e) {
          fail(e); // before abort(), which calls `complete`
          parser.abort();
        }
      },
      complete: () => settle(resolve),
      error: (e: Error) => fail(e),
    });
  });
  return { format: 'csv', delimiter };
}

/** Papa Parse's quote errors in our words, at the line where the record starts. */
function csvInputError(file: string, e: Papa.ParseError, line: number): InputError {
  const reason =
    e.code === 'MissingQuotes'
      ? 'a quoted field is never closed (a double quote is missing)'
      : e.code === 'InvalidQuotes'
        ? 'text follows the closing double quote of a quoted field (write a double quote inside a quoted field as two)'
        : e.message;
  return new InputError(`not readable as CSV: ${reason}`, { file, line });
}
