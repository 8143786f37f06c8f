import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Transform, type Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { InputError } from '../core/errors.ts';
import { safeBaseName } from './staged-file.ts';
import { makeTempFolder } from './temp-folders.ts';

/** A file the page streamed to this machine, waiting to be previewed and imported. */
export interface Upload {
  /** 32 lowercase hex characters. */
  id: string;
  /** Where it lies: `<private folder>/<id>/<safe base name>`. */
  path: string;
  /** The name the user chose it by; messages and reports show this, never `path`. */
  fileName: string;
  bytes: number;
}

/** Why an upload was refused: it passed the size limit, or the sender went away mid-way. */
export class UploadRefused extends InputError {
  readonly reason: 'too_large' | 'aborted';
  constructor(reason: 'too_large' | 'aborted', message: string) {
    super(message);
    this.reason = reason;
  }
}

export const UPLOAD_ID = /^[0-9a-f]{32}$/;

/**
 * The uploads of one running app: each in its own sub-folder of a private temporary folder (mode 0700,
 * created on first use), known by a random id until imported or until the app closes. Nothing here is
 * kept across launches.
 */
export class UploadStore {
  readonly #parent: string;
  #root: string | null = null;
  readonly #uploads = new Map<string, Upload>();

  /** `parent` is where the private folder is made (the system temp folder by default). */
  constructor(parent: string = os.tmpdir()) {
    this.#parent = parent;
  }

  /** The private folder, or null while nothing has been uploaded (or after close). */
  get folder(): string | null {
    return this.#root;
  }

  /**
   * Streams `body` to a new file named after `fileName` (never buffered whole). Over `limit` bytes, or when
   * the body breaks off, the partial file is removed and UploadRefused is thrown. `body` itself is never
   * destroyed here, so a caller can still drain it and answer.
   */
  async receive(fileName: string, body: Readable, limit: number): Promise<Upload> {
    const id = randomBytes(16).toString('hex');
    const dir = path.join(this.#ensureRoot(), id);
    fs.mkdirSync(dir, { mode: 0o700 });
    const file = path.join(dir, safeBaseName(fileName));
    let bytes = 0;
    const counter = new Transform({
      transform(chunk: Buffer, _encoding, done) {
        bytes += chunk.length;
        if (bytes > limit) done(new UploadRefused('too_large', `the file is larger than ${sizeInWords(limit)}`));
        else done(null, chunk);
      },
    });
    try {
      await pipeline(body.iterator({ destroyOnReturn: false }), counter, fs.createWriteStream(file, { flags: 'wx', mode: 0o600 }));
    } catch (e) {
      fs.rmSync(dir, { recursive: true, force: true });
      if (e instanceof UploadRefused) throw e;
      if (body.destroyed || (body as { aborted?: boolean }).aborted === true) {
        throw new UploadRefused('aborted', 'the upload broke off before the whole file arrived');
      }
      throw e;
    }
    const upload: Upload = { id, path: file, fileName, bytes };
    this.#uploads.set(id, upload);
    return upload;
  }

  get(id: string): Upload | undefined {
    return this.#uploads.get(id);
  }

  /** The upload by its id, or an input error telling the user to choose the file again. */
  resolve(id: string): Upload {
    const upload = this.#uploads.get(id);
    if (!upload || !fs.existsSync(upload.path)) {
      throw new InputError('the uploaded file is gone (already imported, or the app was restarted): choose the file again');
    }
    return upload;
  }

  /** Removes one upload and its file; unknown ids are ignored. */
  remove(id: string): void {
    const upload = this.#uploads.get(id);
    if (!upload) return;
    this.#uploads.delete(id);
    fs.rmSync(path.dirname(upload.path), { recursive: true, force: true });
  }

  /** Removes every upload and the private folder. The store may be used again afterwards (a new folder). */
  close(): void {
    this.#uploads.clear();
    if (this.#root) fs.rmSync(this.#root, { recursive: true, force: true });
    this.#root = null;
  }

  #ensureRoot(): string {
    if (!this.#root || !fs.existsSync(this.#root)) {
      this.#root = makeTempFolder('uploads', this.#parent);
    }
    return this.#root;
  }
}

/** "4 GiB", "24 MiB", "4096 bytes": a size limit as people read it. */
export function sizeInWords(bytes: number): string {
  for (const [unit, size] of [['GiB', 2 ** 30], ['MiB', 2 ** 20]] as const) {
    if (bytes >= size && bytes % size === 0) return `${bytes / size} ${unit}`;
  }
  return `${bytes} bytes`;
}
