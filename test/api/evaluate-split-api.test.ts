import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ResponseOf } from '../../src-main/api/contract.ts';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { fitItemKnn } from '../../src-main/core/models/itemknn.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { importFile } from '../../src-main/services/import.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { dataFingerprint, ModelRepo } from '../../src-main/store/models.ts';
import { tempDir } from '../holdout/fixture.ts';

/** evaluate.start's split on a workspace whose signals have no times, and an evaluation stored before splits were chosen. */
const dir = tempDir('api-evaluate-split');
const ctx = new AppContext();
let table: ReturnType<typeof createHandlerTable>;
beforeAll(async () => {
  ctx.open(path.join(dir, 'w.sqlite'), { create: true });
  const items = path.join(dir, 'items.csv');
  const counts = path.join(dir, 'counts.csv');
  fs.writeFileSync(items, 'id,title\na,A\nb,B\nc,C\n');
  fs.writeFileSync(counts, 'user,product,quantity\nu1,a,2\nu1,b,1\nu1,c,4\nu2,a,1\nu2,b,3\nu2,c,1\n');
  await importFile(ctx.db, { target: 'items', file: items });
  await importFile(ctx.db, { target: 'signals', file: counts, kind: 'other', unknown: 'create' });
  table = createHandlerTable(ctx);
});
afterAll(() => {
  ctx.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('evaluate.start and the split', () => {
  it('refuses a split by time at once, on the field split, when no signal has a time; no job starts', async () => {
    const r = await invoke(table, 'evaluate.start', { split: 'time' });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.error).toEqual({
      code: 'input',
      message: 'a split by time needs at least 3 signals with a time, and none of the 6 has one: choose the random per-customer split, or leave the choice to the data',
      where: { column: 'split' },
    });
    const bad = await invoke(table, 'evaluate.start', { split: 'soon' });
    expect(bad.ok).toBe(false);
  });

  it('reads an evaluation stored before the split could be chosen as one by time', async () => {
    const repo = new ModelRepo(ctx.db);
    const knn = fitItemKnn(buildInteractionMatrix(loadDataset(ctx.db))).model;
    const [id] = repo.saveAll([{ kind: 'itemknn', params: {}, fingerprint: 'f', trainedAt: 1, trainMs: 1, report: { notes: [] }, bytes: knn.serialize() }]);
    const row = { model: 'itemknn', k: 10, ndcg: 0.2, recall: 0.3, cappedRecall: 0.3, precision: 0.1, map: 0.1, hitRate: 0.4, coverage: 0.5, novelty: 3, customers: 2, elapsedMs: 1 };
    const old = { k: 10, split: { validationFrom: 5, testFrom: 9, train: 4, validation: 1, test: 1 }, weights: {}, hybrid: 'is itemknn', test: [row], notes: [], evaluatedAt: 2, fingerprint: dataFingerprint(ctx.db) };
    repo.setEvaluation(id!, { offline: old });
    const r = await invoke(table, 'evaluate.latest', {});
    expect(r.ok, r.ok ? '' : r.error.message).toBe(true);
    if (!r.ok) return;
    expect((r.value as ResponseOf<'evaluate.latest'>).evaluation?.split).toEqual({ method: 'time', why: null, validationFrom: 5, testFrom: 9, train: 4, validation: 1, test: 1 });
  });
});
