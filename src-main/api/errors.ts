import { z } from 'zod';
import { BugError, CancelledError, InputError, NotFoundError, WorkspaceBusyError } from '../core/errors.ts';
import { fieldWords, issueWords, type IssueLike } from '../core/curation/rule-words.ts';
import { explainStoreError } from '../store/store-errors.ts';
import type { ApiError } from './define.ts';

/**
 * Turns any thrown value into the api's error shape; unexpected errors keep their message, never a stack.
 * SQLite's own errors (busy, damaged, read-only) are said with `file`, the open workspace, and what to do.
 */
export function toApiError(thrown: unknown, file?: string): ApiError {
  const e = explainStoreError(thrown, file);
  if (e instanceof WorkspaceBusyError) return { code: 'conflict', message: e.message };
  if (e instanceof InputError) {
    const where = e.where;
    const out: ApiError = { code: 'input', message: e.message };
    if (where.file !== undefined || where.line !== undefined || where.column !== undefined) out.where = { ...where };
    return out;
  }
  if (e instanceof z.ZodError) {
    const first = e.issues[0];
    // A brief's field is said in words (core/curation/rule-words.ts); other fields by their path.
    if (first && fieldWords(first.path) !== null) return { code: 'input', message: issueWords(first as IssueLike) };
    const path = first?.path.join('.') ?? '';
    return { code: 'input', message: path ? `${path}: ${first?.message}` : (first?.message ?? 'invalid request') };
  }
  if (e instanceof NotFoundError) return { code: 'not_found', message: e.message };
  if (e instanceof CancelledError) return { code: 'cancelled', message: e.message };
  if (e instanceof BugError) return { code: 'internal', message: `internal error: ${e.message}` };
  const message = e instanceof Error ? e.message : String(e);
  return { code: 'internal', message };
}
