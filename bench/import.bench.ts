/**
 * Import benchmark (DESIGN.md target: >= 200,000 signal rows/s, peak memory < 500 MB for 1M rows).
 * Writes 1,000,000 signals plus the items and customers they name to a temp CSV, then imports them into a
 * fresh temp workspace RUNS times, each run in its own child process so its peak RSS is the import's own.
 * Prints per run and as medians: rows/s of wall time, CPU seconds (process.cpuUsage: every thread, SQLite's
 * included) and rows per CPU-second, peak RSS, and the machine's 1-minute load average before and after
 * the run: on a shared machine the wall clock also counts time spent waiting for a core, so read the rate
 * against the load. The main thread's own CPU time (Linux /proc/self/task/<pid>/stat, utime + stime in
 * clock ticks: proc(5)) is printed beside the total, so the rest is the parsing thread's (plus V8's helper
 * threads). BENCH_MODE=single|thread|both (default both) picks the signal path: single-thread or parsing
 * in a worker thread (RunOptions.parseThread); runs alternate between the two so both see the same load.
 * Run: npm run bench:import (BENCH_SIGNALS and BENCH_RUNS override the size and the runs per mode).
 *
 * BENCH_SCENARIO=bulk runs only the above; BENCH_SCENARIO=append (DESIGN.md target: appending 1M signals to a workspace that has 400k runs at
 * >= 0.8x the bulk-load rate) instead builds the demo shop once (no training: 2,500 items, 15,000
 * customers, ~400k signals), writes BENCH_SIGNALS new signals of its customers and items dated after its
 * history, and imports them, alternating per run, (a) into a copy of the demo (the append) and (b) into a
 * copy whose signals were deleted (the bulk load into an empty table), both by the default path. It prints
 * each run, the medians, and the ratio of the median rates. BENCH_UPSERT=1 adds (c): the append forced
 * through the row-by-row upsert (appendPath 'upsert'), the path every append took before.
 * By default (BENCH_SCENARIO=both) the bulk benchmark above runs first, then this one.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { seededRng } from '../src-main/core/rng.ts';
import { runImport } from '../src-main/ingest/run.ts';
import { buildDemoWorkspace } from '../src-main/services/demo.ts';
import { importFile } from '../src-main/services/import.ts';
import { openWorkspace } from '../src-main/store/workspace.ts';

const SIGNALS = Number(process.env.BENCH_SIGNALS ?? 1_000_000);
const RUNS = Number(process.env.BENCH_RUNS ?? 3);
const MODES = (process.env.BENCH_MODE ?? 'both') === 'both' ? ['single', 'thread'] : [process.env.BENCH_MODE!];
/** Clock ticks per second for /proc times (sysconf(_SC_CLK_TCK); 100 on Linux x86-64 and arm64). */
const TICKS = Number(execFileSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).trim());
const ITEMS = 20_000;
const CUSTOMERS = 50_000;
const KINDS = ['view', 'view', 'view', 'click', 'read', 'basket', 'purchase', 'rating'];

interface RunResult {
  rows: number;
  added: number;
  seconds: number;
  cpuSeconds: number;
  mainCpuSeconds: number;
  rssMb: number;
  loadBefore: number;
  loadAfter: number;
}

async function writeLines(file: string, header: string, n: number, line: (i: number) => string): Promise<void> {
  const out = fs.createWriteStream(file);
  out.write(`${header}\n`);
  let buf = '';
  for (let i = 0; i < n; i++) {
    buf += `${line(i)}\n`;
    if (buf.length > 1 << 20) {
      if (!out.write(buf)) await new Promise<void>((r) => out.once('drain', () => r()));
      buf = '';
    }
  }
  await new Promise<void>((resolve, reject) => out.end(buf, () => resolve()).on('error', reject));
}

/** One run, in a child process: catalogue and customers first, then the timed signal import. */
/** CPU seconds of this process's main thread so far (fields 14 and 15 of its /proc stat line; proc(5)). */
function mainThreadCpu(): number {
  const stat = fs.readFileSync(`/proc/self/task/${process.pid}/stat`, 'utf8');
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' '); // from field 3 on (the name may hold spaces)
  return (Number(fields[11]) + Number(fields[12])) / TICKS;
}

async function child(dir: string, run: string, mode: string): Promise<void> {
  const ws = path.join(dir, `run-${run}.shelf`);
  const db = openWorkspace(ws);
  await importFile(db, { target: 'items', file: path.join(dir, 'items.csv') });
  await importFile(db, { target: 'customers', file: path.join(dir, 'customers.csv') });
  const loadBefore = os.loadavg()[0]!;
  const started = performance.now();
  const cpu0 = process.cpuUsage();
  const main0 = mainThreadCpu();
  const r = await runImport(db, { target: 'signals', file: path.join(dir, 'signals.csv'), parseThread: mode === 'thread' });
  const seconds = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpu0);
  const mainCpuSeconds = mainThreadCpu() - main0;
  if (!r.committed || r.rows !== SIGNALS) throw new Error(`benchmark import failed: ${JSON.stringify(r).slice(0, 500)}`);
  db.close();
  const result: RunResult = {
    rows: r.rows,
    added: r.added,
    seconds,
    cpuSeconds: (cpu.user + cpu.system) / 1e6,
    mainCpuSeconds,
    rssMb: process.resourceUsage().maxRSS / 1024, // maxRSS is in kilobytes (Node docs, process.resourceUsage)
    loadBefore,
    loadAfter: os.loadavg()[0]!,
  };
  process.stdout.write(JSON.stringify(result));
}

/** One append-scenario run, in a child process: copy the prepared workspace, then the timed import. */
async function appendChild(dir: string, run: string, mode: string): Promise<void> {
  const ws = path.join(dir, `run-${run}.shelf`);
  fs.copyFileSync(path.join(dir, mode === 'bulk' ? 'empty.shelf' : 'demo.shelf'), ws);
  const db = openWorkspace(ws);
  const before = db.prepare('SELECT count(*) FROM signal').pluck().get() as number;
  const loadBefore = os.loadavg()[0]!;
  const started = performance.now();
  const cpu0 = process.cpuUsage();
  const main0 = mainThreadCpu();
  const r = await runImport(db, { target: 'signals', file: path.join(dir, 'append.csv'), ...(mode === 'upsert' && { appendPath: 'upsert' as const }) });
  const seconds = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpu0);
  const mainCpuSeconds = mainThreadCpu() - main0;
  if (!r.committed || r.rows !== SIGNALS) throw new Error(`benchmark import failed: ${JSON.stringify(r).slice(0, 500)}`);
  db.close();
  for (const suffix of ['', '-wal', '-shm']) fs.rmSync(`${ws}${suffix}`, { force: true });
  const result: RunResult & { before: number } = {
    before,
    rows: r.rows,
    added: r.added,
    seconds,
    cpuSeconds: (cpu.user + cpu.system) / 1e6,
    mainCpuSeconds,
    rssMb: process.resourceUsage().maxRSS / 1024,
    loadBefore,
    loadAfter: os.loadavg()[0]!,
  };
  process.stdout.write(JSON.stringify(result));
}

/** The append scenario (see the header): demo shop once, then alternating timed runs per mode. */
async function appendMain(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-append-'));
  try {
    const demo = path.join(dir, 'demo.shelf');
    await buildDemoWorkspace(demo, { train: false });
    const db = openWorkspace(demo);
    const items = db.prepare('SELECT external_id FROM item ORDER BY id').pluck().all() as string[];
    const customers = db.prepare('SELECT external_id FROM customer ORDER BY id').pluck().all() as string[];
    const last = db.prepare('SELECT max(at) FROM signal').pluck().get() as number;
    const stored = db.prepare('SELECT count(*) FROM signal').pluck().get() as number;
    db.close();
    fs.copyFileSync(demo, path.join(dir, 'empty.shelf'));
    const empty = openWorkspace(path.join(dir, 'empty.shelf'));
    empty.exec('DELETE FROM signal');
    empty.exec('VACUUM');
    empty.close();
    const rng = seededRng(11);
    // New days of the same shop's log: its customers and items, popularity skewed (squared uniform), after its last signal.
    await writeLines(path.join(dir, 'append.csv'), 'customer,item,kind,value,at', SIGNALS, (i) => {
      const item = items[Math.floor(rng.next() * rng.next() * items.length)]!;
      const at = new Date(last + 1000 + i * 20_000 + rng.int(10) * 1000).toISOString().replace('.000', '');
      return `${customers[rng.int(customers.length)]},${item},${KINDS[i % KINDS.length]},1,${at}`;
    });
    console.log(`append scenario: ${SIGNALS} signals into the demo shop (${stored} signals, ${items.length} items, ${customers.length} customers) vs into the same shop emptied of signals`);
    const modes = ['bulk', 'append', ...(process.env.BENCH_UPSERT === '1' ? ['upsert'] : [])];
    const self = fileURLToPath(import.meta.url);
    const runs = new Map<string, RunResult[]>(modes.map((m) => [m, []]));
    for (let run = 0; run < RUNS; run++) {
      for (const mode of modes) {
        const out = execFileSync(process.execPath, [...process.execArgv, self, 'append-child', dir, `${mode}${run}`, mode], { encoding: 'utf8', maxBuffer: 1 << 20 });
        const r = JSON.parse(out) as RunResult & { before: number };
        runs.get(mode)!.push(r);
        console.log(
          `${mode} run ${run + 1}: ${r.rows} rows into ${r.before} (${r.added} added) in ${r.seconds.toFixed(2)} s = ${Math.round(r.rows / r.seconds)} rows/s; ` +
            `${r.cpuSeconds.toFixed(2)} CPU s = ${Math.round(r.rows / r.cpuSeconds)} rows/CPU-s; peak RSS ${r.rssMb.toFixed(0)} MB; ` +
            `load ${r.loadBefore.toFixed(1)} -> ${r.loadAfter.toFixed(1)}`,
        );
      }
    }
    const medians = new Map<string, { rate: number; cpuRate: number }>();
    for (const [mode, rs] of runs) {
      const median = (f: (r: RunResult) => number) => rs.map(f).sort((a, b) => a - b)[Math.floor(rs.length / 2)]!;
      const m = { rate: median((r) => r.rows / r.seconds), cpuRate: median((r) => r.rows / r.cpuSeconds) };
      medians.set(mode, m);
      console.log(
        `${mode}, median of ${RUNS}: ${Math.round(m.rate)} rows/s wall, ${Math.round(m.cpuRate)} rows/CPU-s, ` +
          `peak RSS ${median((r) => r.rssMb).toFixed(0)} MB, load ${median((r) => r.loadAfter).toFixed(1)} on ${os.cpus().length} cores`,
      );
    }
    const bulk = medians.get('bulk')!;
    for (const mode of modes.filter((m) => m !== 'bulk')) {
      const m = medians.get(mode)!;
      console.log(`${mode} / bulk: ${(m.rate / bulk.rate).toFixed(2)}x by wall time, ${(m.cpuRate / bulk.cpuRate).toFixed(2)}x by CPU time (target >= 0.8)`);
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

async function main(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-'));
  try {
    const rng = seededRng(7);
    const t0 = Date.UTC(2025, 0, 1);
    await writeLines(path.join(dir, 'items.csv'), 'id,title,category,price', ITEMS, (i) => `i${i},Item ${i},cat${i % 40},${(i % 97) + 0.5}`);
    await writeLines(path.join(dir, 'customers.csv'), 'id,region', CUSTOMERS, (i) => `c${i},r${i % 7}`);
    // Popularity skewed towards low item numbers (squared uniform), as real catalogues are.
    await writeLines(path.join(dir, 'signals.csv'), 'customer,item,kind,value,at', SIGNALS, (i) => {
      const item = Math.floor(rng.next() * rng.next() * ITEMS);
      // Whole seconds with Z, the demo generator's form (2026-03-14T09:26:53Z), in time order as logs are.
      const at = new Date(t0 + i * 20_000 + rng.int(10) * 1000).toISOString().replace('.000', '');
      return `c${rng.int(CUSTOMERS)},i${item},${KINDS[i % KINDS.length]},1,${at}`;
    });
    const self = fileURLToPath(import.meta.url);
    const runs = new Map<string, RunResult[]>(MODES.map((m) => [m, []]));
    for (let run = 0; run < RUNS; run++) {
      for (const mode of MODES) {
        const out = execFileSync(process.execPath, [...process.execArgv, self, 'child', dir, `${mode}${run}`, mode], { encoding: 'utf8' });
        const r = JSON.parse(out) as RunResult;
        runs.get(mode)!.push(r);
        console.log(
          `${mode} run ${run + 1}: ${r.rows} rows (${r.added} added) in ${r.seconds.toFixed(2)} s = ${Math.round(r.rows / r.seconds)} rows/s; ` +
            `${r.cpuSeconds.toFixed(2)} CPU s (main thread ${r.mainCpuSeconds.toFixed(2)}) = ${Math.round(r.rows / r.cpuSeconds)} rows/CPU-s; ` +
            `peak RSS ${r.rssMb.toFixed(0)} MB; load ${r.loadBefore.toFixed(1)} -> ${r.loadAfter.toFixed(1)}`,
        );
      }
    }
    for (const [mode, rs] of runs) {
      const median = (f: (r: RunResult) => number) => rs.map(f).sort((a, b) => a - b)[Math.floor(rs.length / 2)]!;
      console.log(
        `${mode}, median of ${RUNS}: ${Math.round(median((r) => r.rows / r.seconds))} rows/s wall (target >= 200000), ` +
          `${median((r) => r.cpuSeconds).toFixed(2)} CPU s (main thread ${median((r) => r.mainCpuSeconds).toFixed(2)}) = ` +
          `${Math.round(median((r) => r.rows / r.cpuSeconds))} rows/CPU-s, peak RSS ${median((r) => r.rssMb).toFixed(0)} MB (target < 500), ` +
          `load ${median((r) => r.loadAfter).toFixed(1)} on ${os.cpus().length} cores`,
      );
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === 'child') await child(process.argv[3]!, process.argv[4]!, process.argv[5]!);
else if (process.argv[2] === 'append-child') await appendChild(process.argv[3]!, process.argv[4]!, process.argv[5]!);
else {
  const scenario = process.env.BENCH_SCENARIO ?? 'both';
  if (scenario === 'bulk' || scenario === 'both') await main();
  if (scenario === 'append' || scenario === 'both') await appendMain();
}
