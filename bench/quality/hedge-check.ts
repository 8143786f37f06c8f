/**
 * Would hedging across near-tied models have held out of sample? (the validated blend's known gap, DEVELOPERS
 * "The validated blend"). A diagnostic, not a benchmark target:
 *   npx tsx bench/quality/hedge-check.ts evaluate WORKSPACE [K]      — `evaluate`'s own split and flow (the demo)
 *   npx tsx bench/quality/hedge-check.ts holdout WORKSPACE TEST.csv [K] — training's blend flow, the test file
 * On the window's earlier half (choose), later half (confirm) and test it prints every single model, the blend the
 * current rule keeps, the equal-weight blend of the models within one paired SE of the best single model on the
 * earlier half (the tied set T), and the kept blend shrunk towards that equal blend, each with its paired gain
 * ± SE over the best single model; then what each hedge rule would keep and its test NDCG.
 */
import { customersPerItem, evalTruth, RankingEvaluator, sampleTruth, validateBlend, type BlendModel, type BlendModelInput, type BlendSpec, type ValidatedBlend } from '../../src-main/core/eval/index.ts';
import { CONFIRM_Z } from '../../src-main/core/eval/validated-blend.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import type { Csr } from '../../src-main/core/matrix/csr.ts';
import { fitContent } from '../../src-main/core/models/content.ts';
import { fitEase } from '../../src-main/core/models/ease.ts';
import { fitIals } from '../../src-main/core/models/ials.ts';
import { fitItemKnn } from '../../src-main/core/models/itemknn.ts';
import { fitPopularity } from '../../src-main/core/models/popularity.ts';
import type { Scorer } from '../../src-main/core/models/scorer.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { BlendScorer } from '../../src-main/core/scoring/blend-scorer.ts';
import { evaluationSplit } from '../../src-main/services/evaluate-split.ts';
import { holdoutTruth } from '../../src-main/services/holdout/evaluate.ts';
import { readHoldout } from '../../src-main/services/holdout/read.ts';
import { columnCounts, loadTrainedModels, ownedMatrix } from '../../src-main/services/holdout/trained.ts';
import { confirmationHalves, notYetAvailable, validationSplit } from '../../src-main/services/tune/split.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { pairedArrays } from './paired.ts';
import { currentParams, fitForValidation } from './validation-fits.ts';

const [mode, ws, a3, a4] = process.argv.slice(2);
const K = Number((mode === 'evaluate' ? a3 : a4) ?? (mode === 'evaluate' ? 10 : 20));
const db = openWorkspace(ws!, { readonly: true });
const ds = loadDataset(db);
const repo = new ModelRepo(db);
const params = currentParams(repo);

interface Window { label: string; ev: RankingEvaluator; history: Csr; scorers: Map<string, Scorer>; cpi: Int32Array }

const paired = (a: Float64Array, b: Float64Array) => {
  const d = pairedArrays(a, b);
  return { m: d.mean, se: d.se };
};
const mean = (a: Float64Array) => a.reduce((x, y) => x + y, 0) / a.length;

function perCustomer(w: Window, s: Scorer): Float64Array {
  const a = new Float64Array(w.ev.customerCount);
  w.ev.evaluateFill('x', (u, _c, out) => s.scoreInto(u, w.history, out), a);
  return a;
}
function blendPer(w: Window, base: BlendSpec, weights: Partial<Record<BlendModel, number>>): Float64Array {
  const s: BlendSpec = { ...base, kind: 'blend', model: null, weights };
  return perCustomer(w, new BlendScorer(s, w.scorers, w.cpi) as unknown as Scorer);
}

function analyse(blend: ValidatedBlend, windows: Window[]) {
  console.log('current rule:', blend.reason);
  const [choose, , test] = windows as [Window, Window, Window];
  const names = [...choose.scorers.keys()] as BlendModel[];
  const singles = windows.map((w) => new Map(names.map((m) => [m, perCustomer(w, w.scorers.get(m)!)])));
  for (let i = 0; i < windows.length; i++) console.log(`${windows[i]!.label} (${windows[i]!.ev.customerCount} customers): ${names.map((m) => `${m} ${mean(singles[i]!.get(m)!).toFixed(4)}`).join(', ')}`);
  const best = blend.validation.bestSingle;
  // Tied set: within one paired SE of the best single model on the choosing window.
  const T = names.filter((m) => {
    if (m === best) return true;
    const d = paired(singles[0]!.get(m)!, singles[0]!.get(best)!);
    console.log(`  ${m} − ${best} on choose: ${d.m.toFixed(4)} ± ${d.se.toFixed(4)}`);
    return d.m + d.se >= 0;
  });
  console.log(`tied set T (within 1 SE of ${best} on choose): ${T.join(', ')}`);
  const eq = (set: BlendModel[]) => Object.fromEntries(set.map((m) => [m, 1 / set.length])) as Partial<Record<BlendModel, number>>;
  const kept = blend.weights;
  const mix = (a: Partial<Record<BlendModel, number>>, b: Partial<Record<BlendModel, number>>, lam: number) => {
    const w: Partial<Record<BlendModel, number>> = {};
    for (const m of names) {
      const x = lam * (a[m] ?? 0) + (1 - lam) * (b[m] ?? 0);
      if (x > 0) w[m] = x;
    }
    return w;
  };
  const cands: { name: string; w: Partial<Record<BlendModel, number>> }[] = [];
  for (const lam of [0, 0.25, 0.5, 0.75, 1]) cands.push({ name: `kept→eq(T) λ=${lam}`, w: mix(kept, eq(T), lam) });
  cands.push({ name: 'eq(itemknn,ials,ease)', w: eq(['itemknn', 'ials', 'ease'].filter((m) => names.includes(m as BlendModel)) as BlendModel[]) });
  cands.push({ name: 'eq(all but content)', w: eq(names.filter((m) => m !== 'content')) });
  const base: BlendSpec = { kind: 'blend', model: null, normalisation: blend.normalisation, weights: {}, coldContent: blend.coldContent, ...(blend.coldShare !== undefined && { coldShare: blend.coldShare }) };
  const rows = cands.map((c) => {
    const per = windows.map((w, i) => {
      const a = blendPer(w, base, c.w);
      return { ndcg: mean(a), ...paired(a, singles[i]!.get(best)!) };
    });
    const desc = Object.entries(c.w).map(([m, x]) => `${x!.toFixed(3)} ${m}`).join(' + ');
    console.log(`  ${c.name.padEnd(24)} ${per.map((p) => `${p.ndcg.toFixed(4)} (${p.m >= 0 ? '+' : ''}${p.m.toFixed(4)} ± ${p.se.toFixed(4)})`).join('  ')}   [${desc}]`);
    return { ...c, per };
  });
  const shrinks = rows.slice(0, 5);
  const held = (r: (typeof rows)[number]) => r.per[0]!.m > 0 && r.per[1]!.m > CONFIRM_Z * r.per[1]!.se;
  const pick = (label: string, score: (r: (typeof rows)[number]) => number) => {
    let b = shrinks[0]!;
    for (const r of shrinks) if (score(r) > score(b) + 1e-12) b = r;
    const ok = held(b);
    console.log(`rule ${label}: ${b.name}${ok ? '' : ' — fails the bar, single ' + best} → test ${ok ? b.per[2]!.ndcg.toFixed(4) : mean(singles[2]!.get(best)!).toFixed(4)}`);
  };
  pick('later-half mean over λ (target eq(T))', (r) => r.per[1]!.ndcg);
  pick('minimax over halves (target eq(T))', (r) => Math.min(r.per[0]!.m, r.per[1]!.m));
  pick('minimax t over halves (target eq(T))', (r) => Math.min(r.per[0]!.m / r.per[0]!.se, r.per[1]!.m / r.per[1]!.se));
  const keptTest = blendPer(test, base, kept);
  console.log(`test: kept blend ${mean(keptTest).toFixed(4)}; gain over ${names.map((m) => { const d = paired(keptTest, singles[2]!.get(m)!); return `${m} ${d.m.toFixed(4)} ± ${d.se.toFixed(4)}`; }).join(', ')}`);
}

async function evaluateFlow() {
  const seed = 1;
  const split = evaluationSplit(ds, 'auto', { seed });
  const cuts = split.cuts!;
  const m = (rows: Int32Array): Csr => buildInteractionMatrix(ds, { rows });
  const train = m(split.train);
  const trainVal = m(Int32Array.from([...split.train, ...split.validation]));
  const test = m(split.test);
  const models = new Map<string, Scorer>();
  models.set('content', fitContent(ds.items, params.content as never).model);
  models.set('itemknn', fitItemKnn(train, params.itemknn as never).model);
  models.set('ease', fitEase(train, params.ease as never).model);
  const ialsModel = fitIals(train, { seed, ...(params.ials as object) }).model;
  models.set('ials', ialsModel);
  const nyV = notYetAvailable(ds, cuts.validationFrom);
  const nyT = notYetAvailable(ds, cuts.testFrom);
  const cap = 2000;
  const we = (v: Csr, s: number) => new RankingEvaluator(train, sampleTruth(evalTruth(train, v, undefined, nyV), cap, seededRng(s)), K, nyV);
  const halves = confirmationHalves(ds, split.validation, split.method, seed);
  const chooseEv = we(m(halves.choose), seed);
  const confirmEv = we(m(halves.confirm), seed + 2);
  const trainPop = fitPopularity(train).model;
  const inputs: BlendModelInput[] = [...models, ['popularity', trainPop] as const].map(([name, s]) => ({ name: name as BlendModel, scorer: { name, scoreInto: (u, h, out) => s.scoreInto(u, h, out) } }));
  const blend = validateBlend(chooseEv, train, inputs, { customersPerItem: customersPerItem(train), confirm: confirmEv });
  const testEv = new RankingEvaluator(trainVal, sampleTruth(evalTruth(trainVal, test, undefined, nyT), cap, seededRng(seed + 1)), K, nyT);
  const valScorers = new Map<string, Scorer>([...models, ['popularity', trainPop]]);
  const testScorers = new Map<string, Scorer>([...models, ['popularity', fitPopularity(trainVal).model]]);
  // As `evaluate` does: on test iALS folds every customer in from train + validation (services/evaluate.ts).
  testScorers.set('ials', ialsModel.foldingIn());
  analyse(blend, [
    { label: 'choose', ev: chooseEv, history: train, scorers: valScorers, cpi: customersPerItem(train) },
    { label: 'confirm', ev: confirmEv, history: train, scorers: valScorers, cpi: customersPerItem(train) },
    { label: 'test', ev: testEv, history: trainVal, scorers: testScorers, cpi: customersPerItem(trainVal) },
  ]);
}

async function holdoutFlow(testFile: string) {
  const seed = 1;
  const split = validationSplit(ds, { seed });
  const train = buildInteractionMatrix(ds, { rows: split.train });
  const halves = confirmationHalves(ds, split.validation, split.method, seed);
  const we = (rows: Int32Array, s: number) => new RankingEvaluator(train, sampleTruth(evalTruth(train, buildInteractionMatrix(ds, { rows }), undefined, split.unavailable), 1000, seededRng(s)), K, split.unavailable);
  const chooseEv = we(halves.choose, seed);
  const confirmEv = we(halves.confirm, seed + 1);
  const scorers = await fitForValidation(ds, train, params, seed);
  const inputs: BlendModelInput[] = [...scorers].map(([name, s]) => ({ name: name as BlendModel, scorer: { name, scoreInto: (u, h, out) => s.scoreInto(u, h, out) } }));
  const blend = validateBlend(chooseEv, train, inputs, { customersPerItem: columnCounts(train), confirm: confirmEv });
  const tm = loadTrainedModels(db, ds);
  const rows = await readHoldout({ file: testFile });
  const owned = ownedMatrix(ds);
  const { truth } = holdoutTruth(ds, rows, owned);
  const cpi = columnCounts(train);
  analyse(blend, [
    { label: 'choose', ev: chooseEv, history: train, scorers, cpi },
    { label: 'confirm', ev: confirmEv, history: train, scorers, cpi },
    { label: 'test', ev: new RankingEvaluator(owned, truth, K), history: tm.matrix, scorers: tm.scorers as Map<string, Scorer>, cpi: columnCounts(tm.matrix) },
  ]);
}

(mode === 'evaluate' ? evaluateFlow() : holdoutFlow(a3!)).catch((e) => {
  console.error(e);
  process.exit(1);
});
