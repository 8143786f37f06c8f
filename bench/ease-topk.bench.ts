/**
 * What storing EASE as its top-k weights per item costs in ranking quality (ease-topk.ts: used above
 * EASE_DENSE_MAX_BYTES, i.e. above ~8,200 items). Run with `npx tsx bench/ease-topk.bench.ts` (a script).
 * On the demo shop (demo-data generator, imported through services/import.ts): the temporal split of
 * `evaluate` (train + validation as history, the last 10 % of time as test), EASE fitted densely on the
 * history, then NDCG@10 and recall@10 of the dense model and of top-k copies for several k.
 * Caveat: the demo shop has 2,500 items; k = 125 keeps the same share of each row (5 %) as EASE_TOP_K = 1,000
 * at 20,000 items, and k = 62 the share of 500. Measured 2026-12-04: 125 gave 99.2 % of dense NDCG@10, 62 gave 97.5 %.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { generateDemoShop } from '../demo-data/generator/index.ts';
import { evalTruth, RankingEvaluator, sampleTruth } from '../src-main/core/eval/index.ts';
import { buildInteractionMatrix } from '../src-main/core/matrix/build.ts';
import { quantileCuts, splitByTime } from '../src-main/core/matrix/split.ts';
import { fitEase } from '../src-main/core/models/ease.ts';
import { sparsifyEase } from '../src-main/core/models/ease-topk.ts';
import type { Scorer } from '../src-main/core/models/scorer.ts';
import { seededRng } from '../src-main/core/rng.ts';
import { importFile } from '../src-main/services/import.ts';
import { loadDataset } from '../src-main/store/dataset.ts';
import { openWorkspace } from '../src-main/store/workspace.ts';

async function main(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-ease-topk-'));
  try {
    const shop = await generateDemoShop({ outDir: dir });
    const db = openWorkspace(path.join(dir, 'demo.sqlite'));
    for (const target of ['items', 'customers', 'signals'] as const) {
      const r = await importFile(db, { target, file: shop.files[target] });
      if (!r.committed) throw new Error(`demo import of ${target} was not committed`);
    }
    const ds = loadDataset(db);
    db.close();
    const split = splitByTime(ds, quantileCuts(ds));
    const historyRows = Int32Array.from([...split.train, ...split.validation]);
    const history = buildInteractionMatrix(ds, { rows: historyRows });
    const test = buildInteractionMatrix(ds, { rows: split.test });
    const ev = new RankingEvaluator(history, sampleTruth(evalTruth(history, test), 2000, seededRng(2)), 10);
    const dense = fitEase(history).model;
    const m = dense.kept.length;
    console.log(`demo shop: ${m} items, ${ev.customerCount} test customers, EASE with default parameters`);
    const run = (name: string, s: Scorer) => ev.evaluate({ name, scoreInto: (u, h, out) => s.scoreInto(u, h, out) });
    const base = run('dense', dense);
    console.log(`  dense      NDCG@10 ${base.ndcg.toFixed(4)}  recall@10 ${base.recall.toFixed(4)}`);
    for (const k of [25, 62, 125, 250, 500]) {
      const r = run(`top-${k}`, sparsifyEase(dense.itemCount, dense.kept, dense.b, k));
      console.log(
        `  top-${String(k).padEnd(5)}  NDCG@10 ${r.ndcg.toFixed(4)} (${((100 * r.ndcg) / base.ndcg).toFixed(1)} % of dense)  ` +
          `recall@10 ${r.recall.toFixed(4)} (${((100 * r.recall) / base.recall).toFixed(1)} %)  ${((100 * k) / m).toFixed(1)} % of each row`,
      );
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
