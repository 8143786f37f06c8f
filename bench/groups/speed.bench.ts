/**
 * Taste-group timing (issue 15: groups for 200,000 customers × 64 factors in < 5 s on two cores). Synthetic,
 * seeded factors: 10 planted taste directions, each customer a noisy copy of one at a random length (as iALS
 * vectors are), a tenth of them with too little history. Run with `npm run bench:groups`; prints the median
 * of the runs and the split between choosing k on the sample and fitting every customer.
 */
import os from 'node:os';
import { adjustedRandIndex, findTasteGroups } from '../../src-main/core/audience/index.ts';
import { seededRng } from '../../src-main/core/rng.ts';

const N = Number(process.env.GROUPS_N ?? 200_000);
const DIM = 64;
const PLANTED = 10;
const RUNS = Number(process.env.GROUPS_RUNS ?? 3);
const rng = seededRng(20261204);
const dirs = Float64Array.from({ length: PLANTED * DIM }, () => rng.normal());
const x = new Float32Array(N * DIM);
const truth = new Int32Array(N);
const history = new Int32Array(N);
for (let u = 0; u < N; u++) {
  const g = rng.int(PLANTED);
  truth[u] = g;
  history[u] = rng.next() < 0.1 ? 1 : 3 + rng.int(40);
  const len = 0.2 + 2 * rng.next();
  for (let f = 0; f < DIM; f++) x[u * DIM + f] = len * ((dirs[g * DIM + f] as number) + 1.2 * rng.normal());
}
const times: number[] = [];
let last = null as ReturnType<typeof findTasteGroups> | null;
for (let r = 0; r < RUNS; r++) {
  const t = performance.now();
  const cpu = process.cpuUsage();
  last = findTasteGroups(x, N, DIM, history);
  times.push(performance.now() - t);
  const used = process.cpuUsage(cpu);
  console.log(`run ${r + 1}: ${times[r]!.toFixed(0)} ms wall, ${((used.user + used.system) / 1000).toFixed(0)} ms CPU (choose k on ${last.sampled} sampled: ${last.timings.chooseMs.toFixed(0)} ms, all customers: ${last.timings.fullMs.toFixed(0)} ms)`);
}
times.sort((a, b) => a - b);
const g = last!;
const assigned = Int32Array.from(truth, (t, u) => (g.assignment[u]! < 0 ? -1 : t));
console.log(`${N} customers × ${DIM} factors, k chosen ${g.k} of ${g.settings.minK}..${g.settings.maxK} (planted ${PLANTED}), ARI ${adjustedRandIndex(g.assignment, assigned).toFixed(4)}`);
console.log(`load average ${os.loadavg()[0]!.toFixed(1)} on ${os.cpus().length} cores; median ${times[Math.floor(times.length / 2)]!.toFixed(0)} ms over ${RUNS} runs (target < 5000 ms)`);
