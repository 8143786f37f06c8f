import fs from 'node:fs';
import { setImmediate as nextTurn } from 'node:timers/promises';
import { CancelledError, WorkspaceBusyError } from '../core/errors.ts';
import type { Db } from './workspace.ts';
import { processRunning } from './process-alive.ts';

/**
 * Taking a workspace's write lock when another process may hold it (DESIGN.md: "Two processes on one
 * workspace wait or refuse clearly; they never lose a committed write").
 *
 * Every write transaction begins IMMEDIATE. A deferred transaction that has read and then writes while
 * another connection holds the write lock gets SQLITE_BUSY at once, without the busy handler being asked
 * (SQLite "Transaction" docs, BEGIN DEFERRED / IMMEDIATE; sqlite3BtreeBeginTrans only retries a lock taken
 * from no transaction), so it could neither wait nor say it was waiting. The lock is first tried for a
 * short moment (QUIET_MS): when that fails we know we are waiting, tell the user once, and then wait out
 * the busy timeout. better-sqlite3 has no busy-handler callback, hence the two tries.
 *
 * A long writer (an import, saving trained models, the demo build) also leaves a note beside the file
 * (`<file>-writer`: pid and what it is doing), so a waiting process can say who it waits for. The note is
 * only ever used for messages; SQLite's own locks decide who writes.
 */

/** How long a write waits for another process before refusing (SHELFWRIGHT_BUSY_TIMEOUT_MS, default 30 s). */
export function busyTimeoutMs(env: NodeJS.ProcessEnv = process.env): number {
  const raw = env['SHELFWRIGHT_BUSY_TIMEOUT_MS'];
  const n = raw === undefined ? NaN : Number(raw);
  // 30 s: long enough for a demo-sized import or a save to finish, short enough that a stuck process is
  // noticed. Common practice, no source.
  return Number.isFinite(n) && n >= 0 ? n : 30_000;
}

/**
 * How long a synchronous write on this connection may block its process while it waits. An app serving a
 * page sets less than the busy timeout (`OpenOptions.blockingWaitMs`): while a synchronous write waits,
 * nothing else in that process runs. Async writes (imports, saves) do not block and keep the busy timeout.
 */
const blockingWaits = new WeakMap<Db, number>();

export function setBlockingWait(db: Db, ms: number | undefined): void {
  if (ms === undefined) blockingWaits.delete(db);
  else blockingWaits.set(db, ms);
}

function blockingWaitMs(db: Db): number {
  return blockingWaits.get(db) ?? busyTimeoutMs();
}

/**
 * A wait shorter than this goes unmentioned (another process's editorial action takes milliseconds):
 * 0.1 s is the limit for a response to feel instantaneous (Nielsen, "Response Times: The 3 Important
 * Limits", 1993, after Miller 1968).
 */
const QUIET_MS = 100;

/** Told once when a write has to wait; `holder` says for whom ("an import (pid 123)" or a generic phrase). */
export type WaitListener = (holder: string) => void;

const listeners = new WeakMap<Db, WaitListener>();

/** Who hears that writes on this connection are waiting (the CLI prints it on stderr). */
export function setWaitListener(db: Db, listener: WaitListener | undefined): void {
  if (listener) listeners.set(db, listener);
  else listeners.delete(db);
}

export const WAITING = 'waiting for another Shelfwright process';

/** The line shown while waiting: `waiting for another Shelfwright process (an import, pid 123) to finish writing…` */
export function waitingLine(holder: string): string {
  return `${WAITING}${holder ? ` (${holder})` : ''} to finish writing to this workspace…`;
}

interface WriterNote {
  pid: number;
  work: string;
  since: number;
}

function notePath(db: Db): string {
  return `${db.name}-writer`;
}

/** Says which live process holds the workspace at `file` (a path or a connection), from its note, or '' when unknown. */
export function describeHolder(file: Db | string): string {
  let note: WriterNote;
  try {
    note = JSON.parse(fs.readFileSync(`${typeof file === 'string' ? file : file.name}-writer`, 'utf8')) as WriterNote;
  } catch {
    return '';
  }
  if (note.pid === process.pid || !processRunning(note.pid)) return '';
  return `${note.work}, pid ${note.pid}, since ${new Date(note.since).toTimeString().slice(0, 8)}`;
}


export function isBusy(e: unknown): boolean {
  return typeof (e as { code?: unknown }).code === 'string' && (e as { code: string }).code.startsWith('SQLITE_BUSY');
}

function tryBegin(db: Db, timeoutMs: number): boolean {
  db.pragma(`busy_timeout = ${Math.round(timeoutMs)}`);
  try {
    db.exec('BEGIN IMMEDIATE');
    return true;
  } catch (e) {
    if (isBusy(e)) return false;
    throw e;
  } finally {
    db.pragma(`busy_timeout = ${blockingWaitMs(db)}`);
  }
}

function refuse(db: Db, waitedMs: number): WorkspaceBusyError {
  const holder = describeHolder(db);
  return new WorkspaceBusyError(
    `the workspace is busy: another Shelfwright process${holder ? ` (${holder})` : ''} has been writing to it for more ` +
      `than ${(waitedMs / 1000).toFixed(waitedMs < 1000 ? 1 : 0)} s. Nothing was changed; try again when it has finished ` +
      '(or wait longer with SHELFWRIGHT_BUSY_TIMEOUT_MS).',
    db.name,
  );
}

/** BEGIN IMMEDIATE, waiting (blocking) up to the busy timeout; says once that it waits. */
export function beginWrite(db: Db, onWait: WaitListener | undefined = listeners.get(db)): void {
  const limit = blockingWaitMs(db);
  const quiet = Math.min(QUIET_MS, limit);
  if (tryBegin(db, quiet)) return;
  onWait?.(describeHolder(db));
  if (!tryBegin(db, limit - quiet)) throw refuse(db, limit);
}

export interface AsyncWriteOptions {
  /** Told once when the lock is held elsewhere; default: the connection's listener. */
  onWait?: WaitListener;
  /** Wait this long at most (default the busy timeout); Infinity waits until the holder is done. */
  waitMs?: number;
  signal?: AbortSignal;
  /** What this process is doing, for the note other processes read ("an import of signals"). */
  work?: string;
  /**
   * The transaction stays open across awaits (an import reading its file). Meanwhile another request of
   * this same process (the app) must not slip its writes into it, to be committed or rolled back with the
   * import: a `db.transaction` is refused then (it cannot wait without stopping the import it waits for).
   * Only for writers that never call `db.transaction` themselves while open.
   */
  acrossAwaits?: boolean;
}

/** A slice of waiting done inside SQLite's busy handler before the event loop gets a turn. */
const SLICE_MS = 100;

/**
 * BEGIN IMMEDIATE for async work (imports, saving a training run): waits in short slices so the event loop
 * (a web shell's other requests, a cancel) keeps running, and leaves the writer note until `endWrite`.
 */
export async function beginWriteAsync(db: Db, o: AsyncWriteOptions = {}): Promise<void> {
  await ownConnection(db, o.signal);
  try {
    await takeLock(db, o);
  } catch (e) {
    releaseConnection(db);
    throw e;
  }
  if (o.work) writeNote(db, o.work);
  if (o.acrossAwaits) openAcrossAwaits.set(db, o.work ?? 'a long write');
}

/** Connections whose transaction is held open across awaits, with what holds it. */
const openAcrossAwaits = new WeakMap<Db, string>();

/**
 * One connection holds one transaction: two async writers of the same process (the app's import and its
 * training run finishing) would otherwise meet inside one BEGIN. They take turns here, silently: the
 * other is this same app, not "another Shelfwright process".
 */
const turns = new WeakMap<Db, { done: Promise<void>; release: () => void }>();

async function ownConnection(db: Db, signal: AbortSignal | undefined): Promise<void> {
  for (let turn = turns.get(db); turn; turn = turns.get(db)) {
    await turn.done;
    if (signal?.aborted) throw new CancelledError('cancelled while waiting for the workspace');
  }
  let release = () => {};
  const done = new Promise<void>((resolve) => (release = resolve));
  turns.set(db, { done, release });
}

function releaseConnection(db: Db): void {
  const turn = turns.get(db);
  turns.delete(db);
  turn?.release();
}

async function takeLock(db: Db, o: AsyncWriteOptions): Promise<void> {
  if (!tryBegin(db, 0)) {
    const onWait = o.onWait ?? listeners.get(db);
    let told = false;
    const limit = o.waitMs ?? busyTimeoutMs();
    const started = performance.now();
    for (;;) {
      if (o.signal?.aborted) throw new CancelledError('cancelled while waiting for the workspace');
      await nextTurn();
      const waited = performance.now() - started;
      if (!told && waited >= QUIET_MS) {
        onWait?.(describeHolder(db));
        told = true;
      }
      const left = limit - waited;
      if (left <= 0) throw refuse(db, limit);
      if (tryBegin(db, Math.max(0, Math.min(told ? SLICE_MS : QUIET_MS - waited, left)))) break;
    }
  }
}

/** COMMIT or ROLLBACK of a write begun by `beginWriteAsync`, and the note removed. */
export function endWrite(db: Db, commit: boolean): void {
  try {
    if (db.inTransaction) db.exec(commit ? 'COMMIT' : 'ROLLBACK');
  } finally {
    openAcrossAwaits.delete(db);
    removeNote(db);
    releaseConnection(db);
  }
}

function writeNote(db: Db, work: string): void {
  const note: WriterNote = { pid: process.pid, work, since: Date.now() };
  try {
    fs.writeFileSync(notePath(db), JSON.stringify(note), { mode: 0o600 });
  } catch {
    // Only a message depends on it; a folder we cannot write a note into must not stop the write.
  }
}

function removeNote(db: Db): void {
  try {
    const note = JSON.parse(fs.readFileSync(notePath(db), 'utf8')) as WriterNote;
    if (note.pid === process.pid) fs.rmSync(notePath(db), { force: true });
  } catch {
    // no note, or not ours
  }
}

/**
 * Refuses (WorkspaceBusyError) work asked of a connection while this app's own write is open across awaits
 * (an import reading its file): it would otherwise be folded into that write, or fail inside it.
 */
export function refuseWhileAppWrites(db: Db): void {
  const holder = openAcrossAwaits.get(db);
  if (holder !== undefined && db.inTransaction) {
    throw new WorkspaceBusyError(
      `the workspace is busy: this app is still writing to it (${holder}). Nothing was changed; try again when it has finished.`,
      db.name,
    );
  }
}

/**
 * Makes every `db.transaction(fn)` of a writable connection begin IMMEDIATE through `beginWrite` (see the
 * top of this file), so the services' transactions wait visibly instead of failing at once. A transaction
 * inside another stays a savepoint, as better-sqlite3 makes it; `.deferred` keeps the plain read form.
 */
export function immediateTransactions(db: Db): void {
  const plain = db.transaction.bind(db);
  const wrapped = ((fn: (...args: never[]) => unknown) => {
    const t = plain(fn);
    const run = (...args: never[]) => {
      refuseWhileAppWrites(db);
      if (db.inTransaction) return t(...args);
      beginWrite(db);
      try {
        const result = t(...args);
        db.exec('COMMIT');
        return result;
      } catch (e) {
        if (db.inTransaction) db.exec('ROLLBACK');
        throw e;
      }
    };
    return Object.assign(run, { default: run, immediate: run, deferred: t.deferred, exclusive: t.exclusive });
  }) as Db['transaction'];
  db.transaction = wrapped;
}
