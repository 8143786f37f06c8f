/**
 * `import model`: Spark ALSModel folders written by DuckDB (test/cluster/spark-fixture.ts) become the
 * workspace's iALS model, scored as Spark scores them (the dot product of ALSModel's `predict` udf), and
 * bad folders are refused with the file and row named and nothing written.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { loadIals } from '../../src-main/core/models/ials.ts';
import { exportSignals } from '../../src-main/services/cluster/export-signals.ts';
import { importModel } from '../../src-main/services/cluster/import-model.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { ModelRepo, modelStatus } from '../../src-main/store/models.ts';
import { smallWorkspace } from '../store/models-fixture.ts';
import { duck, factorValue, range, sparkMetadata, writeSparkModelDir } from './spark-fixture.ts';

const ws = smallWorkspace({ items: 30, customers: 60, seed: 3 });
const root = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-cluster-'));
const exportDir = path.join(root, 'export');
afterAll(() => {
  ws.db.close();
  fs.rmSync(ws.dir, { recursive: true, force: true });
  fs.rmSync(root, { recursive: true, force: true });
});
beforeAll(() => {
  exportSignals(ws.db, exportDir);
});

const RANK = 8;
let n = 0;
const modelDir = () => path.join(exportDir, `model-${++n}`);
const good = { rank: RANK, users: { ids: range(60), rank: RANK, parts: 2 }, items: { ids: range(30).reverse(), rank: RANK } };
const iAlsRows = () => new ModelRepo(ws.db).list().filter((m) => m.kind === 'ials').map((m) => m.id);

/** The refusal of importing `dir`, checking that no model was written. */
async function refusal(dir: string): Promise<InputError> {
  const before = iAlsRows();
  const e = await importModel(ws.db, dir).then(
    () => null,
    (x: unknown) => x,
  );
  expect(e).toBeInstanceOf(InputError);
  expect(iAlsRows()).toEqual(before);
  return e as InputError;
}

describe('export signals', () => {
  it('writes the interaction matrix and id maps as Parquet that DuckDB reads with Spark-friendly types', async () => {
    const m = buildInteractionMatrix(loadDataset(ws.db));
    const c = await duck();
    const rows = (await c.runAndReadAll(`SELECT count(*)::INTEGER, sum(rating)::DOUBLE, max(customer), max(item) FROM read_parquet('${exportDir}/signals/*.parquet')`)).getRows()[0]!;
    const total = Array.from(m.data).reduce((s, v) => s + v, 0);
    expect(rows[0]).toBe(m.indptr[m.rows]);
    expect(rows[1] as number).toBeCloseTo(total, 3);
    const types = (await c.runAndReadAll(`DESCRIBE SELECT * FROM read_parquet('${exportDir}/signals/*.parquet')`)).getRows().map((r) => `${r[0]}:${r[1]}`);
    // Spark's ALS casts ids to Int and ratings to Float (ALS.scala `checkIntegers`, `.cast(FloatType)`).
    expect(types).toEqual(['customer:INTEGER', 'item:INTEGER', 'rating:FLOAT']);
    const idMap = (await c.runAndReadAll(`SELECT index, id FROM read_parquet('${exportDir}/items/*.parquet') ORDER BY index LIMIT 2`)).getRows();
    expect(idMap).toEqual([[0, 'it-1'], [1, 'it-2']]);
  });

  it('applies the optional time decay as training does, and records it for the import', async () => {
    const out = path.join(root, 'decayed');
    const r = exportSignals(ws.db, out, { halfLifeDays: 3 });
    expect(r.manifest.halfLifeDays).toBe(3);
    const m = buildInteractionMatrix(loadDataset(ws.db), { halfLifeDays: 3 });
    const c = await duck();
    const [count, sum] = (await c.runAndReadAll(`SELECT count(*)::INTEGER, sum(rating)::DOUBLE FROM read_parquet('${out}/signals/*.parquet')`)).getRows()[0]!;
    expect(count).toBe(m.indptr[m.rows]);
    expect(sum as number).toBeCloseTo(Array.from(m.data).reduce((a, v) => a + v, 0), 3);
    // Decay only lowers weights: the decayed total is below the undecayed one (2^(-age/3) < 1 for older signals).
    const plain = buildInteractionMatrix(loadDataset(ws.db));
    expect(sum as number).toBeLessThan(Array.from(plain.data).reduce((a, v) => a + v, 0));
  });

  it('refuses a folder that already holds files', () => {
    expect(() => exportSignals(ws.db, exportDir)).toThrow(/the folder is not empty/);
  });
});

describe('import model', () => {
  it('stores a model DuckDB wrote in Spark\'s layout and scores each customer as the dot product DuckDB computes', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, good);
    const report = await importModel(ws.db, dir);
    expect(report.stale).toBe(false);
    expect(report.origin).toMatchObject({ source: 'cluster', rank: RANK, sparkVersion: '3.5.1', regParam: 0.05, alpha: 2, maxIter: 10 });
    expect(report.notes[0]).toMatch(/^trained on a cluster \(Spark 3\.5\.1 ALS\), imported \d{4}-\d\d-\d\d, rank 8$/);
    const stored = new ModelRepo(ws.db).loadCurrent('ials')!;
    expect(stored.report.origin?.rank).toBe(RANK);
    const model = loadIals(stored.bytes);
    expect(model.params).toMatchObject({ factors: RANK, alpha: 2, scaling: 'linear', regularization: 0.05, regularizationScaling: 'signals' });
    // Spark's prediction is featuresA · featuresB (ALSModel `predict` udf); DuckDB computes it from its own files.
    const c = await duck();
    const spark = (
      await c.runAndReadAll(
        `SELECT u.id, i.id, list_dot_product(u.features, i.features)::DOUBLE
         FROM read_parquet('${dir}/userFactors/*.parquet') u, read_parquet('${dir}/itemFactors/*.parquet') i
         WHERE u.id IN (0, 17, 59)`,
      )
    ).getRows() as [number, number, number][];
    const ds = loadDataset(ws.db);
    const history = buildInteractionMatrix(ds);
    const out = new Float32Array(model.itemCount);
    for (const [u, i, score] of spark) {
      model.scoreInto(u, history, out); // exported index u is workspace customer u: nothing changed since the export
      expect(out[i]!).toBeCloseTo(score, 5);
    }
    expect(factorValue(3, 2)).toBe(model.itemFactors[3 * RANK + 2]);
  });

  it('reads the model as stale once the workspace\'s data moves on', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, good);
    await importModel(ws.db, dir);
    expect(modelStatus(ws.db).find((m) => m.kind === 'ials')!.stale).toBe(false);
    ws.db.prepare("UPDATE signal SET value = 2 WHERE id = (SELECT min(id) FROM signal)").run();
    expect(modelStatus(ws.db).find((m) => m.kind === 'ials')!.stale).toBe(true);
    ws.db.prepare("UPDATE signal SET value = 1 WHERE id = (SELECT min(id) FROM signal)").run();
  });

  it('refuses a row whose length is not the rank, naming the file and row', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, { ...good, items: { ids: range(30), rank: RANK, bad: { 4: '[0.1, 0.2, 0.3]::FLOAT[]' } } });
    const e = await refusal(dir);
    expect(e.message).toBe("row 5: id 4 has 3 factors, the model's rank is 8");
    expect(e.where.file).toMatch(/itemFactors\/part-00000-.*\.snappy\.parquet$/);
    expect(e.where.line).toBe(5);
  });

  it('refuses ids the id map does not know', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, { ...good, users: { ids: [...range(60), 60], rank: RANK } });
    const e = await refusal(dir);
    expect(e.message).toBe('row 61: id 60 is not in the id map (it knows ids 0 to 59): was this model fitted on another export?');
    expect(e.where.file).toMatch(/userFactors\/part-00000-/);
  });

  it('refuses NaN and infinite factors', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, { ...good, items: { ids: range(30), rank: RANK, bad: { 2: "[1, 1, 1, 'NaN'::FLOAT, 1, 1, 1, 1]::FLOAT[]" } } });
    expect((await refusal(dir)).message).toBe('row 3: id 2 has a factor that is NaN (position 4): the model diverged; fit it again');
    const dir2 = modelDir();
    await writeSparkModelDir(dir2, { ...good, items: { ids: range(30), rank: RANK, bad: { 0: "[1, 1, 1, 1, 1, 1, 1, 'inf'::FLOAT]::FLOAT[]" } } });
    expect((await refusal(dir2)).message).toBe('row 1: id 0 has a factor that is Infinity (position 8): the model diverged; fit it again');
  });

  it('refuses a model of another kind and an explicit-feedback fit', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, { ...good, metadata: sparkMetadata({ rank: RANK, className: 'org.apache.spark.ml.classification.LogisticRegressionModel' }) });
    const e = await refusal(dir);
    expect(e.message).toBe(
      'a model of another kind: the metadata says class org.apache.spark.ml.classification.LogisticRegressionModel; only org.apache.spark.ml.recommendation.ALSModel (Spark\'s ALS) can be imported',
    );
    expect(e.where.file).toBe(path.join(dir, 'metadata', 'part-00000'));
    const dir2 = modelDir();
    await writeSparkModelDir(dir2, { ...good, metadata: sparkMetadata({ rank: RANK, implicitPrefs: false }) });
    expect((await refusal(dir2)).message).toMatch(/^the model was fitted with implicitPrefs=false/);
  });

  it('refuses part files in a compression it cannot read, naming the codec', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, { ...good, items: { ids: range(30), rank: RANK, compression: 'zstd' } });
    const e = await refusal(dir);
    expect(e.message).toBe("column id is compressed with ZSTD, which this reader does not decode: save with Spark's default, snappy (spark.sql.parquet.compression.codec=snappy)");
    expect(e.where.file).toMatch(/itemFactors\/part-00000-/);
  });

  it('refuses a folder that is not a saved model', async () => {
    const e = await refusal(path.join(exportDir, 'signals'));
    expect(e.message).toBe('not a saved Spark model: it has no metadata/ folder (ALSModel.save writes metadata/, userFactors/ and itemFactors/)');
    expect((await refusal(path.join(exportDir, 'nowhere'))).message).toBe('no such folder');
  });

  it('refuses a model fitted on signals exported before a customer was erased', async () => {
    const dir = modelDir();
    await writeSparkModelDir(dir, good);
    await importModel(ws.db, dir);
    const report = forgetCustomer(ws.db, 'cu-9');
    expect(report.modelsDeleted).toContain('ials'); // the imported factors had a row for cu-9
    expect(new ModelRepo(ws.db).loadCurrent('ials')).toBeUndefined();
    const e = await refusal(dir);
    expect(e.message).toMatch(/^a customer was erased \(forget\) after these signals were exported/);
  });
});
