import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError } from '../core/errors.ts';
import { quote } from '../core/util/cut.ts';
import { plural } from '../core/util/plural.ts';
import { PictureRepo } from '../store/pictures.ts';
import type { Db } from '../store/workspace.ts';
import { makeThumbnail, MAX_PICTURE_BYTES, THUMB_RECIPE, type ThumbResult } from './thumbnail.ts';

/**
 * The picture column of an items import. Where a picture comes from, decided here:
 * - a file path (relative to the imported file's folder, or absolute) or a `file:` address is read, when the
 *   import itself was given by path (the command line, the desktop app);
 * - an `http:`/`https:` address is recorded but never fetched: the workspace keeps the shop's data on this
 *   machine and the app does not go to the network on its own. The item shows a placeholder and the report
 *   says how to have it shown (download the pictures and name the files);
 * - in a file sent by a page (the web shell), paths are recorded, not read: a page may not make the app read
 *   files on this machine (DEVELOPERS.md, "The web shell's security");
 * - any other address is a rejected cell.
 * A file above MAX_PICTURE_BYTES rejects its row (named by line and column); a missing or unreadable file
 * keeps the row, shows a placeholder and is warned about, row by row.
 */
export type PictureReading = 'read' | 'record';

export interface PictureSummary {
  /** Rows that named a picture. */
  named: number;
  /** Of those, with a thumbnail now: made by this import, or found stored for the same bytes. */
  ready: number;
  made: number;
  reused: number;
  missing: number;
  broken: number;
  remote: number;
  unread: number;
  /** Items whose picture a blank cell removed. */
  cleared: number;
}

/** A checked picture cell, waiting for its item to be written. */
export type PendingPicture =
  | { kind: 'clear'; item: string }
  | { kind: 'record'; item: string; source: string; state: 'remote' | 'unread' | 'missing' | 'broken'; line: number; column: number | string; reason?: string }
  | { kind: 'file'; item: string; source: string; file: string; line: number; column: number | string };

/** Row-level picture warnings listed one by one; the rest are counted. */
export const MAX_PICTURE_WARNINGS = 20;
/** Pictures read and made at once: sharp's work runs on libuv's pool (4 threads by default). */
const CONCURRENCY = 4;
/** A cell longer than this is no path anyone typed. */
const MAX_SOURCE_CHARS = 2048;

export class PictureIntake {
  readonly #importFile: string;
  readonly #folder: string;
  readonly #reading: PictureReading;
  /** By item: a file naming an item twice keeps its last row, as the item write does. */
  readonly #pending = new Map<string, PendingPicture>();

  constructor(importFile: string, reading: PictureReading) {
    this.#importFile = importFile;
    this.#folder = path.dirname(path.resolve(importFile));
    this.#reading = reading;
  }

  /**
   * Checks one row's cell, before its item is written: a reason to reject the row, or the picture to keep
   * once the item is written (`add`). Synchronous and cheap (one stat): the reading comes after the rows.
   */
  check(item: string, cell: string | null, line: number, column: number | string): PendingPicture | { reject: string } {
    if (cell === null) return { kind: 'clear', item };
    const source = cell.trim();
    if (source.length > MAX_SOURCE_CHARS) return { reject: `image: a picture path or address of ${source.length} characters; at most ${MAX_SOURCE_CHARS}` };
    const at = { item, source, line, column };
    if (/^https?:\/\//i.test(source)) return { kind: 'record', ...at, state: 'remote' };
    let file: string;
    if (/^file:/i.test(source)) {
      try {
        file = fileURLToPath(source);
      } catch {
        return { reject: `image: ${quote(source)} is not a valid file: address (expected file:///folder/picture.jpg)` };
      }
    } else if (/^[a-z][a-z0-9+.-]+:/i.test(source)) {
      // Two letters or more before the colon: a scheme, not a Windows drive letter.
      return { reject: `image: ${quote(source)} is neither a file path nor a web address (http: or https:)` };
    } else file = path.resolve(this.#folder, source);
    if (this.#reading === 'record') return { kind: 'record', ...at, state: 'unread' };
    const st = fs.statSync(file, { throwIfNoEntry: false });
    if (st === undefined) return { kind: 'record', ...at, state: 'missing', reason: 'no such file' };
    if (!st.isFile()) return { kind: 'record', ...at, state: 'missing', reason: 'not a file' };
    if (st.size > MAX_PICTURE_BYTES) {
      return { reject: `image: ${quote(source)} is ${megabytes(st.size)}; a picture may be at most ${megabytes(MAX_PICTURE_BYTES)} (make it smaller, or leave the cell empty)` };
    }
    if (st.size === 0) return { kind: 'record', ...at, state: 'broken', reason: 'the file is empty' };
    return { kind: 'file', ...at, file };
  }

  /** The row's item was written: its picture is kept. */
  add(p: PendingPicture): void {
    this.#pending.set(p.item, p);
  }

  get size(): number {
    return this.#pending.size;
  }

  /**
   * Reads the named files, makes the thumbnails not stored yet (by the sha256 of the file's bytes, so a
   * picture imported again, or shared by items, is made once) and writes every picture row. Runs inside the
   * import's transaction: the awaits are the reading and the making; every write comes after them, at once.
   */
  async finish(db: Db, warnings: string[]): Promise<PictureSummary> {
    const repo = new PictureRepo(db);
    const summary: PictureSummary = { named: 0, ready: 0, made: 0, reused: 0, missing: 0, broken: 0, remote: 0, unread: 0, cleared: 0 };
    const jobs = [...this.#pending.values()];
    // By file: items naming the same file (a shop's shared placeholder, the demo's drawings) read it once.
    const outcome = new Map<string, { hash: string } | { state: 'missing' | 'broken'; reason: string }>();
    const making = new Map<string, Promise<ThumbResult>>();
    const firstJob = new Map<string, Extract<PendingPicture, { kind: 'file' }>>();
    for (const j of jobs) if (j.kind === 'file' && !firstJob.has(j.file)) firstJob.set(j.file, j);
    const files = [...firstJob.values()];
    let next = 0;
    const worker = async () => {
      while (next < files.length) {
        const j = files[next++]!;
        let bytes: Buffer;
        try {
          // Measured again on the open file: one swapped in since the row's check is refused, never read whole.
          const handle = await fs.promises.open(j.file, 'r');
          try {
            const size = (await handle.stat()).size;
            if (size > MAX_PICTURE_BYTES) {
              throw new InputError(`image: ${quote(j.source)} is ${megabytes(size)}; a picture may be at most ${megabytes(MAX_PICTURE_BYTES)}`, {
                file: this.#importFile, line: j.line, column: j.column,
              });
            }
            bytes = await handle.readFile();
          } finally {
            await handle.close();
          }
        } catch (e) {
          if (e instanceof InputError) throw e;
          const code = (e as NodeJS.ErrnoException).code;
          outcome.set(j.file, { state: code === 'ENOENT' ? 'missing' : 'broken', reason: code === 'ENOENT' ? 'no such file' : `cannot be read (${code ?? 'error'})` });
          continue;
        }
        const hash = createHash('sha256').update(bytes).digest('hex');
        if (!making.has(hash) && !repo.hasThumb(hash, THUMB_RECIPE)) making.set(hash, makeThumbnail(bytes));
        const made = making.get(hash);
        const r = made === undefined ? undefined : await made;
        outcome.set(j.file, r === undefined || r.ok ? { hash } : { state: 'broken', reason: r.reason });
      }
    };
    await Promise.all(Array.from({ length: Math.min(CONCURRENCY, files.length) }, worker));

    // Every write from here on is synchronous, inside the import's transaction.
    for (const [hash, p] of making) {
      const r = await p; // settled above
      if (r.ok) {
        repo.putThumb({ hash, recipe: THUMB_RECIPE, ...r.thumb });
        summary.made++;
      }
    }
    const listed: string[] = [];
    let unlisted = 0;
    const warn = (j: { line: number; column: number | string; source: string }, why: string) => {
      if (listed.length < MAX_PICTURE_WARNINGS) {
        listed.push(new InputError(`image: ${quote(j.source)}: ${why}; the item is shown with a placeholder`, { file: this.#importFile, line: j.line, column: j.column }).describe());
      } else unlisted++;
    };
    const firstOf: Partial<Record<'remote' | 'unread', number>> = {};
    for (const j of jobs) {
      if (j.kind === 'clear') {
        if (repo.clearPicture(j.item)) summary.cleared++;
        continue;
      }
      summary.named++;
      if (j.kind === 'record') {
        repo.setPicture(j.item, j.source, j.state, null);
        summary[j.state]++;
        if (j.state === 'missing' || j.state === 'broken') warn(j, j.reason ?? j.state);
        else firstOf[j.state] ??= j.line;
        continue;
      }
      const o = outcome.get(j.file)!;
      if ('hash' in o) {
        repo.setPicture(j.item, j.source, 'ready', o.hash);
        summary.ready++;
        if (!making.has(o.hash)) summary.reused++;
      } else {
        repo.setPicture(j.item, j.source, o.state, null);
        summary[o.state]++;
        warn(j, o.reason);
      }
    }
    repo.dropUnusedThumbs();
    warnings.push(...listed);
    if (unlisted > 0) warnings.push(`${plural(unlisted, 'more picture')} could not be read (listed above: the first ${MAX_PICTURE_WARNINGS})`);
    if (summary.remote > 0) {
      warnings.push(
        `${plural(summary.remote, 'picture is a web address', 'pictures are web addresses')} (the first on line ${firstOf.remote}): ` +
          `Shelfwright keeps your data on this machine and does not fetch from the network, so ${summary.remote === 1 ? 'it shows' : 'they show'} a placeholder. ` +
          'Download the pictures and name the files in the image column (paths relative to this file) to have them shown',
      );
    }
    if (summary.unread > 0) {
      warnings.push(
        `${plural(summary.unread, 'picture is', 'pictures are')} named by path (the first on line ${firstOf.unread}) in a file sent from the page, ` +
          `which may not make Shelfwright read files on this machine; ${summary.unread === 1 ? 'it shows' : 'they show'} a placeholder. Import the file by its path ` +
          '(shelfwright import on the command line) to have them read',
      );
    }
    return summary;
  }
}

function megabytes(bytes: number): string {
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}
