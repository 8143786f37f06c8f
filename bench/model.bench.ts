/**
 * Model benchmark (DESIGN.md "Performance targets"). Run with `npm run bench:model` (a script, not a test).
 * (a) The demo shop (demo-data generator, imported through services/import.ts): train everything with the
 *     real training job (worker thread; target < 20 s) and score one customer's pool over the whole
 *     catalogue with each model (median over customers; target < 5 ms).
 * (b) A generated large set built directly as CSR (seeded): 50,000 items, 200,000 customers, 5,000,000
 *     signals. iALS k = 64 × 15 iterations on the worker-thread path (target < 120 s, peak RSS < 3 GB),
 *     then scoring one customer over 50,000 items (target < 50 ms).
 * Flags: --skip-demo, --skip-large, --iterations=N (large set), --threads=N.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { generateDemoShop } from '../demo-data/generator/index.ts';
import { buildInteractionMatrix } from '../src-main/core/matrix/build.ts';
import type { Csr } from '../src-main/core/matrix/csr.ts';
import { loadContent } from '../src-main/core/models/content.ts';
import { loadEase } from '../src-main/core/models/ease.ts';
import { loadIals } from '../src-main/core/models/ials.ts';
import { loadItemKnn } from '../src-main/core/models/itemknn.ts';
import { loadPopularity } from '../src-main/core/models/popularity.ts';
import type { Scorer } from '../src-main/core/models/scorer.ts';
import { seededRng } from '../src-main/core/rng.ts';
import { importFile } from '../src-main/services/import.ts';
import { fitIalsThreaded } from '../src-main/services/train/ials-threads.ts';
import { trainAll } from '../src-main/services/train/train-job.ts';
import { loadDataset } from '../src-main/store/dataset.ts';
import { openWorkspace } from '../src-main/store/workspace.ts';

const args = process.argv.slice(2);
const flag = (name: string) => args.includes(`--${name}`);
const value = (name: string, d: number) => {
  const a = args.find((x) => x.startsWith(`--${name}=`));
  return a ? Number(a.slice(name.length + 3)) : d;
};
const threads = value('threads', Math.min(2, os.availableParallelism()));

const loadAverage = () => os.loadavg().map((x) => x.toFixed(1)).join(' ');

/**
 * CPU seconds of each live thread of this process, by thread id, from /proc/self/task/<tid>/stat
 * (utime + stime, fields 14 and 15, in clock ticks: proc(5)); empty where /proc is missing. Worker
 * threads show up here, so a sample taken while iALS runs shows whether both solver threads are busy.
 */
function threadCpu(): Map<number, number> {
  const out = new Map<number, number>();
  const tick = 100; // USER_HZ, 100 on Linux (sysconf(_SC_CLK_TCK); from memory)
  try {
    for (const tid of fs.readdirSync('/proc/self/task')) {
      const stat = fs.readFileSync(`/proc/self/task/${tid}/stat`, 'utf8');
      const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' '); // fields from 3 on
      out.set(Number(tid), (Number(fields[11]) + Number(fields[12])) / tick);
    }
  } catch {
    // not Linux: no per-thread figures
  }
  return out;
}

/** Threads that used more than 0.2 CPU-s between two samples, busiest first, as "tid 1.2 s". */
function busyThreads(before: Map<number, number>, after: Map<number, number>): string {
  const used = [...after].map(([tid, t]) => [tid, t - (before.get(tid) ?? 0)] as const).filter(([, t]) => t > 0.2);
  return used.sort((a, b) => b[1] - a[1]).map(([tid, t]) => `${tid} ${t.toFixed(1)} s`).join(', ') || 'n/a';
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};
const ms = (x: number) => `${x.toFixed(x < 10 ? 3 : 1)} ms`;
const peakRssMb = () => process.resourceUsage().maxRSS / 1024;
/** CPU seconds of the whole process (all threads): on a shared machine wall time includes others' work. */
const cpuSeconds = () => {
  const c = process.cpuUsage();
  return (c.user + c.system) / 1e6;
};

/**
 * Flops of one iALS iteration (both halves), counting a multiply-add as 2:
 *   (s + 1)·[2k²·(U + I) + 8k·nnz] + k(k + 1)·(U + I) + 2k·nnz
 * s CG steps plus the initial residual each cost, per row, a dense (YᵀY + λI)·v product (2k²) and, per
 * observed entry, a dot and an axpy (4k) — every entry is visited once per half, so 8k per entry over
 * both halves; the two Grams cost k(k + 1) per row (upper triangle only); the observed loss term 2k per entry.
 */
function ialsFlops(U: number, I: number, nnz: number, k: number, s: number): number {
  return (s + 1) * (2 * k * k * (U + I) + 8 * k * nnz) + k * (k + 1) * (U + I) + 2 * k * nnz;
}

/** Median time of scoring one customer over the catalogue, over `n` customers spread over the rows. */
function scoreTiming(scorer: Scorer, history: Csr, n: number): number {
  const out = new Float32Array(scorer.itemCount);
  const times: number[] = [];
  for (let q = 0; q < n + 5; q++) {
    const u = Math.floor((q * history.rows) / (n + 5));
    const t = performance.now();
    scorer.scoreInto(u, history, out);
    if (q >= 5) times.push(performance.now() - t); // the first few warm the code up
  }
  return median(times);
}

async function demoShop(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-model-'));
  try {
    console.log('\n(a) demo shop');
    let t = performance.now();
    const shop = await generateDemoShop({ outDir: dir });
    console.log(`  generated ${shop.items} items, ${shop.customers} customers, ${shop.signals} signals in ${ms(performance.now() - t)}`);
    const file = path.join(dir, 'demo.sqlite');
    const db = openWorkspace(file);
    t = performance.now();
    for (const target of ['items', 'customers', 'signals'] as const) {
      const r = await importFile(db, { target, file: shop.files[target] });
      if (!r.committed) throw new Error(`demo import of ${target} was not committed`);
    }
    console.log(`  imported in ${ms(performance.now() - t)}`);

    t = performance.now();
    const cpu0 = cpuSeconds();
    let lastIals = 0;
    const out = await trainAll(file, { threads }, {
      onProgress: (p) => {
        if (p.model === 'ials' && p.iteration !== undefined) lastIals = p.iteration;
      },
    });
    const total = performance.now() - t;
    console.log(`  train everything (worker thread, load + matrix + 5 models): ${ms(total)} wall, ` +
      `${(cpuSeconds() - cpu0).toFixed(1)} CPU-s  [target < 20 s] ${total < 20_000 ? 'MET' : 'MISSED'}`);
    for (const r of out.records) console.log(`    ${r.kind.padEnd(10)} ${ms(r.trainMs)}${r.report.notes.length ? `  (${r.report.notes.join('; ')})` : ''}`);
    console.log('    stages (wall / CPU of all threads): ' + out.timings.map((x) => `${x.stage}${x.inThread ? ' (own thread, alongside)' : ''} ${(x.wallMs / 1000).toFixed(2)} / ${x.cpuMs < 0 ? 'n/a' : (x.cpuMs / 1000).toFixed(2)} s`).join(', '));
    console.log(`    load average after training ${loadAverage()}`);
    console.log(`    iALS iterations reported: ${lastIals}`);

    const history = buildInteractionMatrix(loadDataset(db));
    db.close();
    const loaders: Record<string, (b: Uint8Array) => Scorer> = {
      content: loadContent,
      itemknn: loadItemKnn,
      ials: loadIals,
      ease: loadEase,
      popularity: loadPopularity,
    };
    let sum = 0;
    for (const r of out.records) {
      const scorer = loaders[r.kind]!(r.bytes);
      const m = scoreTiming(scorer, history, 200);
      sum += m;
      console.log(`  score one customer over ${scorer.itemCount} items, ${r.kind.padEnd(10)} median ${ms(m)}`);
    }
    console.log(`  all five components for one customer: ${ms(sum)}  [target < 5 ms] ${sum < 5 ? 'MET' : 'MISSED'}`);
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * A seeded customers × items matrix: `perCustomer` distinct items per customer, drawn with a skewed
 * (power-law-like) item popularity, values 1..3. Built row by row directly into CSR arrays.
 */
function largeMatrix(customers: number, items: number, perCustomer: number, seed: number): Csr {
  const rng = seededRng(seed);
  const indptr = new Int32Array(customers + 1);
  const indices = new Int32Array(customers * perCustomer);
  const data = new Float32Array(customers * perCustomer);
  const mark = new Uint8Array(items);
  const row = new Int32Array(perCustomer);
  let w = 0;
  for (let u = 0; u < customers; u++) {
    let n = 0;
    while (n < perCustomer) {
      const i = Math.floor(items * rng.next() ** 2.5);
      if (mark[i]) continue;
      mark[i] = 1;
      row[n++] = i;
    }
    row.sort();
    for (let q = 0; q < perCustomer; q++) {
      mark[row[q]!] = 0;
      indices[w] = row[q]!;
      data[w++] = 1 + rng.int(3);
    }
    indptr[u + 1] = w;
  }
  return { rows: customers, cols: items, indptr, indices, data };
}

async function largeSet(): Promise<void> {
  const U = 200_000;
  const I = 50_000;
  const per = 25;
  const k = 64;
  const cgSteps = 3;
  const iterations = value('iterations', 15);
  console.log(`\n(b) generated large set: ${I} items, ${U} customers, ${U * per} signals; iALS k=${k}, ${iterations} iterations, ${threads} threads`);
  let t = performance.now();
  const m = largeMatrix(U, I, per, 20261201);
  console.log(`  built CSR in ${ms(performance.now() - t)}`);
  const times: number[] = [];
  const cpuTimes: number[] = [];
  let last = performance.now();
  let lastCpu = cpuSeconds();
  let lastThreads = threadCpu();
  t = performance.now();
  const { model, report } = await fitIalsThreaded(m, { factors: k, iterations, cgSteps, seed: 1 }, {
    threads,
    onIteration: (p) => {
      const now = performance.now();
      const cpu = cpuSeconds();
      times.push(now - last);
      cpuTimes.push(cpu - lastCpu);
      last = now;
      lastCpu = cpu;
      const threadsNow = threadCpu();
      console.log(`    iteration ${p.iteration}: ${ms(times.at(-1)!)} wall, ${cpuTimes.at(-1)!.toFixed(1)} CPU-s, loss ${p.loss?.toExponential(6)}; ` +
        `busy threads (CPU-s): ${busyThreads(lastThreads, threadsNow)}; load ${loadAverage()}`);
      lastThreads = threadsNow;
    },
  });
  const total = performance.now() - t;
  const flops = ialsFlops(U, I, U * per, k, cgSteps);
  const med = median(times);
  console.log(`  iALS total ${ms(total)} (incl. setup)  [target < 120 s] ${total < 120_000 ? 'MET' : 'MISSED'}; ${report.notes.join('; ')}`);
  console.log(`  FLOPs per iteration: (s+1)·[2k²(U+I) + 8k·nnz] + k(k+1)(U+I) + 2k·nnz = ${(flops / 1e9).toFixed(2)} GFLOP`);
  const medCpu = median(cpuTimes);
  console.log(`  median iteration ${ms(med)} wall → ${(flops / (med / 1000) / 1e9).toFixed(2)} GFLOP/s; ` +
    `${medCpu.toFixed(1)} CPU-s → ${(flops / medCpu / 1e9).toFixed(2)} GFLOP per CPU-second`);
  const losses = report.losses!;
  let rises = 0;
  for (let q = 1; q < losses.length; q++) if (losses[q]! > losses[q - 1]!) rises++;
  console.log(`  loss first ${losses[0]!.toExponential(6)}, last ${losses.at(-1)!.toExponential(6)}; rises with cgSteps=${cgSteps}: ${rises}`);
  console.log(`  peak RSS so far ${peakRssMb().toFixed(0)} MB  [target < 3 GB] ${peakRssMb() < 3072 ? 'MET' : 'MISSED'}`);
  const s = scoreTiming(model, m, 200);
  console.log(`  score one customer over ${I} items (iALS) median ${ms(s)}  [target < 50 ms] ${s < 50 ? 'MET' : 'MISSED'}`);
}

console.log(`model benchmark: Node ${process.version}, ${os.availableParallelism()} cores, load average ${loadAverage()}`);
if (!flag('skip-demo')) await demoShop();
if (!flag('skip-large')) await largeSet();
console.log(`\npeak RSS ${peakRssMb().toFixed(0)} MB; load average at the end ${loadAverage()}`);
