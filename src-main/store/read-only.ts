import Database from 'better-sqlite3';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

/** True when this process may write both the file and its folder (SQLite writes `-wal` and `-shm` beside it). */
export function writable(file: string): boolean {
  try {
    fs.accessSync(file, fs.constants.W_OK);
    fs.accessSync(path.dirname(path.resolve(file)), fs.constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

function folderWritable(file: string): boolean {
  try {
    fs.accessSync(path.dirname(path.resolve(file)), fs.constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

/**
 * Opens a workspace for reading. A WAL-mode file is read through its `-shm` index, which SQLite must be able
 * to create beside the file; in a folder nobody may write to (a shared or archived folder) and with no
 * `-shm` there, even a read-only open fails (SQLITE_READONLY_DIRECTORY; SQLite "WAL-mode File Format", §
 * read-only WAL databases, which needs the `immutable` URI parameter better-sqlite3 does not pass). There we
 * read a private copy of the file (with its `-wal`, which holds the latest commits) in a 0700 temp folder,
 * removed when the connection closes. The copy is what the file held when it was opened; a read-only
 * workspace does not change under us unless its owner writes to it meanwhile.
 */
export function openForReading(file: string, options: Database.Options): Database.Database {
  if (folderWritable(file)) return new Database(file, options);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-read-'));
  const copy = path.join(dir, path.basename(file));
  try {
    fs.copyFileSync(file, copy);
    if (fs.existsSync(`${file}-wal`)) fs.copyFileSync(`${file}-wal`, `${copy}-wal`);
    const db = new Database(copy, options);
    const close = db.close.bind(db);
    db.close = () => {
      try {
        return close();
      } finally {
        fs.rmSync(dir, { recursive: true, force: true });
      }
    };
    return db;
  } catch (e) {
    fs.rmSync(dir, { recursive: true, force: true });
    throw e;
  }
}
