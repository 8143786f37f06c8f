import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.ts';
import { scrubIfPending } from './erasure.ts';
import { MIGRATIONS } from './migrations/index.ts';
import type { Migration } from './migrations/types.ts';
import { openForReading, writable } from './read-only.ts';
import { damaged } from './store-errors.ts';
import { busyTimeoutMs, immediateTransactions, setBlockingWait, setWaitListener, type WaitListener } from './write-lock.ts';

export type Db = Database.Database;

export interface OpenOptions {
  /** Open without writing (the training worker does). The file must exist and be current. */
  readonly?: boolean;
  /** Create the file when missing (default true for writers). */
  create?: boolean;
  /** The migration list; tests pass a shorter one to build an old-version file. */
  migrations?: readonly Migration[];
  /** Path of a better-sqlite3 native binding built for another ABI (Electron). */
  nativeBinding?: string;
  /** Told once per write that has to wait for another process (store/write-lock.ts). */
  onWait?: WaitListener;
  /** At most this long a synchronous write blocks the process waiting for another one (apps: APP_BLOCKING_WAIT_MS). */
  blockingWaitMs?: number;
}

/** What an app (web shell, Electron) lets a synchronous write block it: the busy timeout SQLite had here before. */
export const APP_BLOCKING_WAIT_MS = 5000;

export const SCHEMA_VERSION = MIGRATIONS.length;

/**
 * Opens (and if needed creates and migrates) one workspace file.
 * WAL so readers never block the writer; foreign keys on; synchronous NORMAL, which in WAL mode keeps
 * the file consistent after a crash and may lose only the last commit on power loss
 * (better-sqlite3 docs/performance.md; SQLite "WAL mode" docs).
 */
export function openWorkspace(file: string, options: OpenOptions = {}): Db {
  const migrations = options.migrations ?? MIGRATIONS;
  const exists = fs.existsSync(file);
  if (!exists && (options.readonly || options.create === false)) {
    throw new InputError(`no workspace at ${file}`, { file });
  }
  if (!exists) createPrivateFile(file);
  // A file (or folder) we may not write opens for reading: reading a catalogue needs no write permission.
  const readonly = (options.readonly ?? false) || (exists && !writable(file));
  const dbOptions: Database.Options = { readonly, fileMustExist: exists };
  if (options.nativeBinding) dbOptions.nativeBinding = options.nativeBinding;
  let db: Db;
  try {
    db = readonly ? openForReading(file, dbOptions) : new Database(file, dbOptions);
  } catch (e) {
    throw new InputError(`cannot open workspace: ${(e as Error).message}`, { file });
  }
  try {
    db.pragma('foreign_keys = ON');
    db.pragma(`busy_timeout = ${Math.min(busyTimeoutMs(), options.blockingWaitMs ?? Infinity)}`);
    // Before anything is written (switching to WAL rewrites the header): a file that is not ours keeps its bytes.
    checkIsWorkspace(db, file);
    if (!readonly) {
      db.pragma('journal_mode = WAL');
      db.pragma('synchronous = NORMAL');
      // Deleted content is overwritten with zeros, not left in free space (SQLite "PRAGMA secure_delete"):
      // part of erasing a customer (services/forget.ts). A per-connection setting, so set on every open.
      db.pragma('secure_delete = ON');
      immediateTransactions(db);
      setWaitListener(db, options.onWait);
      setBlockingWait(db, options.blockingWaitMs);
      migrate(db, migrations);
    } else {
      const v = userVersion(db);
      if (v !== migrations.length) {
        throw new InputError(`workspace is at schema ${v}, expected ${migrations.length}; open it once for writing`, {
          file,
        });
      }
    }
  } catch (e) {
    db.close();
    // SQLite notices a file that is not a database only on its first read (here, the first pragma).
    const code = (e as { code?: string }).code;
    if (code === 'SQLITE_NOTADB') {
      throw new InputError('not a workspace file (not an SQLite database)', { file });
    }
    if (code?.startsWith('SQLITE_CORRUPT')) throw damaged(e as Error, file);
    throw e;
  }
  if (!readonly) {
    makePrivate(file); // only now that it is known to be a workspace: another program's file keeps its mode
    // An erasure whose freed bytes a reader held in the log last time is finished now (store/erasure.ts).
    if (migrations.length >= MIGRATIONS.length) scrubIfPending(db);
  }
  return db;
}

/**
 * Creates the workspace file empty with mode 0600 (its folder, if new, 0700) before SQLite opens it:
 * created with the mode at once, there is no moment when another local user could open it, and SQLite
 * gives the -wal and -shm files it makes later the mode of the database file (its unix VFS copies it).
 * A file someone else created in between is simply opened.
 */
function createPrivateFile(file: string): void {
  fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true, mode: 0o700 });
  try {
    fs.closeSync(fs.openSync(file, 'wx', 0o600));
  } catch (e) {
    if ((e as { code?: string }).code !== 'EEXIST') throw new InputError(`cannot create workspace: ${(e as Error).message}`, { file });
  }
}

/**
 * Workspaces made before files were created private (0644: every local user could read customer data)
 * are made private when opened for writing: the file and any -wal and -shm beside it. Only the owner
 * may change a file's mode, so a file owned by someone else is left as it is.
 */
function makePrivate(file: string): void {
  for (const f of [file, `${file}-wal`, `${file}-shm`]) {
    try {
      const st = fs.statSync(f);
      if ((st.mode & 0o077) !== 0 && st.uid === process.getuid?.()) fs.chmodSync(f, st.mode & 0o700);
    } catch {
      // missing (-wal and -shm often are) or not ours: nothing to tighten
    }
  }
}

export function userVersion(db: Db): number {
  return db.pragma('user_version', { simple: true }) as number;
}

/** Moves the write-ahead log into the main file and empties it, so the file alone holds the workspace. */
export function checkpointAndEmptyLog(db: Db): void {
  db.pragma('wal_checkpoint(TRUNCATE)');
}

/** Whether SQLite checks foreign keys on this connection. */
export function foreignKeysChecked(db: Db): boolean {
  return (db.pragma('foreign_keys', { simple: true }) as number) === 1;
}

/** Turns foreign-key checks on or off; a no-op inside a transaction (SQLite docs, "PRAGMA foreign_keys"). */
export function checkForeignKeys(db: Db, on: boolean): void {
  db.pragma(`foreign_keys = ${on ? 'ON' : 'OFF'}`);
}

/** Tables every workspace has had since schema 1 (migrations/001-foundation.ts): how a workspace is told apart. */
export const WORKSPACE_TABLES: readonly string[] = ['item', 'customer', 'signal', 'import_log'];

/**
 * Refuses files that are SQLite but not ours (a user pointing at the wrong file), before any migration
 * could write to them: another program's database may set a user_version of its own.
 */
function checkIsWorkspace(db: Db, file: string): void {
  let tables: { name: string }[];
  try {
    tables = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").all() as { name: string }[];
  } catch (e) {
    if ((e as { code?: string }).code?.startsWith('SQLITE_CORRUPT')) throw damaged(e as Error, file);
    throw new InputError('not a workspace file (not an SQLite database)', { file });
  }
  const ours = WORKSPACE_TABLES.every((t) => tables.some((x) => x.name === t));
  if (tables.length > 0 && (userVersion(db) === 0 || !ours)) {
    throw new InputError('not a Shelfwright workspace: the file holds other tables', { file });
  }
}

/**
 * Applies the missing steps, all in one transaction: a killed process leaves the file at its old
 * version, never half-way. A file newer than this program is refused rather than guessed at.
 */
export function migrate(db: Db, migrations: readonly Migration[] = MIGRATIONS): void {
  const current = userVersion(db);
  if (current > migrations.length) {
    throw new InputError(
      `this workspace was written by a newer Shelfwright (schema ${current}; this one knows ${migrations.length})`,
    );
  }
  if (current === migrations.length) return;
  db.transaction(() => {
    for (const m of migrations.slice(current)) db.exec(m.up);
    db.pragma(`user_version = ${migrations.length}`);
  })();
}
