/**
 * Command-line start-up: `shelfwright info -w <demo workspace>` and `shelfwright --help`, each run 10 times as
 * a fresh process through bin/shelfwright.js, from the Node build (dist-node/, what `npm install` prepares)
 * and from the TypeScript sources through tsx (SHELFWRIGHT_FROM_SOURCE=1, how every command started before
 * the build existed). `node -e 0` is timed too: the floor no command can go under on this machine.
 * Prints medians side by side: wall time, and CPU time (user + system of the whole process, from
 * process.cpuUsage at exit), which a busy shared machine inflates much less than the wall time.
 *
 * Run with `npm run bench:cli`. Builds dist-node/ first when it is missing or older than the sources.
 * SW_BENCH_DEMO=<file> uses that workspace (read only); otherwise the demo shop is generated into a temp
 * dir without training (`info` reads counts only, so models make no difference to it).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { buildDemoWorkspace } from '../src-main/services/demo.ts';
import { staleReason } from '../bin/launch.js';

const ROOT = path.resolve(import.meta.dirname, '..');
const BIN = path.join(ROOT, 'bin/shelfwright.js');
const RUNS = 10;

if (staleReason() !== null) {
  const r = spawnSync(process.execPath, [path.join(ROOT, 'scripts/build-node.mjs')], { stdio: 'inherit' });
  if (r.status !== 0) throw new Error('npm run build:node failed');
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-bench-'));
let workspace = process.env['SW_BENCH_DEMO'];
if (!workspace) {
  workspace = path.join(dir, 'demo.sqlite');
  const t0 = performance.now();
  await buildDemoWorkspace(workspace, { train: false });
  console.log(`demo workspace generated (no models) in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
}

/** Reports the child's own CPU time into a file when it exits (loaded with --import before anything else). */
const cpuFile = path.join(dir, 'cpu.json');
const CPU_HOOK = `data:text/javascript,import fs from 'node:fs';process.on('exit',()=>{const u=process.cpuUsage();fs.writeFileSync(${JSON.stringify(cpuFile)},JSON.stringify((u.user+u.system)/1000))})`;

interface Sample {
  wallMs: number;
  cpuMs: number;
}

function runOnce(args: string[], env: NodeJS.ProcessEnv): Sample {
  fs.rmSync(cpuFile, { force: true });
  const t0 = performance.now();
  const r = spawnSync(process.execPath, ['--import', CPU_HOOK, ...args], { cwd: ROOT, env, encoding: 'utf8' });
  const wallMs = performance.now() - t0;
  if (r.status !== 0) throw new Error(`node ${args.join(' ')} failed (exit ${r.status}): ${r.stderr}`);
  return { wallMs, cpuMs: Number(fs.readFileSync(cpuFile, 'utf8')) };
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

const built = { ...process.env };
delete built['SHELFWRIGHT_FROM_SOURCE'];
const source = { ...process.env, SHELFWRIGHT_FROM_SOURCE: '1' };
const cases: { name: string; args: string[] }[] = [
  { name: `info -w <demo>`, args: [BIN, 'info', '-w', workspace] },
  { name: '--help', args: [BIN, '--help'] },
];

console.log(`${RUNS} runs each, interleaved; load average ${os.loadavg().map((x) => x.toFixed(2)).join(' ')} on ${os.cpus().length} cores`);
const floor: Sample[] = [];
const results = cases.map(() => ({ built: [] as Sample[], tsx: [] as Sample[] }));
// Interleaved (built, tsx, built, tsx, ...) so a change in the machine's load falls on both alike.
for (let i = 0; i < RUNS; i++) {
  floor.push(runOnce(['-e', '0'], built));
  cases.forEach((c, k) => {
    results[k]!.built.push(runOnce(c.args, built));
    results[k]!.tsx.push(runOnce(c.args, source));
  });
}

const fmt = (xs: Sample[]) => `${median(xs.map((x) => x.wallMs)).toFixed(0).padStart(6)} ms wall ${median(xs.map((x) => x.cpuMs)).toFixed(0).padStart(5)} ms CPU`;
console.log(`${'command'.padEnd(16)} ${'built (dist-node)'.padEnd(27)} ${'tsx (sources)'.padEnd(27)} speed-up (wall)`);
cases.forEach((c, k) => {
  const r = results[k]!;
  const ratio = median(r.tsx.map((x) => x.wallMs)) / median(r.built.map((x) => x.wallMs));
  console.log(`${c.name.padEnd(16)} ${fmt(r.built).padEnd(27)} ${fmt(r.tsx).padEnd(27)} ${ratio.toFixed(1)}x`);
});
console.log(`${'node -e 0'.padEnd(16)} ${fmt(floor)}   (the floor: Node itself)`);
console.log(`load average after: ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
fs.rmSync(dir, { recursive: true, force: true });
