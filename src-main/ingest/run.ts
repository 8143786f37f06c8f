import { BugError, InputError } from '../core/errors.ts';
import { CatalogueWriter, logImport, type CustomerWrite, type ItemWrite, type SignalWrite } from '../store/catalogue-writes.ts';
import type { Db } from '../store/workspace.ts';
import { planColumns, type ColumnPlan, type ImportTarget, type Mapping } from './fields.ts';
import { rowConverter, type Problem } from './rows.ts';
import { formatOf, readSource, type ImportFormat } from './source.ts';
import type { DateOrder } from './values.ts';

export interface RunOptions {
  target: ImportTarget;
  file: string;
  format?: ImportFormat;
  mapping?: Mapping;
  delimiter?: string;
  dateOrder?: DateOrder;
  /** Signals naming an unknown customer: reject the row (default) or create the customer. Items are never created. */
  unknown?: 'reject' | 'create';
  /** false (default): one rejected row fails the whole import. true: valid rows are committed, rejects reported. */
  acceptPartial?: boolean;
  /** Called every PROGRESS_EVERY rows while rows are being written. */
  onProgress?: (p: { rows: number }) => void;
}

export interface RowError {
  line: number;
  column: number | string | null;
  reason: string;
  /** `file:line:column: reason` (InputError.describe()). */
  message: string;
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
  errorCount: number;
  committed: boolean;
  elapsedMs: number;
  mapping: Mapping;
}

export const MAX_ERRORS = 100;
export const PROGRESS_EVERY = 10_000;

/**
 * One import as ONE transaction. better-sqlite3's `transaction()` cannot span the awaits of a stream, so
 * BEGIN IMMEDIATE / COMMIT / ROLLBACK are issued by hand (its docs, "Caveats" of .transaction); every write
 * in between is synchronous and nothing else may use the connection until this returns. A thrown error or a
 * killed process leaves the workspace exactly as before (SQLite's atomic commit).
 */
export async function runImport(db: Db, o: RunOptions): Promise<ImportReport> {
  const started = performance.now();
  const format = formatOf(o.file, o.format);
  if (db.inTransaction) throw new BugError('another write is in progress on this connection');
  // Signals reference items and customers by row ids this import reads from those very tables inside its
  // own transaction, so every reference is valid by construction; the per-row foreign-key probe cost ~40%
  // of insert time (measured). The pragma is a no-op inside a transaction (SQLite docs, "PRAGMA
  // foreign_keys"), hence set before BEGIN and restored after COMMIT or ROLLBACK.
  const foreignKeys = db.pragma('foreign_keys', { simple: true }) as number;
  if (o.target === 'signals' && foreignKeys) db.pragma('foreign_keys = OFF');
  try {
    return await inTransaction(db, o, format, started);
  } finally {
    if (o.target === 'signals' && foreignKeys) db.pragma('foreign_keys = ON');
  }
}

async function inTransaction(db: Db, o: RunOptions, format: ImportFormat, started: number): Promise<ImportReport> {
  db.exec('BEGIN IMMEDIATE');
  try {
    const report = await readAndWrite(db, o, format);
    report.elapsedMs = Math.round(performance.now() - started);
    if (report.rejected > 0 && !o.acceptPartial) {
      db.exec('ROLLBACK');
      return { ...report, added: 0, updated: 0, unchanged: 0, customersCreated: 0, committed: false };
    }
    report.committed = true;
    logImport(db, o.target, o.file, { ...report, errors: report.errors.slice(0, 10) });
    db.exec('COMMIT');
    return report;
  } catch (e) {
    if (db.inTransaction) db.exec('ROLLBACK');
    throw e;
  }
}

async function readAndWrite(db: Db, o: RunOptions, format: ImportFormat): Promise<ImportReport> {
  const writer = new CatalogueWriter(db);
  const report: ImportReport = {
    target: o.target, file: o.file, format, delimiter: null, rows: 0, added: 0, updated: 0, unchanged: 0,
    rejected: 0, customersCreated: 0, errors: [], errorCount: 0, committed: false, elapsedMs: 0, mapping: {},
  };
  const reject = (line: number, column: number | string | null, reason: string, newRow = true) => {
    if (newRow) report.rejected++;
    report.errorCount++;
    if (report.errors.length < MAX_ERRORS) {
      const message = new InputError(reason, column === null ? { file: o.file, line } : { file: o.file, line, column }).describe();
      report.errors.push({ line, column, reason, message });
    }
  };
  let plan: ColumnPlan | undefined;
  let convert: ReturnType<typeof rowConverter> | undefined;
  let validSignals = 0;
  const problems: Problem[] = [];
  const createCustomers = o.unknown === 'create';
  const info = await readSource(
    o.file,
    format,
    {
      header(headers, delimiter) {
        plan = planColumns(o.file, o.target, headers, o.mapping);
        report.mapping = plan.mapping;
        convert = rowConverter({ plan, dateOrder: o.dateOrder, delimiter });
        if (o.target === 'signals') writer.startSignals();
      },
      newColumn(name) {
        plan!.headers.push(name);
        plan!.extra.push(plan!.headers.length - 1);
      },
      broken(line, reason) {
        report.rows++;
        reject(line, null, reason);
      },
      row(values, line) {
        report.rows++;
        problems.length = 0;
        const row = convert!(values, problems);
        if (row === undefined) {
          // One rejected row counts once, however many of its cells are wrong; each cell is reported.
          problems.forEach((p, k) => reject(line, p.column, p.reason, k === 0));
          return;
        }
        let outcome;
        if (o.target === 'items') outcome = writer.writeItem(row as ItemWrite);
        else if (o.target === 'customers') outcome = writer.writeCustomer(row as CustomerWrite);
        else {
          outcome = writer.writeSignal(row as SignalWrite, createCustomers);
          if (outcome === undefined) validSignals++;
        }
        if (typeof outcome === 'object') reject(line, columnOf(plan!, format, outcome.reject), outcome.reject);
        else if (outcome !== undefined) report[outcome]++;
        if (o.onProgress && report.rows % PROGRESS_EVERY === 0) o.onProgress({ rows: report.rows });
      },
    },
    o.delimiter,
  );
  report.delimiter = info.delimiter ?? null;
  if (!plan) throw new InputError('the file is empty: no header row and no records', { file: o.file });
  if (report.rows === 0) throw new InputError('the file has a header but no data rows', { file: o.file, line: 2 });
  // A failing all-or-nothing import is rolled back anyway: skip rebuilding indexes it would throw away.
  if (o.target === 'signals' && (report.rejected === 0 || o.acceptPartial)) {
    const c = writer.finishSignals(validSignals);
    Object.assign(report, { added: c.added, updated: c.updated, unchanged: c.unchanged, customersCreated: c.customersCreated });
  }
  return report;
}

/** The column a writer's reason names ('item: unknown item ...' -> the item column). */
function columnOf(plan: ColumnPlan, format: ImportFormat, reason: string): number | string | null {
  const field = /^(\w+):/.exec(reason)?.[1];
  const i = field === undefined ? -1 : (plan.index[field] ?? -1);
  if (i < 0) return null;
  return format === 'csv' ? i + 1 : plan.headers[i]!;
}
