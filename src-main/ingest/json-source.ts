import fs from 'node:fs';
import { InputError } from '../core/errors.ts';
import { quote } from '../core/util/cut.ts';
import type { RowSink, SourceInfo } from './source.ts';
import { TextCheck } from './text-check.ts';

/**
 * JSON Lines (streamed, one object per line) and JSON arrays of objects (read whole: fine for catalogues;
 * big signal files should be JSON Lines or CSV). Records become rows of values in key order.
 */
const CHUNK = 1 << 20;

/** Keys to column indexes, growing as JSON records bring new keys. */
class KeyColumns {
  readonly index = new Map<string, number>();
  constructor(private readonly sink: RowSink) {}
  header(keys: string[]): void {
    keys.forEach((k, i) => this.index.set(k, i));
    this.sink.header(keys);
  }
  values(obj: Record<string, unknown>): unknown[] {
    const out = new Array<unknown>(this.index.size);
    for (const k in obj) {
      let i = this.index.get(k);
      if (i === undefined) {
        i = this.index.size;
        this.index.set(k, i);
        this.sink.newColumn(k);
      }
      out[i] = obj[k];
    }
    return out;
  }
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

export async function readJsonLines(file: string, sink: RowSink): Promise<SourceInfo> {
  const check = new TextCheck(file);
  const keys = new KeyColumns(sink);
  let started = false;
  let carry = '';
  let lineNo = 0;
  const take = (lineText: string): boolean => {
    lineNo++;
    const t = lineNo === 1 ? lineText.replace(/^\uFEFF/, '').trim() : lineText.trim();
    if (t === '') return true;
    let v: unknown;
    try {
      v = JSON.parse(t);
    } catch (e) {
      if (!started) throw new InputError(`not JSON Lines: ${(e as Error).message}`, { file, line: lineNo });
      sink.broken(lineNo, `not valid JSON: ${(e as Error).message}`);
      return true;
    }
    if (!isRecord(v)) {
      if (!started) throw new InputError('not JSON Lines: each line must be a JSON object', { file, line: lineNo });
      sink.broken(lineNo, 'the line is not a JSON object');
      return true;
    }
    if (!started) {
      started = true;
      keys.header(Object.keys(v)); // later keys become new columns (JSON Lines is read in one pass)
    }
    return sink.row(keys.values(v), lineNo) !== false;
  };
  const stream = fs.createReadStream(file, { highWaterMark: CHUNK });
  try {
    for await (const chunk of stream) {
      const parts = (carry + check.chunk(chunk as Buffer)).split('\n');
      carry = parts.pop()!;
      for (const p of parts) if (!take(p)) return { format: 'jsonl' };
    }
    check.end();
    if (carry !== '') take(carry);
  } finally {
    stream.destroy();
  }
  return { format: 'jsonl' };
}

export async function readJsonArray(file: string, sink: RowSink): Promise<SourceInfo> {
  const bytes = await fs.promises.readFile(file);
  const check = new TextCheck(file);
  const text = check.chunk(bytes, true).replace(/^\uFEFF/, '');
  if (text.trim() === '') return { format: 'json' };
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    const line = pos ? undefined : syntaxErrorLine(text);
    const where = pos ? lineColumn(text, Number(pos[1])) : line !== undefined ? { line } : {};
    throw new InputError(`not valid JSON: ${msg.replace(/ in JSON at position \d+.*$/, '').replace(/, "[\s\S]*$/, '')}`, { file, ...where });
  }
  if (!Array.isArray(data)) {
    throw new InputError(`the file's top level is ${jsonKind(data)}, not a list of records: a JSON import is a list of objects [{...}, {...}]`, { file, line: 1 });
  }
  const lines = elementSpans(text).lines;
  const keys = new KeyColumns(sink);
  // The header is every key of every record, so a field first present in record 500 is still a field.
  const union = new Set<string>();
  for (const v of data) if (isRecord(v)) for (const k in v) union.add(k);
  let started = false;
  for (let i = 0; i < data.length; i++) {
    const v: unknown = data[i];
    const line = lines[i] ?? 1;
    if (!isRecord(v)) {
      sink.broken(line, `record ${i + 1} is not a JSON object`);
      continue;
    }
    if (!started) {
      started = true;
      keys.header([...union]);
    }
    if (sink.row(keys.values(v), line, i + 1) === false) break;
  }
  return { format: 'json' };
}

/** What a JSON value is, for a message: "an object (keys 'items', 'total')", "a string". */
function jsonKind(v: unknown): string {
  if (v === null) return 'null';
  if (typeof v === 'object') {
    const keys = Object.keys(v);
    if (keys.length === 0) return 'an empty object';
    const named = keys.slice(0, 3).map(quote).join(', ') + (keys.length > 3 ? ', …' : '');
    return `an object (key${keys.length > 1 ? 's' : ''} ${named}; if the records sit under one key, save that list alone or as JSON Lines)`;
  }
  return typeof v === 'string' ? 'a string' : typeof v === 'number' ? 'a number' : 'true or false';
}

function lineColumn(text: string, pos: number): { line: number; column: number } {
  const before = text.slice(0, pos);
  const nl = before.lastIndexOf('\n');
  return { line: before.split('\n').length, column: pos - nl };
}

/**
 * Where each element of the top-level array starts and ends (offsets) and on which line it starts: a small
 * scan that respects strings, used for row line numbers and to locate a syntax error.
 */
function elementSpans(text: string): { lines: number[]; starts: number[]; ends: number[] } {
  const lines: number[] = [];
  const starts: number[] = [];
  const ends: number[] = [];
  let depth = 0;
  let line = 1;
  let inString = false;
  let expectElement = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) line++;
    if (inString) {
      if (c === 92) i++; // backslash: skip the escaped character
      else if (c === 34) inString = false;
      continue;
    }
    if (c === 32 || c === 9 || c === 10 || c === 13) continue;
    if (depth === 1 && expectElement && c !== 93) {
      lines.push(line);
      starts.push(i);
      expectElement = false;
    }
    if (c === 34) inString = true;
    else if (c === 91 || c === 123) {
      depth++;
      if (depth === 1) expectElement = true;
    } else if (c === 93 || c === 125) {
      depth--;
      if (depth === 0 && ends.length < starts.length) ends.push(i);
    } else if (c === 44 && depth === 1) {
      if (ends.length < starts.length) ends.push(i);
      expectElement = true;
    }
  }
  while (ends.length < starts.length) ends.push(text.length);
  return { lines, starts, ends };
}

/** The line of the first array element that does not parse on its own (V8's messages rarely give a position). */
function syntaxErrorLine(text: string): number | undefined {
  const { lines, starts, ends } = elementSpans(text);
  for (let i = 0; i < starts.length; i++) {
    try {
      JSON.parse(text.slice(starts[i], ends[i]));
    } catch {
      return lines[i];
    }
  }
  return undefined;
}
