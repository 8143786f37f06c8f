import Database from 'better-sqlite3';
import fs from 'node:fs';
import { isBusy } from './write-lock.ts';

/**
 * Whether any connection, in any process, has the workspace at `file` open, idle or not.
 *
 * Asked before a whole file is replaced (the demo build): renaming over a file another process has open
 * leaves that process writing to the old, unlinked file, and removing its `-wal` loses what it committed.
 * The test is SQLite's own lock: in WAL mode every open connection holds a shared lock on the database file
 * for as long as it is open, so an exclusive lock (`locking_mode = EXCLUSIVE`, `BEGIN EXCLUSIVE`, no busy
 * wait) is granted only when nobody else has the file open (SQLite "File Locking And Concurrency",
 * "Write-Ahead Logging" §"Sometimes Queries Return SQLITE_BUSY In WAL Mode"). Chosen over the two other ways:
 * - a BEGIN IMMEDIATE probe sees only a process that is writing at that moment, not an app left open on the
 *   workspace, which would then write into the replaced file and lose it;
 * - a lock file with the owner's pid outlives a killed process and can name a reused pid; the operating
 *   system drops SQLite's locks when a process dies, so this answer is never stale.
 * A file that is not an SQLite database (or is damaged) cannot be in use as a workspace: false.
 */
export function workspaceInUse(file: string): boolean {
  if (!fs.existsSync(file)) return false;
  let db: Database.Database;
  try {
    db = new Database(file, { fileMustExist: true });
  } catch {
    return false;
  }
  try {
    db.pragma('busy_timeout = 0');
    db.pragma('locking_mode = EXCLUSIVE');
    db.exec('BEGIN EXCLUSIVE');
    db.exec('ROLLBACK');
    return false;
  } catch (e) {
    return isBusy(e);
  } finally {
    db.close();
  }
}
