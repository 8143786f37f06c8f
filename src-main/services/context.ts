import { InputError } from '../core/errors.ts';
import { openWorkspace, type Db, type OpenOptions } from '../store/workspace.ts';
import { JobRegistry } from './jobs.ts';

/**
 * The state one running app (or one CLI command) works in: the open workspace. Composed once per
 * shell and handed to the handler table; services take the pieces they need from it.
 */
export class AppContext {
  #db: Db | null = null;
  #file: string | null = null;
  readonly #openOptions: OpenOptions;
  /** Training and evaluation running in the background for this app. */
  readonly jobs = new JobRegistry();

  constructor(openOptions: OpenOptions = {}) {
    this.#openOptions = openOptions;
  }

  /** Opens (creating if asked) a workspace, closing the one before. */
  open(file: string, options: { create?: boolean } = {}): void {
    const db = openWorkspace(file, { ...this.#openOptions, create: options.create ?? true });
    this.jobs.cancelAll();
    this.close();
    this.#db = db;
    this.#file = file;
  }

  get isOpen(): boolean {
    return this.#db !== null;
  }

  get db(): Db {
    if (!this.#db) throw new InputError('no workspace is open: open or create one first');
    return this.#db;
  }

  get file(): string {
    if (!this.#file) throw new InputError('no workspace is open: open or create one first');
    return this.#file;
  }

  close(): void {
    this.#db?.close();
    this.#db = null;
    this.#file = null;
  }
}
