/**
 * Taste groups on the real open dataset of the quality benchmark (UCI Online Retail, Chen 2015, CC BY 4.0;
 * files made by bench/quality/prepare.py, see /work/data/README.md or bench/quality/README.md). There is no
 * planted answer here: the script reports the groups found, their sizes, cohesion, separation and
 * silhouette, and example items, for a reader to judge. `npm run bench:groups-real [-- --data DIR]`.
 * The catalogue has no categories or tags, so groups are shown by example items' titles.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describeGroups, findTasteGroups } from '../../src-main/core/audience/index.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { fitIals } from '../../src-main/core/models/ials.ts';
import { historyLengths } from '../../src-main/services/curation/model-source.ts';
import { importFile } from '../../src-main/services/import.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const at = process.argv.indexOf('--data');
const data = at > 0 ? process.argv[at + 1]! : '/work/data/online-retail/shelfwright';
for (const f of ['items.csv', 'train.csv']) {
  if (!fs.existsSync(path.join(data, f))) {
    console.error(`${path.join(data, f)} is missing: make the import files first (bench/quality/README.md), or pass --data DIR`);
    process.exit(2);
  }
}
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-groups-real-'));
try {
  const db = openWorkspace(path.join(dir, 'w.sqlite'));
  await importFile(db, { target: 'items', file: path.join(data, 'items.csv') });
  const r = await importFile(db, { target: 'signals', file: path.join(data, 'train.csv'), unknown: 'create' });
  if (!r.committed) throw new Error('the signals did not import');
  const ds = loadDataset(db);
  let t = performance.now();
  const model = fitIals(buildInteractionMatrix(ds)).model;
  console.log(`${ds.customerIds.length} customers, ${ds.items.length} items, ${ds.signals.length} signals (train.csv); iALS ${((performance.now() - t) / 1000).toFixed(1)} s`);
  t = performance.now();
  const g = findTasteGroups(model.customerFactors, model.customerCount, model.factors, historyLengths(ds, model.customerCount));
  console.log(`groups in ${((performance.now() - t) / 1000).toFixed(2)} s: k = ${g.k} of ${g.settings.minK}..${g.settings.maxK}, mean silhouette ${g.silhouette.toFixed(3)}, ${g.notEnoughHistory} customers with fewer than ${g.settings.minHistory} items`);
  console.log(`silhouette by k: ${g.tried.map((x) => `${x.k}: ${x.silhouette.toFixed(3)}`).join(', ')}`);
  const described = describeGroups(ds, g.assignment, g.k, { examples: 4 });
  for (const s of g.groups) {
    const ex = described[s.group]!.examples.map((i) => ds.items[i]!.title).join('; ');
    console.log(`group ${s.group}: ${s.size} customers, cohesion ${s.cohesion.toFixed(2)}, nearest ${s.nearest} at ${s.separation.toFixed(2)}, silhouette ${s.silhouette.toFixed(2)} — ${ex}`);
  }
  db.close();
} finally {
  fs.rmSync(dir, { recursive: true, force: true });
}
