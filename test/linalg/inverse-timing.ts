/**
 * Timing script (not a test): `npx tsx test/linalg/inverse-timing.ts [n]` prints how long the SPD
 * inverse of an n × n matrix (default 2,500, an EASE catalogue of that size) takes, phase by phase.
 */
import { choleskyInPlace, lowerInverseInPlace, spdInverseInPlace } from '../../src-main/core/linalg/cholesky.ts';
import { seededRng } from '../../src-main/core/rng.ts';

const n = Number(process.argv[2] ?? 2500);
const rng = seededRng(1);
const f = 24;
const r = Float64Array.from({ length: n * f }, () => rng.next());
const g = new Float64Array(n * n);
for (let i = 0; i < n; i++) {
  for (let j = 0; j < n; j++) {
    let s = i === j ? 1 : 0;
    for (let k = 0; k < f; k++) s += r[i * f + k]! * r[j * f + k]!;
    g[i * n + j] = s;
  }
}
const a = Float64Array.from(g);
// CPU time as well as wall time: the machine may be shared, and CPU time is what the code costs.
const cpu = (): number => process.cpuUsage().user / 1000;
let t = cpu();
choleskyInPlace(a, n);
const chol = cpu() - t;
t = cpu();
lowerInverseInPlace(a, n);
const linv = cpu() - t;
const b = Float64Array.from(g);
t = cpu();
const wall = performance.now();
spdInverseInPlace(b, n);
const total = cpu() - t;
const totalWall = performance.now() - wall;
// Check: row 0 of A · A⁻¹ is e_0.
let err = 0;
for (let j = 0; j < n; j++) {
  let s = 0;
  for (let k = 0; k < n; k++) s += g[k]! * b[k * n + j]!;
  err = Math.max(err, Math.abs(s - (j === 0 ? 1 : 0)));
}
console.log(`n=${n} (CPU ms): cholesky ${chol.toFixed(0)}, L^-1 ${linv.toFixed(0)}, full inverse ${total.toFixed(0)} (wall ${totalWall.toFixed(0)} ms), max |(A·A^-1 − I)_0j| = ${err.toExponential(1)}`);
