/**
 * `export signals --format parquet`: the workspace's interaction matrix, in files a Spark cluster reads as
 * they are, for teams that train ALS there and curate here (docs/cluster.md).
 *
 * OUT/
 *   signals/part-00000.parquet ...   customer: int, item: int, rating: float — one row per (customer, item)
 *                                    with a positive sum, after kind weights and optional time decay: the
 *                                    very matrix our own iALS trains on (core/matrix/build.ts)
 *   customers/part-00000.parquet     index: int, id: string — the id map of customers
 *   items/part-00000.parquet         index: int, id: string — the id map of items
 *   shelfwright-export.json          what `import model` checks: the data fingerprint, the erasure generation
 *
 * Integer ids because Spark's ALS takes only ids "within the integer value range" (ALS.scala `checkIntegers`).
 * The indices are the workspace's own dense order at export time; the id map, not the order, is what
 * `import model` trusts, so the workspace may change in between.
 */
import fs from 'node:fs';
import { signalTimeCoverage } from '../../store/stats.ts';
import path from 'node:path';
import { parquetWriteFile } from 'hyparquet-writer';
import { InputError } from '../../core/errors.ts';
import { buildInteractionMatrix, DEFAULT_KIND_WEIGHTS } from '../../core/matrix/build.ts';
import type { Dataset } from '../../core/types.ts';
import { loadDataset } from '../../store/dataset.ts';
import { erasureGeneration } from '../../store/erasure.ts';
import { dataFingerprint } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';

export const EXPORT_MANIFEST = 'shelfwright-export.json';
export const EXPORT_FORMAT = 'shelfwright-signals';

export interface ExportManifest {
  format: typeof EXPORT_FORMAT;
  version: 1;
  exportedAt: number;
  /** store/models.ts dataFingerprint of the data exported: an imported model is current while the workspace still has it. */
  fingerprint: string;
  /** store/erasure.ts generation at export: a model fitted on this export is refused after a later erasure. */
  erasureGeneration: number;
  customers: number;
  items: number;
  signals: number;
  kindWeights: Record<string, number>;
  halfLifeDays: number | null;
  /** Median count of positive entries per customer with any (docs/cluster.md: maps Spark's regParam to our λ). */
  medianSignalsPerCustomer: number;
}

export interface ExportOptions {
  halfLifeDays?: number;
  /** Rows per signals part file (bounded memory while writing; Spark reads any number of parts). */
  rowsPerFile?: number;
}

export interface ExportReport {
  out: string;
  files: string[];
  manifest: ExportManifest;
}

const DEFAULT_ROWS_PER_FILE = 2_000_000;

/** Writes the export into `out`, which must not exist or be an empty folder; on failure removes what it wrote. */
export function exportSignals(db: Db, out: string, o: ExportOptions = {}): ExportReport {
  if (o.halfLifeDays !== undefined && !(o.halfLifeDays > 0)) throw new InputError(`the half-life must be a number of days > 0, got ${o.halfLifeDays}`);
  // A decay asked of signals that carry no time would change nothing while seeming to: refused before any write.
  if (o.halfLifeDays !== undefined) {
    const c = signalTimeCoverage(db);
    if (c.signals > 0 && c.timed === 0) {
      throw new InputError(`no signal has a time, so there is no age to decay by: leave out the half-life (${c.signals.toLocaleString('en')} signals, none timed)`, { column: 'halfLifeDays' });
    }
  }
  prepareOutFolder(out);
  let ds: Dataset | undefined;
  let fingerprint = '';
  let generation = 0;
  // One read transaction: the fingerprint and generation describe exactly the rows exported.
  db.transaction(() => {
    generation = erasureGeneration(db);
    fingerprint = dataFingerprint(db);
    ds = loadDataset(db);
  }).deferred();
  const data = ds!;
  const m = buildInteractionMatrix(data, o.halfLifeDays !== undefined ? { halfLifeDays: o.halfLifeDays } : {});
  const written: string[] = [];
  try {
    const rowsPerFile = o.rowsPerFile ?? DEFAULT_ROWS_PER_FILE;
    const nnz = m.indptr[m.rows]!;
    const customer = new Int32Array(nnz);
    const perCustomer: number[] = [];
    for (let u = 0; u < m.rows; u++) {
      const a = m.indptr[u]!;
      const b = m.indptr[u + 1]!;
      customer.fill(u, a, b);
      if (b > a) perCustomer.push(b - a);
    }
    fs.mkdirSync(path.join(out, 'signals'));
    for (let part = 0, start = 0; start < nnz || part === 0; part++, start += rowsPerFile) {
      const end = Math.min(nnz, start + rowsPerFile);
      const file = path.join(out, 'signals', `part-${String(part).padStart(5, '0')}.parquet`);
      parquetWriteFile({
        filename: file,
        columnData: [
          { name: 'customer', data: customer.subarray(start, end), type: 'INT32', nullable: false },
          { name: 'item', data: m.indices.subarray(start, end), type: 'INT32', nullable: false },
          { name: 'rating', data: m.data.subarray(start, end), type: 'FLOAT', nullable: false },
        ],
      });
      written.push(file);
      if (end >= nnz) break;
    }
    written.push(writeIdMap(out, 'customers', data.customerExternalIds));
    written.push(writeIdMap(out, 'items', data.items.map((it) => it.externalId)));
    perCustomer.sort((a, b) => a - b);
    const manifest: ExportManifest = {
      format: EXPORT_FORMAT,
      version: 1,
      exportedAt: Date.now(),
      fingerprint,
      erasureGeneration: generation,
      customers: data.customerIds.length,
      items: data.items.length,
      signals: nnz,
      kindWeights: { ...DEFAULT_KIND_WEIGHTS },
      halfLifeDays: o.halfLifeDays ?? null,
      medianSignalsPerCustomer: perCustomer.length ? perCustomer[Math.floor((perCustomer.length - 1) / 2)]! : 0,
    };
    const manifestFile = path.join(out, EXPORT_MANIFEST);
    fs.writeFileSync(manifestFile, `${JSON.stringify(manifest, null, 2)}\n`, { mode: 0o600 });
    written.push(manifestFile);
    return { out, files: written, manifest };
  } catch (e) {
    for (const sub of ['signals', 'customers', 'items']) fs.rmSync(path.join(out, sub), { recursive: true, force: true });
    fs.rmSync(path.join(out, EXPORT_MANIFEST), { force: true });
    throw e;
  }
}

function writeIdMap(out: string, name: 'customers' | 'items', ids: readonly string[]): string {
  fs.mkdirSync(path.join(out, name));
  const file = path.join(out, name, 'part-00000.parquet');
  const index = new Int32Array(ids.length);
  for (let q = 0; q < ids.length; q++) index[q] = q;
  parquetWriteFile({
    filename: file,
    columnData: [
      { name: 'index', data: index, type: 'INT32', nullable: false },
      { name: 'id', data: ids as string[], type: 'STRING', nullable: false },
    ],
  });
  return file;
}

/** A new folder, or an empty one; never writes into a folder that holds anything (it may be someone's data). */
function prepareOutFolder(out: string): void {
  let st: fs.Stats | undefined;
  try {
    st = fs.lstatSync(out);
  } catch {
    fs.mkdirSync(out, { recursive: true, mode: 0o700 });
    return;
  }
  if (!st.isDirectory()) throw new InputError('the export goes into a folder, and this is a file: give a new folder name', { file: out });
  if (fs.readdirSync(out).length > 0) throw new InputError('the folder is not empty: give a new folder name (an export never writes among other files)', { file: out });
}
