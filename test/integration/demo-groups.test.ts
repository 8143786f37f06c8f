import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { adjustedRandIndex, findTasteGroups, kMeans } from '../../src-main/core/audience/index.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { fitIals, type IalsModel } from '../../src-main/core/models/ials.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Dataset } from '../../src-main/core/types.ts';
import { importFile } from '../../src-main/services/import.ts';
import { historyLengths } from '../../src-main/services/curation/model-source.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

/**
 * Issue 15: do the taste groups find the tastes the demo generator planted? truth.json (each customer's
 * group) is outside every model, so it is an external check. The adjusted Rand index is Hubert & Arabie
 * (1985). A smaller shop than the default keeps this quick (the default shop's figures are in the README).
 */
const SHOP = { seed: 7, items: 600, customers: 4000, signals: 80_000 };

let dir: string;
let db: Db;
let ds: Dataset;
let model: IalsModel;
let truth: Int32Array;
let planted: number[];

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-demo-groups-'));
  const shop = await generateDemoShop({ ...SHOP, outDir: dir });
  db = openWorkspace(path.join(dir, 'demo.sqlite'));
  for (const target of ['items', 'customers', 'signals'] as const) expect((await importFile(db, { target, file: shop.files[target] })).committed).toBe(true);
  ds = loadDataset(db);
  model = fitIals(buildInteractionMatrix(ds)).model;
  const t = JSON.parse(fs.readFileSync(shop.files.truth, 'utf8')) as { customerGroup: Record<string, string> };
  const names = [...new Set(Object.values(t.customerGroup))].sort();
  truth = Int32Array.from(ds.customerExternalIds, (id) => names.indexOf(t.customerGroup[id]!));
  planted = names.map((_, g) => truth.filter((v) => v === g).length);
}, 120_000);

afterAll(() => {
  db?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('taste groups on the demo shop', () => {
  it('agree with the planted tastes (ARI >= 0.8) and no group is over twice the largest planted one', () => {
    const g = findTasteGroups(model.customerFactors, model.customerCount, model.factors, historyLengths(ds, model.customerCount));
    // Customers set aside for too little history are left out of the comparison (label -1).
    const ari = adjustedRandIndex(g.assignment, truth);
    const largest = Math.max(...planted);
    console.log(`demo groups: k = ${g.k} (planted ${planted.length}), ARI ${ari.toFixed(4)}, sizes ${g.groups.map((s) => s.size).join(', ')}, planted ${planted.join(', ')}, not enough history ${g.notEnoughHistory}`);
    expect(g.k).toBe(planted.length);
    expect(ari).toBeGreaterThanOrEqual(0.8);
    for (const s of g.groups) expect(s.size).toBeLessThanOrEqual(2 * largest);
    // Most customers still get a group.
    expect(g.notEnoughHistory).toBeLessThan(ds.customerIds.length / 2);
  });

  it('does much better than k-means on the raw factors with six groups (the old way)', () => {
    const raw = kMeans(model.customerFactors, model.customerCount, model.factors, 6, seededRng(20260101));
    const g = findTasteGroups(model.customerFactors, model.customerCount, model.factors, historyLengths(ds, model.customerCount));
    expect(adjustedRandIndex(g.assignment, truth)).toBeGreaterThan(adjustedRandIndex(raw.assignment, truth) + 0.3);
  });
});
