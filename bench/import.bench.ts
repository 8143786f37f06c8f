/**
 * Import benchmark (DESIGN.md target: >= 200,000 signal rows/s, peak memory < 500 MB for 1M rows).
 * Writes 1,000,000 signals plus the items and customers they name to a temp CSV, imports them into a fresh
 * temp workspace three times and prints the median rate and the peak RSS. Run: npm run bench:import
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { seededRng } from '../src-main/core/rng.ts';
import { importFile } from '../src-main/services/import.ts';
import { openWorkspace } from '../src-main/store/workspace.ts';

const SIGNALS = Number(process.env.BENCH_SIGNALS ?? 1_000_000);
const ITEMS = 20_000;
const CUSTOMERS = 50_000;
const RUNS = 3;
const KINDS = ['view', 'view', 'view', 'click', 'read', 'basket', 'purchase', 'rating'];

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

async function main(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-'));
  try {
    const rng = seededRng(7);
    const t0 = Date.UTC(2025, 0, 1);
    const itemsCsv = path.join(dir, 'items.csv');
    const customersCsv = path.join(dir, 'customers.csv');
    const signalsCsv = path.join(dir, 'signals.csv');
    await writeLines(itemsCsv, 'id,title,category,price', ITEMS, (i) => `i${i},Item ${i},cat${i % 40},${(i % 97) + 0.5}`);
    await writeLines(customersCsv, 'id,region', CUSTOMERS, (i) => `c${i},r${i % 7}`);
    // Popularity skewed towards low item numbers (squared uniform), as real catalogues are.
    await writeLines(signalsCsv, 'customer,item,kind,value,at', SIGNALS, (i) => {
      const item = Math.floor(rng.next() * rng.next() * ITEMS);
      // Whole seconds with Z, the demo generator's form (2026-03-14T09:26:53Z), in time order as logs are.
      const at = new Date(t0 + i * 20_000 + rng.int(10) * 1000).toISOString().replace('.000', '');
      return `c${rng.int(CUSTOMERS)},i${item},${KINDS[i % KINDS.length]},1,${at}`;
    });
    const rates: number[] = [];
    const cpuRates: number[] = [];
    for (let run = 0; run < RUNS; run++) {
      const ws = path.join(dir, `run${run}.shelf`);
      const db = openWorkspace(ws);
      await importFile(db, { target: 'items', file: itemsCsv });
      await importFile(db, { target: 'customers', file: customersCsv });
      const started = performance.now();
      const cpu0 = process.cpuUsage();
      const r = await importFile(db, { target: 'signals', file: signalsCsv });
      const seconds = (performance.now() - started) / 1000;
      const cpu = process.cpuUsage(cpu0);
      // CPU seconds as well as wall time: on a shared machine the wall clock also counts time spent waiting
      // for a core; the import is single-threaded, so rows per CPU-second is what an idle core would see.
      const cpuSeconds = (cpu.user + cpu.system) / 1e6;
      cpuRates.push(r.rows / cpuSeconds);
      if (!r.committed || r.rows !== SIGNALS) throw new Error(`benchmark import failed: ${JSON.stringify(r).slice(0, 500)}`);
      rates.push(r.rows / seconds);
      console.log(`run ${run + 1}: ${r.rows} rows (${r.added} added) in ${seconds.toFixed(2)} s = ${Math.round(r.rows / seconds)} rows/s; ${cpuSeconds.toFixed(2)} CPU s = ${Math.round(r.rows / cpuSeconds)} rows/CPU-s`);
      db.close();
      for (const f of [ws, `${ws}-wal`, `${ws}-shm`]) fs.rmSync(f, { force: true });
    }
    rates.sort((a, b) => a - b);
    cpuRates.sort((a, b) => a - b);
    const peakMb = process.resourceUsage().maxRSS / 1024; // maxRSS is in kilobytes (Node docs, process.resourceUsage)
    console.log(`median: ${Math.round(rates[Math.floor(RUNS / 2)]!)} rows/s wall, ${Math.round(cpuRates[Math.floor(RUNS / 2)]!)} rows/CPU-s (target >= 200000)`);
    console.log(`load average at the end: ${os.loadavg()[0]!.toFixed(1)} on ${os.cpus().length} cores`);
    console.log(`peak RSS: ${peakMb.toFixed(0)} MB (target < 500)`);
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
