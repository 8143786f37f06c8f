import fs from 'node:fs';
import { InputError } from '../core/errors.ts';
import type { SignalKind } from '../core/types.ts';
import { plural } from '../core/util/plural.ts';
import { CatalogueWriter, logImport, type CustomerWrite, type ItemWrite, type SignalBatch } from '../store/catalogue-writes.ts';
import { checkForeignKeys, foreignKeysChecked, type Db } from '../store/workspace.ts';
import { beginWriteAsync, endWrite } from '../store/write-lock.ts';
import { planColumns, type ColumnPlan, type ImportTarget, type Mapping } from './fields.ts';
import { PictureIntake, type PendingPicture, type PictureReading, type PictureSummary } from './pictures.ts';
import { RejectLog, type RowError } from './rejects.ts';
import { rowConverter, type ItemInput, type Problem } from './rows.ts';
import { readSignals, type SignalReadOptions } from './signal-read.ts';
import { readSignalsInThread, signalWorkerAvailable } from './signal-thread.ts';
import { formatOf, readSource, type ImportFormat } from './source.ts';
import type { DateOrder } from './values.ts';

export interface RunOptions {
  target: ImportTarget;
  file: string;
  format?: ImportFormat;
  mapping?: Mapping;
  delimiter?: string;
  dateOrder?: DateOrder;
  /** Signals: the kind of every row, for a file without a kind column (a file with one is refused). */
  kind?: SignalKind;
  /** Signals naming an unknown customer: reject the row (default) or create the customer. Items are never created. */
  unknown?: 'reject' | 'create';
  /** false (default): one rejected row fails the whole import. true: valid rows are committed, rejects reported. */
  acceptPartial?: boolean;
  /** Called every PROGRESS_EVERY rows while rows are being written. */
  onProgress?: (p: { rows: number }) => void;
  /**
   * Signals only: parse in a worker thread while this one writes (signal-thread.ts). Default: only for
   * files of PIPELINE_MIN_BYTES or more. Both paths give identical tables and reports.
   */
  parseThread?: boolean;
  /**
   * Signals into a table that has some: keep the identity index and upsert row by row ('upsert'), or drop
   * it, resolve repeats in memory and rebuild it ('rebuild'). Default: 'rebuild' when the file is expected
   * to bring at least APPEND_REBUILD_RATIO rows per stored row. Both leave identical tables and reports.
   */
  appendPath?: 'upsert' | 'rebuild';
  /**
   * Items: whether picture paths in the image column are read ('read', default: a file imported by its path)
   * or only recorded ('record': a file sent by a page, which may not make the app read this machine's files).
   */
  pictures?: PictureReading;
}

export interface ImportReport {
  target: ImportTarget;
  file: string;
  format: ImportFormat;
  delimiter: string | null;
  /** Data rows read (header and blank lines excluded). */
  rows: number;
  added: number;
  updated: number;
  unchanged: number;
  rejected: number;
  /** Signals only: customers created for unknown customer ids (unknown: 'create'). */
  customersCreated: number;
  /** The first MAX_ERRORS rejected rows; `errorCount` has them all. */
  errors: RowError[];
  /**
   * Signals only: rows dated after today (UTC). Accepted, since clocks and zones differ, but counted and
   * warned about: a backtest holds out the latest interactions, and rows from the future would be those.
   */
  futureDated: number;
  /** What the editor should look at although the import went through (future-dated rows). */
  warnings: string[];
  errorCount: number;
  committed: boolean;
  elapsedMs: number;
  mapping: Mapping;
  /** Items with an image column: what became of the pictures it named (ingest/pictures.ts). */
  pictures?: PictureSummary;
}

export { MAX_ERRORS, type RowError } from './rejects.ts';
export const PROGRESS_EVERY = 10_000;
/**
 * Signal files from this size on are parsed in a worker thread (when `parseThread` is not given and the
 * worker's file is there). The thread costs ~0.4 s to start under the TypeScript loader (tsx) and then saves
 * the INSERT time (~0.5 s per 1M rows) by overlapping it with parsing: on 1M rows (42 MB) the two paths tie,
 * 235,000 rows/s each at load 1.6, and one thread wins at load 2 (241,000 vs 223,000); on 3M rows (126 MB)
 * the thread wins, 257,000 vs 240,000 rows/s at load 1.2 (bench/import.bench.ts, two cores, measured
 * 2026-12-02). Below 64 MiB (about 1.5M signal rows) one thread is as fast or faster, and lighter.
 */
export const PIPELINE_MIN_BYTES = 64 << 20;

/**
 * One import as ONE transaction. better-sqlite3's `transaction()` cannot span the awaits of a stream, so
 * BEGIN IMMEDIATE / COMMIT / ROLLBACK are issued by hand (its docs, "Caveats" of .transaction); every write
 * in between is synchronous and nothing else may use the connection until this returns. A thrown error or a
 * killed process leaves the workspace exactly as before (SQLite's atomic commit).
 */
export async function runImport(db: Db, o: RunOptions): Promise<ImportReport> {
  const started = performance.now();
  const format = formatOf(o.file, o.format);
  // Another import of this app on the same connection is waited for in beginWriteAsync (one turn at a time).
  // Signals reference items and customers by row ids this import reads from those very tables inside its
  // own transaction, so every reference is valid by construction; the per-row foreign-key probe cost ~40%
  // of insert time (measured). The pragma is a no-op inside a transaction (SQLite docs, "PRAGMA
  // foreign_keys"), hence set before BEGIN and restored after COMMIT or ROLLBACK.
  const foreignKeys = foreignKeysChecked(db);
  if (o.target === 'signals' && foreignKeys) checkForeignKeys(db, false);
  try {
    return await inTransaction(db, o, format, started);
  } finally {
    if (o.target === 'signals' && foreignKeys) checkForeignKeys(db, true);
  }
}

async function inTransaction(db: Db, o: RunOptions, format: ImportFormat, started: number): Promise<ImportReport> {
  // Another process writing: wait for it without blocking the event loop, say so once, refuse after the busy
  // timeout (store/write-lock.ts); the note lets a process waiting on us say "an import of signals".
  await beginWriteAsync(db, { work: `an import of ${o.target}`, acrossAwaits: true });
  try {
    const report = await readAndWrite(db, o, format);
    report.elapsedMs = Math.round(performance.now() - started);
    if (report.rejected > 0 && !o.acceptPartial) {
      endWrite(db, false);
      return { ...report, added: 0, updated: 0, unchanged: 0, customersCreated: 0, committed: false };
    }
    report.committed = true;
    logImport(db, o.target, o.file, { ...report, errors: report.errors.slice(0, 10) });
    endWrite(db, true);
    return report;
  } catch (e) {
    endWrite(db, false);
    throw e;
  }
}

async function readAndWrite(db: Db, o: RunOptions, format: ImportFormat): Promise<ImportReport> {
  const writer = new CatalogueWriter(db);
  const report: ImportReport = {
    target: o.target, file: o.file, format, delimiter: null, rows: 0, added: 0, updated: 0, unchanged: 0,
    rejected: 0, customersCreated: 0, errors: [], errorCount: 0, futureDated: 0, warnings: [], committed: false, elapsedMs: 0, mapping: {},
  };
  if (o.target === 'signals') return readAndWriteSignals(writer, o, format, report);
  const rejects = new RejectLog(o.file);
  let plan: ColumnPlan | undefined;
  let convert: ReturnType<typeof rowConverter> | undefined;
  const problems: Problem[] = [];
  const pictures = o.target === 'items' ? new PictureIntake(o.file, o.pictures ?? 'read') : undefined;
  const info = await readSource(
    o.file,
    format,
    {
      header(headers, delimiter) {
        plan = planColumns(o.file, o.target, headers, o.mapping, o.kind);
        report.mapping = plan.mapping;
        convert = rowConverter({ plan, dateOrder: o.dateOrder, delimiter });
      },
      newColumn(name) {
        plan!.headers.push(name);
        plan!.extra.push(plan!.headers.length - 1);
      },
      broken(line, reason) {
        rejects.record = undefined; // the reason names the record itself
        report.rows++;
        rejects.add(line, null, reason);
      },
      row(values, line, record) {
        rejects.record = record;
        report.rows++;
        problems.length = 0;
        const row = convert!(values, problems);
        if (row === undefined) {
          // One rejected row counts once, however many of its cells are wrong; each cell is reported.
          problems.forEach((p, k) => rejects.add(line, p.column, p.reason, k === 0));
          return;
        }
        let picture: PendingPicture | undefined;
        const cell = (row as ItemInput).picture;
        if (pictures && cell !== undefined) {
          // Checked before the item is written: a refused picture rejects its row whole.
          const checked = pictures.check((row as ItemInput).externalId, cell, line, columnOf(plan!, format, 'image:') ?? 'image');
          if ('reject' in checked) {
            rejects.add(line, columnOf(plan!, format, checked.reject), checked.reject);
            return;
          }
          picture = checked;
        }
        const outcome = o.target === 'items' ? writer.writeItem(row as ItemWrite) : writer.writeCustomer(row as CustomerWrite);
        if (typeof outcome === 'object') rejects.add(line, columnOf(plan!, format, outcome.reject), outcome.reject);
        else {
          report[outcome]++;
          if (picture) pictures!.add(picture);
        }
        if (o.onProgress && report.rows % PROGRESS_EVERY === 0) o.onProgress({ rows: report.rows });
      },
    },
    o.delimiter,
  );
  report.delimiter = info.delimiter ?? null;
  Object.assign(report, { rejected: rejects.rejected, errorCount: rejects.errorCount, errors: rejects.errors });
  checkNotEmpty(o.file, plan !== undefined, report.rows);
  // Pictures are read and made only for an import that will commit: a failing one is rolled back anyway.
  if (pictures && plan!.index.image! >= 0 && (report.rejected === 0 || o.acceptPartial)) {
    report.pictures = await pictures.finish(db, report.warnings);
  }
  return report;
}

/**
 * Signals: parsed, checked and resolved to row ids by `readSignals`, written in typed-array batches of
 * SIGNAL_BATCH rows, then counted once by `finishSignals`.
 */
async function readAndWriteSignals(writer: CatalogueWriter, o: RunOptions, format: ImportFormat, report: ImportReport): Promise<ImportReport> {
  const bytes = fs.statSync(o.file, { throwIfNoEntry: false })?.size ?? 0;
  const thread = o.parseThread ?? (bytes >= PIPELINE_MIN_BYTES && signalWorkerAvailable());
  writer.startSignals(estimateRows(o.file, bytes), o.appendPath);
  let nextProgress = PROGRESS_EVERY;
  const write = (b: SignalBatch) => {
    writer.writeSignalBatch(b);
    for (; o.onProgress && b.rowsRead >= nextProgress; nextProgress += PROGRESS_EVERY) o.onProgress({ rows: nextProgress });
  };
  const options: SignalReadOptions = {
    file: o.file,
    format,
    createCustomers: o.unknown === 'create',
    ...(o.mapping && { mapping: o.mapping }),
    ...(o.delimiter && { delimiter: o.delimiter }),
    ...(o.dateOrder && { dateOrder: o.dateOrder }),
    ...(o.kind && { kind: o.kind }),
    futureAfter: endOfTodayUtc(Date.now()),
  };
  const r = await (thread ? readSignalsInThread : readSignals)(options, writer.idMaps(), write);
  Object.assign(report, {
    rows: r.rows, rejected: r.rejected, errorCount: r.errorCount, errors: r.errors, mapping: r.mapping ?? {}, delimiter: r.delimiter ?? null,
  });
  checkNotEmpty(o.file, r.mapping !== undefined, r.rows);
  report.futureDated = r.futureDated;
  if (r.futureDated > 0) {
    report.warnings.push(
      `${plural(r.futureDated, 'signal is', 'signals are')} dated after today (the latest ${new Date(r.latestFuture).toISOString().slice(0, 10)}): ` +
        'check the file\'s dates; a backtest holds out the latest signals, and these would be them',
    );
  }
  // A failing all-or-nothing import is rolled back anyway: skip rebuilding indexes it would throw away.
  if (report.rejected === 0 || o.acceptPartial) {
    const c = writer.finishSignals(r.valid);
    Object.assign(report, { added: c.added, updated: c.updated, unchanged: c.unchanged, customersCreated: c.customersCreated });
  }
  return report;
}

/** Bytes read from a file's start to estimate its rows. */
const SAMPLE_BYTES = 64 << 10;

/**
 * About how many rows a file holds, from its size and the line length of its first 64 KiB (a file of
 * one-line records; a JSON array written on one line counts as one). Only decides how to write (the
 * writer's append path), never what is written.
 */
export function estimateRows(file: string, bytes: number): number {
  if (bytes === 0) return 0;
  const sample = Buffer.alloc(Math.min(SAMPLE_BYTES, bytes));
  const fd = fs.openSync(file, 'r');
  try {
    fs.readSync(fd, sample, 0, sample.length, 0);
  } finally {
    fs.closeSync(fd);
  }
  let lines = 0;
  for (let i = sample.indexOf(10); i >= 0; i = sample.indexOf(10, i + 1)) lines++;
  return Math.round(bytes / (sample.length / Math.max(1, lines)));
}

/** The first instant after today in UTC: a row of today is never "future", whatever the shop's zone. */
function endOfTodayUtc(now: number): number {
  const d = new Date(now);
  return Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate() + 1) - 1;
}

function checkNotEmpty(file: string, sawHeader: boolean, rows: number): void {
  if (!sawHeader) throw new InputError('the file is empty: no header row and no records', { file });
  if (rows === 0) throw new InputError('the file has a header but no data rows', { file, line: 2 });
}

/** The column a writer's reason names ('item: unknown item ...' -> the item column). */
function columnOf(plan: ColumnPlan, format: ImportFormat, reason: string): number | string | null {
  const field = /^(\w+):/.exec(reason)?.[1];
  const i = field === undefined ? -1 : (plan.index[field] ?? -1);
  if (i < 0) return null;
  return format === 'csv' ? i + 1 : plan.headers[i]!;
}
