import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.ts';
import { makeTempFolder } from './temp-folders.ts';

export interface FileSource {
  file?: string | undefined;
  fileName?: string | undefined;
  content?: string | undefined;
  /** A file the page already streamed to this machine (see UploadStore): read in place, not removed here. */
  staged?: { path: string; fileName: string } | undefined;
}

/** Longest base name kept, in UTF-16 units (file systems allow 255 bytes; this leaves room for any encoding). */
const MAX_BASE_NAME = 120;

/**
 * A user-given file name made safe to create inside a private folder: only its last path part (either
 * separator), odd characters replaced, never `.` or `..`, not too long, and with its extension kept so the
 * format can still be told from it.
 */
export function safeBaseName(fileName: string, fallback = 'upload.csv'): string {
  const last = fileName.split(/[\\/]/).pop() ?? '';
  let base = last.replace(/[^\w.\- ]/g, '_').trim();
  if (/^\.*$/.test(base)) return fallback;
  if (base.length > MAX_BASE_NAME) {
    const ext = path.extname(base).slice(0, 16);
    base = base.slice(0, MAX_BASE_NAME - ext.length) + ext;
  }
  return base;
}

/**
 * Runs `use` on a real path for a file given as a path, as uploaded content, or as an already staged upload.
 * Uploaded content is written to a private temporary folder under its own base name (so the format is still
 * told by the extension) and removed afterwards; messages then name the user's file, not the temporary one.
 */
export async function withFile<T>(source: FileSource, use: (file: string, shownAs: string) => Promise<T>): Promise<T> {
  if (source.file !== undefined) return use(source.file, source.file);
  if (source.staged !== undefined) return renamingErrors(source.staged.path, source.staged.fileName, use);
  if (source.fileName === undefined || source.content === undefined) {
    throw new InputError('give either a file path, or a file name with its content');
  }
  const dir = makeTempFolder('upload');
  const staged = path.join(dir, safeBaseName(source.fileName));
  try {
    fs.writeFileSync(staged, source.content, { mode: 0o600 }); // customer data: private, like its folder
    return await renamingErrors(staged, source.fileName, use);
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Runs `use` on a staged file; an input error pointing at the staged path is re-pointed at the user's name. */
async function renamingErrors<T>(staged: string, shownAs: string, use: (file: string, shownAs: string) => Promise<T>): Promise<T> {
  try {
    return await use(staged, shownAs);
  } catch (e) {
    if (e instanceof InputError && e.where.file === staged) {
      throw new InputError(renamePath(e.message, staged, shownAs), { ...e.where, file: shownAs });
    }
    throw e;
  }
}

/** Replaces every mention of the staged path in a text with the name the user knows. */
export function renamePath(text: string, staged: string, shownAs: string): string {
  return staged === shownAs ? text : text.split(staged).join(shownAs);
}
