import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { InputError } from '../core/errors.ts';

export interface FileSource {
  file?: string | undefined;
  fileName?: string | undefined;
  content?: string | undefined;
}

/**
 * Runs `use` on a real path for a file given either as a path or as uploaded content. Uploaded content is
 * written to a private temporary folder under its own base name (so the format is still told by the
 * extension) and removed afterwards; messages then name the user's file, not the temporary one.
 */
export async function withFile<T>(source: FileSource, use: (file: string, shownAs: string) => Promise<T>): Promise<T> {
  if (source.file !== undefined) return use(source.file, source.file);
  if (source.fileName === undefined || source.content === undefined) {
    throw new InputError('give either a file path, or a file name with its content');
  }
  const base = path.basename(source.fileName).replace(/[^\w.\- ]/g, '_') || 'upload.csv';
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-upload-'));
  const staged = path.join(dir, base);
  try {
    fs.writeFileSync(staged, source.content);
    return await use(staged, source.fileName);
  } catch (e) {
    if (e instanceof InputError && e.where.file === staged) {
      throw new InputError(e.message, { ...e.where, file: source.fileName });
    }
    throw e;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Replaces every mention of the staged path in a text with the name the user knows. */
export function renamePath(text: string, staged: string, shownAs: string): string {
  return staged === shownAs ? text : text.split(staged).join(shownAs);
}
