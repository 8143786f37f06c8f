/**
 * iALS's quality surface over (scaling, α, λ): where does each α's best λ lie, on the tuner's validation window
 * and on a test file? A diagnostic, not a benchmark target (bench/quality/README.md, "iALS: α and λ together"):
 *   npx tsx bench/quality/ials-surface.ts validation WORKSPACE [factors] [sweeps]
 *       — the tuner's own validation split and measurement (services/tune/tune.ts: seed 1, at most 1,000
 *         customers, NDCG@20), the train part only, as a tuning trial sees it
 *   npx tsx bench/quality/ials-surface.ts test WORKSPACE TEST.csv [factors] [sweeps]
 *       — fitted on every signal of the workspace, scored on the file's pairs as `evaluate --holdout` does
 * Prints one row per (scaling, α) and one column per λ (half decades 0.1 to 1,000), each cell NDCG@20, with the
 * row's best marked *. Defaults: 64 factors, 3 sweeps for validation and 15 for test. ε of the log confidence is the
 * training's (core/matrix/signal-unit.ts). 64 fits: about 15 s on MovieLens 100K, 1–2 min on Online Retail here.
 */
import { evalTruth, RankingEvaluator, sampleTruth } from '../../src-main/core/eval/index.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import type { Csr } from '../../src-main/core/matrix/csr.ts';
import { signalUnit } from '../../src-main/core/matrix/signal-unit.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { holdoutTruth } from '../../src-main/services/holdout/evaluate.ts';
import { readHoldout } from '../../src-main/services/holdout/read.ts';
import { ownedMatrix } from '../../src-main/services/holdout/trained.ts';
import { fitIalsThreaded } from '../../src-main/services/train/ials-threads.ts';
import { validationSplit } from '../../src-main/services/tune/split.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const K = 20;
const LAMBDAS = [0.1, 1, 3.2, 10, 32, 100, 320, 1000];
const ROWS: ['log' | 'linear', number][] = [
  ['log', 0.1],
  ['log', 1],
  ['log', 10],
  ['log', 100],
  ['linear', 0.1],
  ['linear', 1],
  ['linear', 10],
  ['linear', 100],
];

const [mode, ws, ...rest] = process.argv.slice(2);
if ((mode !== 'validation' && mode !== 'test') || !ws || (mode === 'test' && !rest[0])) {
  console.error('usage: ials-surface.ts validation WORKSPACE [factors] [sweeps] | test WORKSPACE TEST.csv [factors] [sweeps]');
  process.exit(2);
}
const numbers = mode === 'test' ? rest.slice(1) : rest;
const factors = Number(numbers[0] ?? 64);
const sweeps = Number(numbers[1] ?? (mode === 'test' ? 15 : 3));
const ds = loadDataset(openWorkspace(ws, { readonly: true }));
const epsilon = signalUnit(ds);

let train: Csr;
let ev: RankingEvaluator;
if (mode === 'validation') {
  // As tuneDataset builds its trials' data (services/tune/tune.ts).
  const split = validationSplit(ds, { seed: 1 });
  train = buildInteractionMatrix(ds, { rows: split.train });
  const validation = buildInteractionMatrix(ds, { rows: split.validation });
  const truth = sampleTruth(evalTruth(train, validation, undefined, split.unavailable), 1000, seededRng(1));
  ev = new RankingEvaluator(train, truth, K, split.unavailable);
} else {
  // As evaluateHoldoutRows scores a trained model (services/holdout/evaluate.ts).
  train = buildInteractionMatrix(ds);
  const owned = ownedMatrix(ds);
  const { truth } = holdoutTruth(ds, await readHoldout({ file: rest[0]! }, {}), owned);
  ev = new RankingEvaluator(owned, truth, K);
}
console.log(`${mode}: ${ev.customerCount} customers, ${factors} factors, ${sweeps} sweeps, ε ${epsilon}; NDCG@${K}`);
console.log(['scaling', 'alpha', ...LAMBDAS.map((l) => `λ ${l}`)].map((x) => x.padStart(9)).join(''));
for (const [scaling, alpha] of ROWS) {
  const cells: number[] = [];
  for (const regularization of LAMBDAS) {
    const m = (await fitIalsThreaded(train, { epsilon, factors, regularization, alpha, scaling, iterations: sweeps, seed: 1 }, {})).model;
    cells.push(ev.evaluateFill('ials', (u, _c, out) => m.scoreInto(u, train, out)).ndcg);
  }
  const top = Math.max(...cells);
  console.log([scaling, String(alpha), ...cells.map((c) => `${c.toFixed(4)}${c === top ? '*' : ' '}`)].map((x) => x.padStart(9)).join(''));
}
