import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.ts';

/**
 * Plain checks on paths a user types, made before any work starts, so the message says what is wrong with the
 * path (missing folder, a folder where a file was meant) instead of a system code like ENOENT or EISDIR, and a
 * long computation never ends in a failed write.
 */

/** A file to read: it must exist and be a file, not a folder. */
export function checkInputFile(file: string, what = 'file'): void {
  let st: fs.Stats;
  try {
    st = fs.statSync(file);
  } catch {
    throw new InputError(`no such ${what}: check the path (it is read relative to ${process.cwd()})`, { file });
  }
  if (st.isDirectory()) throw new InputError(`this is a folder, not a ${what}: give the path of a file inside it`, { file });
}

/** A file to write: its folder must exist, and the path must not name a folder. Nothing is created here. */
export function checkOutputFile(file: string): void {
  const dir = path.dirname(path.resolve(file));
  let dirStat: fs.Stats | undefined;
  try {
    dirStat = fs.statSync(dir);
  } catch {
    dirStat = undefined;
  }
  if (!dirStat?.isDirectory()) {
    throw new InputError(`cannot write the output file: the folder ${dir} does not exist; create it first, or write to a folder that exists`, { file });
  }
  let st: fs.Stats | undefined;
  try {
    st = fs.statSync(file);
  } catch {
    return; // a new file: fine
  }
  if (st.isDirectory()) throw new InputError('cannot write the output file: this is a folder; give the name of a file to write (a new name, or one inside this folder)', { file });
}

/**
 * Writes `content` to `file` beside-and-rename, so a failed write leaves the old file (or none), never a half
 * one. Checks the path first with checkOutputFile.
 */
export function writeFileWhole(file: string, content: string): void {
  checkOutputFile(file);
  const tmp = `${file}.partial-${process.pid}`;
  try {
    fs.writeFileSync(tmp, content);
    fs.renameSync(tmp, file);
  } catch (e) {
    fs.rmSync(tmp, { force: true });
    throw new InputError(`cannot write the file: ${(e as Error).message}`, { file });
  }
}
