import { InputError } from '../core/errors.ts';
import { openWorkspace, type Db, type OpenOptions } from '../store/workspace.ts';
import { JobRegistry } from './jobs.ts';
import { UploadStore } from './uploads.ts';

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
  #uploads: UploadStore | null = null;

  constructor(openOptions: OpenOptions = {}) {
    this.#openOptions = openOptions;
  }

  /** Opens (creating if asked) a workspace, closing the one before. */
  open(file: string, options: { create?: boolean } = {}): void {
    const db = openWorkspace(file, { ...this.#openOptions, create: options.create ?? true });
    this.jobs.cancelAll();
    this.#closeWorkspace(); // uploads stay: a file chosen before switching workspaces can still be imported
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

  /** Files the page streamed here (web shell), removed when the context closes. Made on first use. */
  get uploads(): UploadStore {
    return (this.#uploads ??= new UploadStore());
  }

  /** Closes the workspace and removes every upload with its private folder. */
  close(): void {
    this.#closeWorkspace();
    this.#uploads?.close();
  }

  #closeWorkspace(): void {
    this.#db?.close();
    this.#db = null;
    this.#file = null;
  }
}
