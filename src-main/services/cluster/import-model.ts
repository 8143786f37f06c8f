/**
 * `import model DIR`: a Spark ALSModel directory, as `model.save(path)` writes it (ALS.scala
 * `ALSModelWriter.saveImpl`: metadata via `DefaultParamsWriter.saveMetadata`, then `userFactors` and
 * `itemFactors` as Parquet), becomes the workspace's current iALS model. Ids go back through the id map of
 * the export it was fitted on; the model keeps that export's data fingerprint, so it reads as stale once the
 * workspace's data moves on, like a model trained here.
 *
 * Checked before anything is written (a refusal names the file and row, and changes nothing): a folder that
 * is not a saved model, a model of another class, an explicit-feedback fit, a row whose length is not the
 * rank, ids the map does not know or repeats, NaN or infinite factors, and an erasure since the export
 * (the model would carry the erased person's data: DESIGN.md, erasure is final).
 */
import { describeOrigin } from './origin-words.ts';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../core/errors.ts';
import { buildInteractionMatrix } from '../../core/matrix/build.ts';
import { allocateIals, IalsModel } from '../../core/models/ials.ts';
import { transpose } from '../../core/matrix/csr.ts';
import { equivalentRegularization, importedIalsParams, parseAlsMetadata, type SparkAlsMetadata } from '../../core/models/spark-als.ts';
import type { Dataset } from '../../core/types.ts';
import { externalIdsInModelOrder, loadDataset } from '../../store/dataset.ts';
import { erasureGeneration } from '../../store/erasure.ts';
import { dataFingerprint, type ModelOrigin, type ModelRecord } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';
import { saveRun } from '../train/save-run.ts';
import { readFactorDir, partFiles } from './factor-files.ts';
import type { ExportManifest } from './export-signals.ts';
import { readIdMap, readManifest } from './id-map.ts';

export interface ImportModelOptions {
  /** The folder `export signals` wrote (its id map). Default: the model folder's parent. */
  ids?: string;
}

export interface ImportModelReport {
  modelId: number;
  /**
   * Wall time of each stage, ms (reading the ids and factors, folding customers in, storing), and the process's
   * peak RSS in MB after placing the ids, after reading the factors and after storing (for npm run bench:cluster).
   */
  timings: { readMs: number; foldMs: number; saveMs: number; peakRssMb: { ids: number; factors: number; stored: number } };
  origin: ModelOrigin;
  /** The workspace's data changed since the export: the model is stored, and reads as stale. */
  stale: boolean;
  notes: string[];
}

/** Reads and checks `dir`'s metadata: the folder must be a saved model. */
export function readModelMetadata(dir: string): SparkAlsMetadata {
  let st: fs.Stats;
  try {
    st = fs.statSync(dir);
  } catch {
    throw new InputError('no such folder', { file: dir });
  }
  if (!st.isDirectory()) throw new InputError('not a model folder: this is a file (Spark saves a model as a folder of metadata/, userFactors/ and itemFactors/)', { file: dir });
  const metaDir = path.join(dir, 'metadata');
  if (!fs.existsSync(metaDir) || !fs.statSync(metaDir).isDirectory()) {
    throw new InputError('not a saved Spark model: it has no metadata/ folder (ALSModel.save writes metadata/, userFactors/ and itemFactors/)', { file: dir });
  }
  const parts = partFiles(metaDir);
  if (parts.length === 0) throw new InputError('not a saved Spark model: metadata/ holds no part file', { file: metaDir });
  return parseAlsMetadata(fs.readFileSync(parts[0]!, 'utf8'), parts[0]!);
}

export async function importModel(db: Db, dir: string, o: ImportModelOptions = {}): Promise<ImportModelReport> {
  const meta = readModelMetadata(dir);
  for (const side of ['userFactors', 'itemFactors']) {
    const d = path.join(dir, side);
    if (!fs.existsSync(d) || !fs.statSync(d).isDirectory()) throw new InputError(`not a saved Spark ALS model: it has no ${side}/ folder`, { file: dir });
  }
  const exportDir = o.ids ?? path.dirname(path.resolve(dir));
  const manifest = readManifest(exportDir);
  const t0 = performance.now();
  const { fingerprintNow, customerRow, itemRow, nCustomers, nItems } = await placeIds(db, exportDir, manifest);
  const peakIds = peakRssMb();
  const k = meta.rank;
  const params = importedIalsParams(meta);
  // The factors are read straight into the bytes that will be stored (no second copy of a 256 MB model).
  const model = allocateIals(params, nCustomers, nItems);
  const x = model.customerFactors;
  const y = model.itemFactors;
  const hasCustomer = new Uint8Array(nCustomers);
  const hasItem = new Uint8Array(nItems);
  const mapTo = (rowOf: Int32Array, has: Uint8Array) => (id: number) => {
    const row = rowOf[id]!;
    if (row >= 0) has[row] = 1;
    return row;
  };
  await readFactorDir(path.join(dir, 'itemFactors'), 'itemFactors', { rank: k, known: itemRow.length, rowOf: mapTo(itemRow, hasItem), out: y });
  await readFactorDir(path.join(dir, 'userFactors'), 'userFactors', { rank: k, known: customerRow.length, rowOf: mapTo(customerRow, hasCustomer), out: x });

  const t1 = performance.now();
  const peakFactors = peakRssMb();
  let folded = 0;
  let itemsFolded = 0;
  if (hasCustomer.includes(0) || hasItem.includes(0)) {
    const data = readDatasetMatching(db, nItems, nCustomers);
    const history = buildInteractionMatrix(data, manifest.halfLifeDays !== null ? { halfLifeDays: manifest.halfLifeDays } : {});
    for (let u = 0; u < nCustomers; u++) {
      if (hasCustomer[u] || history.indptr[u + 1]! === history.indptr[u]!) continue;
      x.set(model.foldIn(u, history), u * k);
      folded++;
    }
    // Items added since the export, solved the same way from the other side (Spark solves an item's row as a
    // customer's: the customers' factors held, λ times its count): a model with the roles swapped folds them in.
    if (hasItem.includes(0)) {
      const byItem = transpose(history);
      const swapped = new IalsModel(params, y, x);
      for (let i = 0; i < nItems; i++) {
        if (hasItem[i] || byItem.indptr[i + 1]! === byItem.indptr[i]!) continue;
        y.set(swapped.foldIn(i, byItem), i * k);
        hasItem[i] = 1;
        itemsFolded++;
      }
    }
  }
  let itemsWithout = 0;
  for (let i = 0; i < nItems; i++) if (!hasItem[i]) itemsWithout++;
  const importedAt = Date.now();
  const origin: ModelOrigin = {
    source: 'cluster',
    engine: 'Spark ALS',
    importedAt,
    savedAt: Number.isFinite(meta.timestamp) ? meta.timestamp : null,
    sparkVersion: meta.sparkVersion,
    uid: meta.uid,
    rank: k,
    regParam: meta.regParam,
    alpha: meta.alpha,
    maxIter: meta.maxIter,
    exportedAt: manifest.exportedAt,
    customersFoldedIn: folded,
    itemsFoldedIn: itemsFolded,
    itemsWithoutFactors: itemsWithout,
  };
  const notes = [describeOrigin(origin)];
  if (folded) notes.push(`${folded} customers without a row in the model were folded in from their history`);
  if (itemsFolded) notes.push(`${itemsFolded} items without a row in the model were folded in from their signals`);
  if (itemsWithout) notes.push(`${itemsWithout} items have no factors (no row in the model and no signal yet): they score 0 until the next fit`);
  // What our own trainer refits with when asked (the split evaluation): one λ, from Spark's weighted one.
  const { regularizationScaling: _scaling, ...refit } = params;
  const record: ModelRecord = {
    kind: 'ials',
    params: { ...refit, regularization: equivalentRegularization(params.regularization, manifest.medianSignalsPerCustomer) },
    fingerprint: manifest.fingerprint,
    trainedAt: origin.savedAt ?? importedAt,
    trainMs: 0,
    report: { notes, origin },
    bytes: model.serialize(),
  };
  const t2 = performance.now();
  const saved = await saveRun(db, [record], manifest.fingerprint, manifest.erasureGeneration);
  const timings = { readMs: t1 - t0, foldMs: t2 - t1, saveMs: performance.now() - t2, peakRssMb: { ids: peakIds, factors: peakFactors, stored: peakRssMb() } };
  const stale = saved.stale || fingerprintNow !== manifest.fingerprint;
  if (stale) notes.push("the workspace's data changed since the export: the model is stored, marked stale (export and fit again to bring it up to date)");
  return { modelId: saved.ids[0]!, timings, origin, stale, notes };
}

/** The process's peak resident set so far, MB (getrusage's maxrss is in KiB). */
const peakRssMb = (): number => process.resourceUsage().maxRSS / 1024;

/** The dataset, checked to be the one the ids were read from (no import slipped in between the two reads). */
function readDatasetMatching(db: Db, items: number, customers: number): Dataset {
  const ds = loadDataset(db);
  if (ds.items.length !== items || ds.customerIds.length !== customers) {
    throw new InputError('the workspace changed while the model was being imported (another process imported data): nothing was changed; import again');
  }
  return ds;
}

/**
 * Where each exported index lives in the workspace now (−1: gone since), as typed arrays: the id strings and
 * their look-up table are garbage once this returns, before the factors are read (a million ids are some
 * 100 MB as strings). Only the ids are read, in the dense order every model follows (items and customers by
 * row id, store/dataset.ts): a million-item catalogue's titles are not needed to place factors. Refuses an
 * export made before an erasure.
 */
async function placeIds(db: Db, exportDir: string, manifest: ExportManifest) {
  let generation = 0;
  let fingerprintNow = '';
  let itemExternal: string[] = [];
  let customerExternal: string[] = [];
  db.transaction(() => {
    generation = erasureGeneration(db);
    fingerprintNow = dataFingerprint(db);
    ({ items: itemExternal, customers: customerExternal } = externalIdsInModelOrder(db));
  }).deferred();
  if (generation !== manifest.erasureGeneration) {
    throw new InputError(
      "a customer was erased (forget) after these signals were exported, so a model fitted on them holds that person's data: " +
        'export the signals again, fit again on the cluster, and import that model; nothing was changed',
      { file: path.join(exportDir, 'shelfwright-export.json') },
    );
  }
  return {
    fingerprintNow,
    customerRow: await exportedToCurrent(exportDir, 'customers', manifest.customers, customerExternal),
    itemRow: await exportedToCurrent(exportDir, 'items', manifest.items, itemExternal),
    nCustomers: customerExternal.length,
    nItems: itemExternal.length,
  };
}

/** For each index of the export's id map, the row of the same id in the workspace now, or −1. */
async function exportedToCurrent(exportDir: string, name: 'customers' | 'items', expected: number, now: readonly string[]): Promise<Int32Array> {
  const exported = await readIdMap(exportDir, name, expected);
  const rowOf = new Map<string, number>();
  now.forEach((id, i) => rowOf.set(id, i));
  return Int32Array.from(exported, (id) => rowOf.get(id) ?? -1);
}

export { describeOrigin };
