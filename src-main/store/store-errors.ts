import { InputError, WorkspaceBusyError } from '../core/errors.ts';

/**
 * SQLite's own words ("database is locked", "database disk image is malformed", "attempt to write a
 * readonly database") say nothing an editor can act on. These turn them into errors that name the file
 * and the next step; anything else is returned as it came. Branching is on `SqliteError.code`, never on
 * message text (better-sqlite3 docs/api.md, class SqliteError; SQLite "Result and Error Codes").
 */
export function explainStoreError(e: unknown, file: string | undefined): unknown {
  const code = (e as { code?: unknown }).code;
  if (typeof code !== 'string' || !code.startsWith('SQLITE_')) return e;
  const where = file === undefined ? {} : { file };
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) {
    return new WorkspaceBusyError(
      'the workspace is busy: another Shelfwright process is writing to it. Nothing was changed; try again when it has finished.',
      file ?? '',
    );
  }
  if (code.startsWith('SQLITE_CORRUPT')) return damaged(e as Error, file);
  if (code.startsWith('SQLITE_READONLY')) {
    return new InputError(
      'this workspace is read-only (the file or its folder cannot be written): it opens for reading, but nothing can be ' +
        'changed. To change it, copy it to a folder you can write to, or ask for write permission.',
      where,
    );
  }
  return e;
}

/** The error for a damaged workspace file: what happened, that nothing was touched, and what to do. */
export function damaged(e: Error, file: string | undefined): InputError {
  return new InputError(
    `the workspace file is damaged and cannot be read safely (SQLite: ${e.message}). It was left as it is. ` +
      'Restore it from your latest backup copy of the file, or build a new workspace by importing your files again.',
    file === undefined ? {} : { file },
  );
}
