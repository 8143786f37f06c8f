/**
 * A customer who arrived after the export has no row in the cluster's model; the import folds them in as
 * Spark would solve their row: Hu, Koren & Volinsky (2008) eq. 4, x_u = (YᵀC_uY + λ_u I)⁻¹ YᵀC_u p_u, with
 * Spark's λ_u = regParam · n_u (ALS.scala `computeFactors`: `solver.solve(ls, numExplicits * regParam)`) and
 * c = 1 + α·r. Checked against a dense solve by ml-matrix (an independent linear-algebra library).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { afterAll, describe, expect, it } from 'vitest';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { loadIals } from '../../src-main/core/models/ials.ts';
import { exportSignals } from '../../src-main/services/cluster/export-signals.ts';
import { importModel } from '../../src-main/services/cluster/import-model.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { smallWorkspace } from '../store/models-fixture.ts';
import { range, sparkMetadata, writeSparkModelDir } from './spark-fixture.ts';

const ws = smallWorkspace({ items: 20, customers: 30, seed: 8 });
const root = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-foldin-'));
afterAll(() => {
  ws.db.close();
  fs.rmSync(ws.dir, { recursive: true, force: true });
  fs.rmSync(root, { recursive: true, force: true });
});

describe('customers who arrived after the export', () => {
  it('are folded in with Spark\'s count-weighted λ, matching a dense solve of the normal equations', async () => {
    const exportDir = path.join(root, 'export');
    exportSignals(ws.db, exportDir);
    ws.db.prepare("INSERT INTO customer (id, external_id) VALUES (31, 'cu-new')").run();
    const sig = ws.db.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (31, ?, (SELECT code FROM signal_kind WHERE name = ?), 1, ?)");
    [[2, 'view'], [5, 'purchase'], [9, 'view'], [14, 'basket']].forEach(([item, kind], q) => sig.run(item, kind, 1_720_000_000_000 + q));
    const k = 6;
    const dir = path.join(exportDir, 'model');
    await writeSparkModelDir(dir, { rank: k, users: { ids: range(30), rank: k }, items: { ids: range(20), rank: k }, metadata: sparkMetadata({ rank: k, regParam: 0.3, alpha: 2 }) });
    const report = await importModel(ws.db, dir);
    expect(report.origin.customersFoldedIn).toBe(1);
    expect(report.stale).toBe(true); // the new customer changed the data since the export

    const model = loadIals(new ModelRepo(ws.db).loadCurrent('ials')!.bytes);
    const u = 30; // the new customer's dense index (customers in id order)
    const x = model.customerFactors.subarray(u * k, (u + 1) * k);
    const history = buildInteractionMatrix(loadDataset(ws.db));
    const Y = new Matrix(Array.from({ length: 20 }, (_, i) => Array.from(model.itemFactors.subarray(i * k, (i + 1) * k))));
    const A = Y.transpose().mmul(Y);
    const b = Matrix.zeros(k, 1);
    const n = history.indptr[u + 1]! - history.indptr[u]!;
    expect(n).toBe(4);
    for (let q = history.indptr[u]!; q < history.indptr[u + 1]!; q++) {
      const c = 1 + 2 * history.data[q]!; // c = 1 + α·r
      const y = Y.getRow(history.indices[q]!);
      for (let a = 0; a < k; a++) {
        b.set(a, 0, b.get(a, 0) + c * y[a]!);
        for (let d = 0; d < k; d++) A.set(a, d, A.get(a, d) + (c - 1) * y[a]! * y[d]!);
      }
    }
    for (let a = 0; a < k; a++) A.set(a, a, A.get(a, a) + 0.3 * n); // λ_u = regParam · n_u
    const want = new CholeskyDecomposition(A).solve(b).getColumn(0);
    want.forEach((v, a) => expect(x[a]!).toBeCloseTo(v, 4));
  });

  it('items added after the export are folded in from the customers\' side, as Spark solves an item row', async () => {
    const w = smallWorkspace({ items: 20, customers: 30, seed: 9 });
    try {
      const exportDir = path.join(root, 'export-items');
      exportSignals(w.db, exportDir);
      w.db.prepare("INSERT INTO item (id, external_id, title, description, category, tags, supplier, price, added_at) VALUES (21, 'it-new', 'new', '', 'garden', '[]', 'maker-1', 9, 1700000000000)").run();
      const sig = w.db.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (?, 21, (SELECT code FROM signal_kind WHERE name = 'view'), 1, ?)");
      [3, 7, 11].forEach((c, q) => sig.run(c, 1_720_000_000_000 + q));
      const k = 5;
      const dir = path.join(exportDir, 'model');
      await writeSparkModelDir(dir, { rank: k, users: { ids: range(30), rank: k }, items: { ids: range(20), rank: k }, metadata: sparkMetadata({ rank: k, regParam: 0.2, alpha: 3 }) });
      const report = await importModel(w.db, dir);
      expect(report.origin.itemsFoldedIn).toBe(1);
      expect(report.origin.itemsWithoutFactors).toBe(0);
      const model = loadIals(new ModelRepo(w.db).loadCurrent('ials')!.bytes);
      const y = model.itemFactors.subarray(20 * k, 21 * k);
      const X = new Matrix(Array.from({ length: 30 }, (_, u) => Array.from(model.customerFactors.subarray(u * k, (u + 1) * k))));
      const A = X.transpose().mmul(X);
      const b = Matrix.zeros(k, 1);
      for (const u of [2, 6, 10]) {
        const c = 1 + 3 * 1; // one view, weight 1: c = 1 + α·r
        const xu = X.getRow(u);
        for (let a = 0; a < k; a++) {
          b.set(a, 0, b.get(a, 0) + c * xu[a]!);
          for (let d = 0; d < k; d++) A.set(a, d, A.get(a, d) + (c - 1) * xu[a]! * xu[d]!);
        }
      }
      for (let a = 0; a < k; a++) A.set(a, a, A.get(a, a) + 0.2 * 3); // λ_i = regParam · (3 customers)
      new CholeskyDecomposition(A).solve(b).getColumn(0).forEach((v, a) => expect(y[a]!).toBeCloseTo(v, 4));
    } finally {
      w.db.close();
      fs.rmSync(w.dir, { recursive: true, force: true });
    }
  });
});
