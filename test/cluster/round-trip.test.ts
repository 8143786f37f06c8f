/**
 * The round trip: factors fitted here, written in Spark's ALSModel layout by our writer, imported back,
 * score identically. DuckDB (an independent reader) checks that the written files have Spark's schema.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { fitIals, loadIals } from '../../src-main/core/models/ials.ts';
import { exportSignals } from '../../src-main/services/cluster/export-signals.ts';
import { importModel } from '../../src-main/services/cluster/import-model.ts';
import { writeSparkModel } from '../../src-main/services/cluster/write-spark-model.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { smallWorkspace } from '../store/models-fixture.ts';
import { duck } from './spark-fixture.ts';

const ws = smallWorkspace({ items: 40, customers: 90, seed: 5 });
const root = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-roundtrip-'));
afterAll(() => {
  ws.db.close();
  fs.rmSync(ws.dir, { recursive: true, force: true });
  fs.rmSync(root, { recursive: true, force: true });
});

describe('fit here, write in Spark\'s layout, import', () => {
  it('scores every customer over every item exactly as the model fitted here', async () => {
    const exportDir = path.join(root, 'export');
    exportSignals(ws.db, exportDir);
    const history = buildInteractionMatrix(loadDataset(ws.db));
    const { model } = fitIals(history, { factors: 12, iterations: 6, seed: 4, alpha: 3 });
    const dir = path.join(exportDir, 'model');
    writeSparkModel(model, dir, { regParam: 0.01, alpha: 3, maxIter: 6 });

    const c = await duck();
    const schema = (await c.runAndReadAll(`DESCRIBE SELECT * FROM read_parquet('${dir}/itemFactors/*.parquet')`)).getRows().map((r) => `${r[0]}:${r[1]}`);
    expect(schema).toEqual(['id:INTEGER', 'features:FLOAT[]']); // Spark's FeatureData(id: Int, features: Array[Float])
    const count = (await c.runAndReadAll(`SELECT count(*)::INTEGER FROM read_parquet('${dir}/userFactors/*.parquet')`)).getRows()[0]![0];
    expect(count).toBe(90);

    const report = await importModel(ws.db, dir);
    expect(report.origin.customersFoldedIn).toBe(0);
    expect(report.origin.itemsWithoutFactors).toBe(0);
    const back = loadIals(new ModelRepo(ws.db).loadCurrent('ials')!.bytes);
    const a = new Float32Array(model.itemCount);
    const b = new Float32Array(back.itemCount);
    for (let u = 0; u < model.customerCount; u++) {
      model.scoreInto(u, history, a);
      back.scoreInto(u, history, b);
      expect(Array.from(b)).toEqual(Array.from(a));
    }
  });
});
