/**
 * EASE benchmark (DESIGN.md "Performance targets": 5,000 items ≤ 3× numpy/OpenBLAS in the same run;
 * 20,000 items fit in < 4 GB). Run with `npm run bench:ease` (a script, not a test).
 * Builds a seeded random 0/1 interaction matrix with skewed item popularity, then alternates, `--reps`
 * times, our fit (Gram, Cholesky, inverse, weights timed apart) with bench/ease_reference.py under
 * Debian's /usr/bin/python3 + numpy on the same X (written to a temporary file), and prints medians and
 * the ratio. Alternating keeps both in the same window of a shared, loaded machine.
 * Flags: --items=N (default 5000), --customers=N (default 6 × items), --reps=N (default 3), --threads=N
 * (default 2: ours runs on 1 and on N threads; numpy's OpenBLAS uses the machine's cores),
 * --threads-only (ours on N threads only), --store (also time serializing the model as training stores it),
 * --no-reference (ours only: for 20,000 items, whose float64 numpy inverse needs ~10 GB), --lambda=X.
 * Peak RSS is the process's maxRSS, so run one size per process.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Csr } from '../src-main/core/matrix/csr.ts';
import { EaseModel } from '../src-main/core/models/ease.ts';
import { easeWeights } from '../src-main/core/models/ease-weights.ts';
import { spdInverseF32, type SpdWorkspace } from '../src-main/core/linalg/spd-f32.ts';
import { invertInThreads } from '../src-main/services/train/ease-inverse-threads.ts';
import { seededRng } from '../src-main/core/rng.ts';

const args = process.argv.slice(2);
const value = (name: string, d: number) => {
  const a = args.find((x) => x.startsWith(`--${name}=`));
  return a ? Number(a.slice(name.length + 3)) : d;
};
const items = value('items', 5000);
const customers = value('customers', 6 * items);
const reps = value('reps', 3);
const lambda = value('lambda', 500);
const reference = !args.includes('--no-reference');
const threads = value('threads', Math.min(2, os.availableParallelism()));
const store = args.includes('--store');

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};
const sec = (x: number) => `${x.toFixed(2)} s`;
const loadAverage = () => os.loadavg().map((x) => x.toFixed(1)).join(' ');

/**
 * Customers with 1 + a geometric number of items (mean ~ 15), items drawn with Zipf-like popularity
 * (rank^-0.8, common practice for retail logs, no source), rows sorted and without repeats.
 */
function randomInteractions(rows: number, cols: number, seed: number): Csr {
  const rng = seededRng(seed);
  const weight = Float64Array.from({ length: cols }, (_, i) => (i + 1) ** -0.8);
  const cum = new Float64Array(cols);
  let total = 0;
  for (let i = 0; i < cols; i++) cum[i] = total += weight[i]!;
  // Shuffle which item has which popularity rank, so popularity is not tied to the index.
  const perm = Int32Array.from({ length: cols }, (_, i) => i);
  for (let i = cols - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    [perm[i], perm[j]] = [perm[j]!, perm[i]!];
  }
  const indptr = new Int32Array(rows + 1);
  const indices: number[] = [];
  for (let u = 0; u < rows; u++) {
    const count = 1 + Math.floor(Math.log(1 - rng.next()) / Math.log(1 - 1 / 15));
    const set = new Set<number>();
    for (let t = 0; t < count; t++) {
      const r = rng.next() * total;
      let lo = 0;
      let hi = cols - 1;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (cum[mid]! < r) lo = mid + 1;
        else hi = mid;
      }
      set.add(perm[lo]!);
    }
    for (const i of [...set].sort((a, b) => a - b)) indices.push(i);
    indptr[u + 1] = indices.length;
  }
  return { rows, cols, indptr, indices: Int32Array.from(indices), data: new Float32Array(indices.length).fill(1) };
}

function writeX(x: Csr, file: string): void {
  const head = Int32Array.of(x.rows, x.cols, x.indices.length);
  const fd = fs.openSync(file, 'w');
  for (const a of [head, x.indptr, x.indices]) fs.writeSync(fd, new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  fs.closeSync(fd);
}

interface OurTimes {
  gram: number;
  cholesky: number;
  inverse: number;
  weights: number;
  total: number;
  /** CPU seconds of the whole process (all threads): on a loaded machine, what the fit cost. */
  cpu: number;
  checksum: number;
  /** Serialized model size and time (what training stores), when --store. */
  stored?: { bytes: number; seconds: number };
}

/**
 * Our fit through the model's own code (easeWeights with the inverse of the training's EASE thread:
 * spdInverseF32 on one thread, invertInThreads on several), the phases timed apart by its hooks.
 */
function ours(x: Csr, threads: number): OurTimes {
  const kept = Int32Array.from({ length: x.cols }, (_, i) => i);
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const at: Record<string, number> = {};
  const onPhase = (phase: number) => (at[`phase${phase}`] = performance.now());
  const b = easeWeights(x, kept, lambda, {
    invert: (m, writeLower) => {
      const timedWrite = (ws: SpdWorkspace) => {
        writeLower(ws);
        at['gram'] = performance.now();
      };
      return threads > 1 ? invertInThreads(m, timedWrite, threads, { onPhase }) : spdInverseF32(m, timedWrite, { onPhase });
    },
  });
  const end = performance.now();
  const c1 = process.cpuUsage(c0);
  let stored: OurTimes['stored'];
  if (store) {
    const ts = performance.now();
    const bytes = new EaseModel(x.cols, kept, b).serialize().byteLength;
    stored = { bytes, seconds: (performance.now() - ts) / 1000 };
  }
  let checksum = 0;
  for (let k = 0; k < b.length; k++) checksum += Math.abs(b[k]!);
  const s = (a: number, z: number) => (z - a) / 1000;
  return {
    gram: s(t0, at['gram']!),
    cholesky: s(at['gram']!, at['phase1']!),
    inverse: s(at['phase1']!, at['phase3']!),
    weights: s(at['phase3']!, end),
    total: s(t0, end),
    cpu: (c1.user + c1.system) / 1e6,
    checksum,
    ...(stored && { stored }),
  };
}

interface RefOut {
  items: number;
  blas: unknown;
  gram: string;
  inv: { gram: number; inverse: number; weights: number; total: number };
  cholesky: { gram: number; factor: number; inverse: number; weights: number; total: number } | null;
  checksum: number;
}

function numpy(file: string): RefOut {
  const env = { ...process.env };
  // The shared environment pins OpenBLAS's kernel and L2 size; let it pick its own for the timing.
  delete env['OPENBLAS_CORETYPE'];
  delete env['OPENBLAS_L2_SIZE'];
  const script = path.join(path.dirname(fileURLToPath(import.meta.url)), 'ease_reference.py');
  const r = spawnSync('/usr/bin/python3', [script, file, String(lambda)], { env, encoding: 'utf8', maxBuffer: 1 << 24 });
  if (r.status !== 0) throw new Error(`ease_reference.py failed (${r.status}): ${r.stderr || r.error?.message}`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!) as RefOut;
}

function main(): void {
  console.log(`EASE benchmark: ${items} items, ${customers} customers, lambda ${lambda}, ${reps} reps; ${os.availableParallelism()} cores, load ${loadAverage()}`);
  const x = randomInteractions(customers, items, 1);
  console.log(`  X: ${x.indices.length} interactions (${((100 * x.indices.length) / (customers * items)).toFixed(3)} % dense)`);
  let file = '';
  if (reference) {
    const probe = spawnSync('/usr/bin/python3', ['-c', 'import numpy'], { encoding: 'utf8' });
    if (probe.status !== 0) throw new Error(`/usr/bin/python3 has no numpy (apt-get install python3-numpy): ${probe.stderr}`);
    file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-ease-')), 'x.bin');
    writeX(x, file);
  }
  // Ours on one thread and (when --threads > 1) on several, then numpy, in turn: the same window of load.
  const variants = args.includes('--threads-only') || threads === 1 ? [threads] : [1, threads];
  const mine = new Map<number, OurTimes[]>(variants.map((t) => [t, []]));
  const refs: RefOut[] = [];
  const show = (m: OurTimes) =>
    `${sec(m.total)} (gram ${sec(m.gram)}, cholesky ${sec(m.cholesky)}, inverse ${sec(m.inverse)}, weights ${sec(m.weights)}; ${m.cpu.toFixed(1)} CPU-s)` +
    (m.stored ? ` stored model ${(m.stored.bytes / 2 ** 20).toFixed(1)} MiB in ${sec(m.stored.seconds)}` : '');
  try {
    for (let r = 0; r < reps; r++) {
      let line = `  rep ${r + 1}:`;
      for (const t of variants) {
        const m = ours(x, t);
        mine.get(t)!.push(m);
        line += ` ours ${t} thread${t > 1 ? 's' : ''} ${show(m)};`;
      }
      if (reference) {
        const ref = numpy(file);
        refs.push(ref);
        line += ` numpy inv ${sec(ref.inv.total)}` + (ref.cholesky ? `, numpy potrf+potri ${sec(ref.cholesky.total)}` : '') + ';';
      }
      console.log(line + ` load ${loadAverage()}`);
    }
  } finally {
    if (file) fs.rmSync(path.dirname(file), { recursive: true, force: true });
  }
  console.log('');
  for (const t of variants) {
    const med = (f: (t: OurTimes) => number) => median(mine.get(t)!.map(f));
    console.log(
      `ours (float32, WebAssembly SIMD, ${t} thread${t > 1 ? 's' : ''}), median of ${reps}: total ${sec(med((q) => q.total))}; ` +
        `gram ${sec(med((q) => q.gram))}, cholesky ${sec(med((q) => q.cholesky))}, inverse ${sec(med((q) => q.inverse))}, weights ${sec(med((q) => q.weights))}`,
    );
  }
  console.log(`  peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB (whole process, all runs)`);
  if (!reference) return;
  const ref = refs[0]!;
  console.log(`numpy: Gram by ${ref.gram}; BLAS: ${JSON.stringify(ref.blas)}`);
  const inv = median(refs.map((r) => r.inv.total));
  console.log(
    `numpy np.linalg.inv (float64), median: total ${sec(inv)}; gram ${sec(median(refs.map((r) => r.inv.gram)))}, ` +
      `inverse ${sec(median(refs.map((r) => r.inv.inverse)))}, weights ${sec(median(refs.map((r) => r.inv.weights)))}`,
  );
  const ch = refs.every((r) => r.cholesky) ? median(refs.map((r) => r.cholesky!.total)) : NaN;
  if (!Number.isNaN(ch)) {
    console.log(
      `numpy/scipy potrf + potri (float64), median: total ${sec(ch)}; factor ${sec(median(refs.map((r) => r.cholesky!.factor)))}, ` +
        `inverse ${sec(median(refs.map((r) => r.cholesky!.inverse)))}`,
    );
  }
  const best = variants[variants.length - 1]!;
  const ourTotal = median(mine.get(best)!.map((t) => t.total));
  const ourSum = median(mine.get(best)!.map((t) => t.checksum));
  console.log(`sum |B|: ours ${ourSum.toFixed(4)}, numpy ${ref.checksum.toFixed(4)} (relative difference ${(Math.abs(ourSum - ref.checksum) / ref.checksum).toExponential(1)})`);
  const one = median(mine.get(variants[0]!)!.map((t) => t.total));
  console.log(`RATIO ours (${best} thread${best > 1 ? 's' : ''}) / numpy inv = ${(ourTotal / inv).toFixed(2)} (target ≤ 3)` + (Number.isNaN(ch) ? '' : `; / numpy potrf+potri = ${(ourTotal / ch).toFixed(2)}`));
  if (best > 1) console.log(`  ours (1 thread) / numpy inv = ${(one / inv).toFixed(2)}` + (Number.isNaN(ch) ? '' : `; / numpy potrf+potri = ${(one / ch).toFixed(2)}`));
}

main();
