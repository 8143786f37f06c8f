/**
 * Why a blend holds or not out of sample (issue 10 item 3): `npx tsx bench/quality/blend-path.ts WORKSPACE
 * [TEST.csv] [K]` on a trained workspace (e.g. one `bench:quality -- --keep` left) prints, on each validation
 * half (models fitted on the validation split's train part, as services/tune/blend.ts does), on the whole
 * validation window and on the test file (the stored models), every single model, the stored blend shrunk
 * towards the best single model (λ·w + (1 − λ)·e_best), the blend without each member, each with its paired gain
 * ± SE, and the mean z-score of the truth items under each model (how far each model lifts what was bought).
 * The figures in validated-blend.ts `confirmLater` come from it. A diagnostic, not a benchmark target.
 */
import { type EvalTruth, evalTruth, RankingEvaluator, sampleTruth, type BlendSpec, type BlendModel } from '../../src-main/core/eval/index.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import type { Scorer } from '../../src-main/core/models/scorer.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { BlendScorer } from '../../src-main/core/scoring/blend-scorer.ts';
import { normaliseForCustomer } from '../../src-main/core/scoring/per-customer.ts';
import type { Csr } from '../../src-main/core/matrix/csr.ts';
import { holdoutTruth } from '../../src-main/services/holdout/evaluate.ts';
import { readHoldout } from '../../src-main/services/holdout/read.ts';
import { columnCounts, loadTrainedModels, ownedMatrix } from '../../src-main/services/holdout/trained.ts';
import { confirmationHalves, validationSplit } from '../../src-main/services/tune/split.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { pairedArrays } from './paired.ts';
import { currentParams, fitForValidation } from './validation-fits.ts';

const [ws, testFile, kArg] = process.argv.slice(2);
const K = Number(kArg ?? 20);
const db = openWorkspace(ws!, { readonly: true });
const ds = loadDataset(db);
const tm = loadTrainedModels(db, ds);
const spec = tm.blendInfo as BlendSpec & { reason: string };
console.log('stored:', spec.reason);
const repo = new ModelRepo(db);
const params = currentParams(repo);

const paired = (a: Float64Array, b: Float64Array) => {
  const d = pairedArrays(a, b);
  return { m: d.mean, se: d.se };
};

function report(label: string, truthObj: EvalTruth, ev: RankingEvaluator, history: Csr, scorers: Map<string, Scorer>) {
  const cpi = columnCounts(history);
  const per = new Map<string, Float64Array>();
  const line: string[] = [];
  for (const [name, s] of scorers) {
    const a = new Float64Array(ev.customerCount);
    const r = ev.evaluateFill(name, (u, _c, out) => s.scoreInto(u, history, out), a);
    per.set(name, a);
    line.push(`${name} ${r.ndcg.toFixed(4)}`);
  }
  const best = [...per.entries()].sort((x, y) => y[1].reduce((p, q) => p + q, 0) - x[1].reduce((p, q) => p + q, 0))[0]![0] as BlendModel;
  console.log(`\n== ${label}: ${ev.customerCount} customers; ${line.join(', ')}; best ${best}`);
  const bestPer = per.get(best)!;
  const at = (weights: Partial<Record<BlendModel, number>>, name: string) => {
    const s: BlendSpec = { ...spec, kind: 'blend', model: null, weights };
    const bs = new BlendScorer(s, scorers, cpi);
    const a = new Float64Array(ev.customerCount);
    const r = ev.evaluateFill('h', (u, _c, out) => bs.scoreInto(u, history, out), a);
    const d = paired(a, bestPer);
    console.log(`  ${name.padEnd(28)} ${r.ndcg.toFixed(4)}  gain ${d.m.toFixed(4)} ± ${d.se.toFixed(4)}`);
  };
  for (const lam of [0.25, 0.5, 0.75, 1]) {
    const w: Partial<Record<BlendModel, number>> = {};
    for (const [m, x] of Object.entries(spec.weights)) w[m as BlendModel] = lam * x!;
    w[best] = (w[best] ?? 0) + (1 - lam);
    at(w, `shrink λ=${lam}`);
  }
  for (const drop of Object.keys(spec.weights)) {
    if (drop === best) continue;
    const w = { ...spec.weights };
    delete w[drop as BlendModel];
    at(w, `without ${drop}`);
  }
  // Signal strength: mean z-score (over candidates) of the truth items, per model.
  const N = history.cols;
  const raw = new Float32Array(N);
  const z = new Float32Array(N);
  const scratch = new Float64Array(N);
  const strength: string[] = [];
  for (const [name, s] of scorers) {
    let sum = 0;
    let n = 0;
    const cs = truthObj.customers;
    for (let c = 0; c < cs.length; c++) {
      const u = cs[c]!;
      s.scoreInto(u, history, raw);
      normaliseForCustomer('zscore', raw, history.indices.subarray(history.indptr[u]!, history.indptr[u + 1]!), z, scratch);
      for (let p = truthObj.ptr[c]!; p < truthObj.ptr[c + 1]!; p++) {
        sum += z[truthObj.items[p]!]!;
        n++;
      }
    }
    strength.push(`${name} ${(sum / n).toFixed(2)}`);
  }
  if (strength.length) console.log(`  mean z of truth items: ${strength.join(', ')}`);
}

async function main() {
  // Validation: as learnBlend.
  const seed = 1;
  const split = validationSplit(ds, { seed });
  const train = buildInteractionMatrix(ds, { rows: split.train });
  const halves = confirmationHalves(ds, split.validation, split.method, seed);
  const evFor = (rows: Int32Array, s: number): [EvalTruth, RankingEvaluator] => {
    const t = sampleTruth(evalTruth(train, buildInteractionMatrix(ds, { rows }), undefined, split.unavailable), 1000, seededRng(s));
    return [t, new RankingEvaluator(train, t, K, split.unavailable)];
  };
  const t0 = performance.now();
  const scorers = await fitForValidation(ds, train, params, seed);
  console.log(`validation fits ${((performance.now() - t0) / 1000).toFixed(1)} s; split ${split.method}`);
  report('choose (earlier half)', ...evFor(halves.choose, seed), train, scorers);
  report('confirm (later half)', ...evFor(halves.confirm, seed + 1), train, scorers);
  report('whole validation window', ...evFor(split.validation, seed), train, scorers);
  if (testFile) {
    const rows = await readHoldout({ file: testFile });
    const owned = ownedMatrix(ds);
    const { truth } = holdoutTruth(ds, rows, owned);
    report('test (stored models)', truth, new RankingEvaluator(owned, truth, K), tm.matrix, tm.scorers as Map<string, Scorer>);
  }
}
main().catch((e) => {
  console.error(e);
  process.exit(1);
});
