/**
 * Import benchmark (DESIGN.md target: >= 200,000 signal rows/s, peak memory < 500 MB for 1M rows).
 * Writes 1,000,000 signals plus the items and customers they name to a temp CSV, then imports them into a
 * fresh temp workspace RUNS times, each run in its own child process so its peak RSS is the import's own.
 * Prints per run and as medians: rows/s of wall time, CPU seconds (process.cpuUsage: every thread, SQLite's
 * included) and rows per CPU-second, peak RSS, and the machine's 1-minute load average before and after
 * the run: on a shared machine the wall clock also counts time spent waiting for a core, so read the rate
 * against the load. Run: npm run bench:import (BENCH_SIGNALS and BENCH_RUNS override the size and runs).
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { seededRng } from '../src-main/core/rng.ts';
import { importFile } from '../src-main/services/import.ts';
import { openWorkspace } from '../src-main/store/workspace.ts';

const SIGNALS = Number(process.env.BENCH_SIGNALS ?? 1_000_000);
const RUNS = Number(process.env.BENCH_RUNS ?? 3);
const ITEMS = 20_000;
const CUSTOMERS = 50_000;
const KINDS = ['view', 'view', 'view', 'click', 'read', 'basket', 'purchase', 'rating'];

interface RunResult {
  rows: number;
  added: number;
  seconds: number;
  cpuSeconds: number;
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
async function child(dir: string, run: number): Promise<void> {
  const ws = path.join(dir, `run${run}.shelf`);
  const db = openWorkspace(ws);
  await importFile(db, { target: 'items', file: path.join(dir, 'items.csv') });
  await importFile(db, { target: 'customers', file: path.join(dir, 'customers.csv') });
  const loadBefore = os.loadavg()[0]!;
  const started = performance.now();
  const cpu0 = process.cpuUsage();
  const r = await importFile(db, { target: 'signals', file: path.join(dir, 'signals.csv') });
  const seconds = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpu0);
  if (!r.committed || r.rows !== SIGNALS) throw new Error(`benchmark import failed: ${JSON.stringify(r).slice(0, 500)}`);
  db.close();
  const result: RunResult = {
    rows: r.rows,
    added: r.added,
    seconds,
    cpuSeconds: (cpu.user + cpu.system) / 1e6,
    rssMb: process.resourceUsage().maxRSS / 1024, // maxRSS is in kilobytes (Node docs, process.resourceUsage)
    loadBefore,
    loadAfter: os.loadavg()[0]!,
  };
  process.stdout.write(JSON.stringify(result));
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
    const runs: RunResult[] = [];
    for (let run = 0; run < RUNS; run++) {
      const out = execFileSync(process.execPath, [...process.execArgv, self, 'child', dir, String(run)], { encoding: 'utf8' });
      const r = JSON.parse(out) as RunResult;
      runs.push(r);
      console.log(
        `run ${run + 1}: ${r.rows} rows (${r.added} added) in ${r.seconds.toFixed(2)} s = ${Math.round(r.rows / r.seconds)} rows/s; ` +
          `${r.cpuSeconds.toFixed(2)} CPU s = ${Math.round(r.rows / r.cpuSeconds)} rows/CPU-s; peak RSS ${r.rssMb.toFixed(0)} MB; ` +
          `load ${r.loadBefore.toFixed(1)} -> ${r.loadAfter.toFixed(1)}`,
      );
    }
    const median = (f: (r: RunResult) => number) => runs.map(f).sort((a, b) => a - b)[Math.floor(runs.length / 2)]!;
    console.log(
      `median of ${RUNS}: ${Math.round(median((r) => r.rows / r.seconds))} rows/s wall (target >= 200000), ` +
        `${median((r) => r.cpuSeconds).toFixed(2)} CPU s = ${Math.round(median((r) => r.rows / r.cpuSeconds))} rows/CPU-s, ` +
        `peak RSS ${median((r) => r.rssMb).toFixed(0)} MB (target < 500), load ${median((r) => r.loadAfter).toFixed(1)} on ${os.cpus().length} cores`,
    );
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[2] === 'child') await child(process.argv[3]!, Number(process.argv[4]));
else await main();
