/**
 * Our k-means, adjusted Rand index and silhouette beside scikit-learn's (Debian's python3-sklearn; Python is
 * not in CI, so this is a benchmark script: `npm run bench:groups-sklearn`). On seeded directional vectors
 * (unit length, as the taste groups use):
 * - k-means: our best of R k-means++ restarts vs sklearn's KMeans(n_init=R) inertia, within 1% (the random
 *   streams differ, so the two pick different seedings; both should reach the same quality), and Lloyd's
 *   iterations from our own first seeding in both, which should end at the same inertia.
 * - ARI: ours vs sklearn.metrics.adjusted_rand_score on our labels and the planted ones.
 * - silhouette: ours vs sklearn.metrics.silhouette_score on a sample.
 * Exits 1 when a check fails.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { adjustedRandIndex, kMeans, kMeansPlusPlus, kMeansRestarts, meanSilhouette, pairDistances } from '../../src-main/core/audience/index.ts';
import { seededRng } from '../../src-main/core/rng.ts';

const N = Number(process.env.GROUPS_N ?? 20_000);
const DIM = 64;
const K = 8;
const RESTARTS = 10;
const SEED = 20261204;
// Noise around each planted direction; 1.5 gives well-separated groups, 3 and more overlapping ones.
const NOISE = Number(process.env.GROUPS_NOISE ?? 1.5);
const python = process.env.SHELFWRIGHT_PYTHON ?? '/usr/bin/python3';

const rng = seededRng(SEED);
const dirs = Float64Array.from({ length: K * DIM }, () => rng.normal());
const x = new Float32Array(N * DIM);
const truth = new Int32Array(N);
for (let u = 0; u < N; u++) {
  const g = rng.int(K);
  truth[u] = g;
  let s = 0;
  for (let f = 0; f < DIM; f++) s += (x[u * DIM + f] = (dirs[g * DIM + f] as number) + NOISE * rng.normal()) ** 2;
  const inv = 1 / Math.sqrt(s);
  for (let f = 0; f < DIM; f++) x[u * DIM + f] = (x[u * DIM + f] as number) * inv;
}

const best = kMeansRestarts(x, N, DIM, K, SEED, RESTARTS);
// Our own first seeding, and Lloyd's iterations from it (the same stream gives the same seeding).
const seeded = kMeansPlusPlus(x, N, DIM, K, seededRng(SEED));
const fromSeeding = kMeans(x, N, DIM, K, seededRng(SEED), { maxIterations: 300 });
const sampleIdx = Int32Array.from({ length: Math.min(N, 3000) }, (_, i) => Math.floor((i * N) / Math.min(N, 3000)));
const sample = new Float32Array(sampleIdx.length * DIM);
sampleIdx.forEach((u, i) => sample.set(x.subarray(u * DIM, (u + 1) * DIM), i * DIM));
const sampleLabels = Int32Array.from(sampleIdx, (u) => best.assignment[u]!);
const oursSil = meanSilhouette(pairDistances(sample, sampleIdx.length, DIM), sampleLabels, K);
const oursAri = adjustedRandIndex(best.assignment, truth);

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-groups-sklearn-'));
const file = (name: string, a: ArrayBufferView) => {
  const p = path.join(dir, name);
  fs.writeFileSync(p, new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  return p;
};
const args = {
  n: N, dim: DIM, k: K, restarts: RESTARTS, seed: SEED % 2 ** 31,
  x: file('x.f32', x), labels: file('labels.i32', best.assignment), truth: file('truth.i32', truth),
  init: file('init.f64', seeded), sample: file('sample.i32', sampleIdx), sampleLabels: file('sample-labels.i32', sampleLabels),
};
const r = spawnSync(python, [path.join(import.meta.dirname, 'sklearn_reference.py'), JSON.stringify(args)], { encoding: 'utf8' });
fs.rmSync(dir, { recursive: true, force: true });
if (r.status !== 0) {
  console.error(`${python} failed (needs python3-numpy and python3-sklearn): ${r.stderr}`);
  process.exit(2);
}
const ref = JSON.parse(r.stdout) as { inertiaRestarts: number; inertiaSameStart: number; ari: number; silhouette: number };
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const checks = [
  { what: `k-means, best of ${RESTARTS} k-means++ restarts: inertia ours ${best.inertia.toFixed(3)} vs sklearn ${ref.inertiaRestarts.toFixed(3)}`, diff: rel(best.inertia, ref.inertiaRestarts), limit: 0.01 },
  { what: `Lloyd from our seeding: inertia ours ${fromSeeding.inertia.toFixed(3)} vs sklearn ${ref.inertiaSameStart.toFixed(3)}`, diff: rel(fromSeeding.inertia, ref.inertiaSameStart), limit: 1e-4 },
  { what: `adjusted Rand index ours ${oursAri.toFixed(6)} vs sklearn ${ref.ari.toFixed(6)}`, diff: Math.abs(oursAri - ref.ari), limit: 1e-9 },
  { what: `silhouette on ${sampleIdx.length} ours ${oursSil.toFixed(6)} vs sklearn ${ref.silhouette.toFixed(6)}`, diff: Math.abs(oursSil - ref.silhouette), limit: 1e-5 },
];
console.log(`${N} unit vectors × ${DIM}, k = ${K} (seeded, ${K} planted directions, noise ${NOISE})`);
let failed = 0;
for (const c of checks) {
  const ok = c.diff <= c.limit;
  if (!ok) failed++;
  console.log(`${ok ? 'ok  ' : 'FAIL'} ${c.what} (difference ${c.diff.toExponential(2)}, limit ${c.limit})`);
}
process.exit(failed ? 1 : 0);
