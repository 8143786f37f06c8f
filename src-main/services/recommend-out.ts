import fs from 'node:fs';
import { InputError } from '../core/errors.ts';

/** The keys of one JSON Lines record of a top-N export, in the order recommend writes them. */
export const RECOMMEND_JSONL_KEYS = ['customer', 'rank', 'item', 'title', 'score', 'contributions', 'sponsored'];

/** Enough of a file to hold its first line (a CSV header or one JSON record). */
const FIRST_BYTES = 64 * 1024;

/**
 * `recommend` writes its file whole and may replace an older run of itself, but never anything else: an
 * existing file is replaced only when its first line is the export's own (the CSV header `csvHeader`, or a
 * JSON Lines record with exactly the export's keys). A link, a folder or any other file is refused, so the
 * call cannot be turned into a way to overwrite a file of the caller's choosing. Nothing is written here.
 */
export function checkReplaceableExport(file: string, csvHeader: string): void {
  let st: fs.Stats;
  try {
    st = fs.lstatSync(file);
  } catch {
    return; // a new file
  }
  if (st.isSymbolicLink()) throw new InputError('will not write the output through a link: give the path of the file itself, or a new name', { file });
  if (!st.isFile()) return; // a folder: checkOutputFile says so in its own words
  const buf = Buffer.alloc(Math.min(FIRST_BYTES, st.size));
  const fd = fs.openSync(file, 'r');
  try {
    fs.readSync(fd, buf, 0, buf.length, 0);
  } finally {
    fs.closeSync(fd);
  }
  const first = buf.toString('utf8').split(/\r?\n/, 1)[0] ?? '';
  if (first === csvHeader || isExportRecord(first)) return;
  throw new InputError(
    'will not overwrite this file: it is not a top-N export written by Shelfwright (its first line differs); choose a new file name, or delete the file first',
    { file },
  );
}

function isExportRecord(line: string): boolean {
  try {
    const v: unknown = JSON.parse(line);
    return v !== null && typeof v === 'object' && !Array.isArray(v) && Object.keys(v).join(',') === RECOMMEND_JSONL_KEYS.join(',');
  } catch {
    return false;
  }
}
