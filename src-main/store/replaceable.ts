import Database from 'better-sqlite3';
import fs from 'node:fs';
import { WORKSPACE_TABLES } from './workspace.ts';

/** The first 16 bytes of every SQLite database file (sqlite.org/fileformat.html, 1.3.1 "Magic Header String"). */
const SQLITE_MAGIC = Buffer.from('SQLite format 3\0', 'latin1');

/**
 * Why a freshly built workspace may not take the place of `file`, or null when it may: nothing is there, or a
 * Shelfwright workspace is (SQLite, a schema version set, our tables). Anything else (a text file, another
 * program's database, a folder, a device) is refused, so no call that replaces a workspace can be turned into
 * a way to overwrite some other file. Reads only; never creates or changes anything.
 */
export function replaceRefusal(file: string): string | null {
  let st: fs.Stats;
  try {
    st = fs.lstatSync(file);
  } catch {
    return null; // nothing there
  }
  if (!st.isFile()) return 'something other than a file is there (a folder, a link or a device)';
  const head = Buffer.alloc(SQLITE_MAGIC.length);
  const fd = fs.openSync(file, 'r');
  let read: number;
  try {
    read = fs.readSync(fd, head, 0, head.length, 0);
  } finally {
    fs.closeSync(fd);
  }
  if (read < head.length || !head.equals(SQLITE_MAGIC)) return 'the file there is not a Shelfwright workspace (not an SQLite database)';
  let tables: string[];
  let userVersion: number;
  try {
    const db = new Database(file, { readonly: true, fileMustExist: true });
    try {
      tables = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").pluck().all() as string[];
      // Through the connection, not the file header: a live workspace's newest header may still be in its WAL.
      userVersion = db.pragma('user_version', { simple: true }) as number;
    } finally {
      db.close();
    }
  } catch (e) {
    return `the file there cannot be read as a workspace (${(e as Error).message})`;
  }
  if (userVersion === 0 && tables.length === 0) return null; // an empty database: nothing of anyone's in it
  if (userVersion === 0 || !WORKSPACE_TABLES.every((t) => tables.includes(t))) return 'the file there is another program’s database, not a Shelfwright workspace';
  return null;
}
