/**
 * Errors by whose fault they are. Only the api layer turns them into `{ code, message, where }` for a
 * client; nothing sends a stack across a process boundary.
 */

/** Where in a user's file the problem is. Lines and columns are 1-based, as editors show them. */
export interface Where {
  file?: string;
  line?: number;
  column?: number | string;
}

/** The user's input is wrong: a file, a flag, a request. The message says what to do about it. */
export class InputError extends Error {
  override readonly name = 'InputError';
  readonly where: Where;
  constructor(reason: string, where: Where = {}) {
    super(reason);
    this.where = where;
  }
  /** `file:line:column: reason`, the form editors and terminals link to. */
  describe(): string {
    const w = this.where;
    const at = [w.file, w.line, w.column].filter((p) => p !== undefined && p !== '').join(':');
    return at ? `${at}: ${this.message}` : this.message;
  }
}

/** The user asked something that cannot be found (an item id, an edition). */
export class NotFoundError extends Error {
  override readonly name = 'NotFoundError';
}

/** The user (or a signal) stopped long-running work. Not a failure. */
export class CancelledError extends Error {
  override readonly name = 'CancelledError';
  constructor(message = 'cancelled') {
    super(message);
  }
}

/** A broken invariant inside the program. Never throw this for invalid user input. */
export class BugError extends Error {
  override readonly name = 'BugError';
}

/** A model's numbers went wrong (NaN or infinite factors). Loud, never silent. */
export class ModelFitError extends Error {
  override readonly name = 'ModelFitError';
}

/**
 * Another process holds the workspace (it is writing, or it has the file open when the whole file would be
 * replaced). Nothing was changed; the message says who holds it when that is known and what to do.
 */
export class WorkspaceBusyError extends Error {
  override readonly name = 'WorkspaceBusyError';
  readonly file: string;
  constructor(message: string, file: string) {
    super(message);
    this.file = file;
  }
}
