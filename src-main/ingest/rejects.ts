import { InputError } from '../core/errors.ts';

/** One rejected cell or row as the import report lists it. */
export interface RowError {
  line: number;
  column: number | string | null;
  reason: string;
  /** `file:line:column: reason` (InputError.describe()). */
  message: string;
}

export const MAX_ERRORS = 100;

/**
 * The rejected rows of one import: exact counts, and the first MAX_ERRORS messages. Plain data, so the
 * parsing thread can keep it and send it back whole.
 */
export class RejectLog {
  rejected = 0;
  errorCount = 0;
  readonly errors: RowError[] = [];
  /** The JSON array record now being read (1-based), named in each of its messages; undefined elsewhere. */
  record: number | undefined;
  readonly #file: string;
  constructor(file: string) {
    this.#file = file;
  }

  /** One problem on `line`; `newRow` false adds another problem to the row rejected just before. */
  add(line: number, column: number | string | null, raw: string, newRow = true): void {
    const reason = this.record === undefined ? raw : `record ${this.record}: ${raw}`;
    if (newRow) this.rejected++;
    this.errorCount++;
    if (this.errors.length < MAX_ERRORS) {
      const where = column === null ? { file: this.#file, line } : { file: this.#file, line, column };
      this.errors.push({ line, column, reason, message: new InputError(reason, where).describe() });
    }
  }
}
