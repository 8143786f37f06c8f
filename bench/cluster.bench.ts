/**
 * `npm run bench:cluster` (issue 13): a 1,000,000-item × 64-factor Spark ALS model imports in bounded memory
 * and scores one customer over the whole catalogue in < 50 ms.
 *
 * Setup (this process): a workspace of BENCH_ITEMS items (default 1,000,000), 2,000 customers and 5 signals
 * each, exported with `export signals`; DuckDB then writes the model folder in Spark's layout (as the tests'
 * fixtures do: an independent Parquet writer, snappy, DuckDB's own row groups). Each import and the scoring run
 * in a fresh child process, so its peak RSS (getrusage maxrss) is its own. Medians over BENCH_RUNS (3) imports
 * and 31 scorings; the load average is printed, since the machine is shared.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const here = fileURLToPath(import.meta.url);
const root = path.resolve(path.dirname(here), '..');
const arg = (name: string) => process.argv.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3);
const K = 64;

async function importPhase(ws: string, dir: string): Promise<void> {
  const { openWorkspace } = await import('../src-main/store/workspace.ts');
  const { importModel } = await import('../src-main/services/cluster/import-model.ts');
  const db = openWorkspace(ws);
  const t = performance.now();
  const r = await importModel(db, dir);
  const wallMs = performance.now() - t;
  db.close();
  const { peakRssMb, ...times } = r.timings;
  console.log(JSON.stringify({ wallMs, maxRssMb: process.resourceUsage().maxRSS / 1024, ...times, afterIds: peakRssMb.ids, afterFactors: peakRssMb.factors, afterStore: peakRssMb.stored }));
}

async function scorePhase(ws: string): Promise<void> {
  const { openWorkspace } = await import('../src-main/store/workspace.ts');
  const { ModelRepo } = await import('../src-main/store/models.ts');
  const { loadIals } = await import('../src-main/core/models/ials.ts');
  const db = openWorkspace(ws);
  const t0 = performance.now();
  const model = loadIals(new ModelRepo(db).loadCurrent('ials')!.bytes);
  const loadMs = performance.now() - t0;
  const out = new Float32Array(model.itemCount);
  const empty = { rows: 0, cols: model.itemCount, indptr: Int32Array.of(0), indices: new Int32Array(0), data: new Float32Array(0) };
  const times: number[] = [];
  const cpu: number[] = [];
  let check = 0;
  for (let r = 0; r < 31; r++) {
    const t = performance.now();
    const c = process.cpuUsage();
    model.scoreInto(r % model.customerCount, empty, out);
    const used = process.cpuUsage(c);
    times.push(performance.now() - t);
    cpu.push((used.user + used.system) / 1000);
    check += out[r]!;
  }
  times.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  db.close();
  console.log(JSON.stringify({ loadMs, medianMs: times[15], cpuMedianMs: cpu[15], minMs: times[0], maxMs: times[30], items: model.itemCount, maxRssMb: process.resourceUsage().maxRSS / 1024, check }));
}

function child(phase: string, extra: string[]): Record<string, number> {
  const r = spawnSync(path.join(root, 'node_modules/.bin/tsx'), [here, `--phase=${phase}`, ...extra], { encoding: 'utf8', maxBuffer: 1 << 24 });
  if (r.status !== 0) throw new Error(`${phase} failed: ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!) as Record<string, number>;
}

async function setup(dir: string, items: number, customers: number): Promise<{ ws: string; model: string }> {
  const { openWorkspace } = await import('../src-main/store/workspace.ts');
  const { exportSignals } = await import('../src-main/services/cluster/export-signals.ts');
  const { DuckDBInstance } = await import('@duckdb/node-api');
  const ws = path.join(dir, 'shop.sqlite');
  const db = openWorkspace(ws);
  const t = performance.now();
  db.transaction(() => {
    const item = db.prepare("INSERT INTO item (id, external_id, title, description, category, tags, supplier, price, added_at) VALUES (?, ?, ?, '', 'c', '[]', 's', 1, 1700000000000)");
    for (let i = 1; i <= items; i++) item.run(i, `it-${i}`, `item ${i}`);
    const cust = db.prepare('INSERT INTO customer (id, external_id) VALUES (?, ?)');
    const sig = db.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (?, ?, (SELECT code FROM signal_kind WHERE name = 'view'), 1, ?)");
    for (let c = 1; c <= customers; c++) {
      cust.run(c, `cu-${c}`);
      for (let s = 0; s < 5; s++) sig.run(c, 1 + ((c * 7919 + s * 104729) % items), 1_710_000_000_000 + c * 1000 + s);
    }
  })();
  const out = path.join(dir, 'export');
  exportSignals(db, out);
  db.close();
  const c = await (await DuckDBInstance.create(':memory:')).connect();
  const model = path.join(out, 'model');
  await c.run('SELECT setseed(0.42)'); // random factors, as a fit's are: no dictionary or run-length gains
  for (const [side, n] of [['itemFactors', items], ['userFactors', customers]] as const) {
    fs.mkdirSync(path.join(model, side), { recursive: true });
    await c.run(
      `COPY (SELECT i::INTEGER AS id, list_transform(range(${K}), f -> (random() - 0.5)::FLOAT) AS features FROM range(${n}) t(i))
       TO '${path.join(model, side, 'part-00000-bench-c000.snappy.parquet')}' (FORMAT parquet, COMPRESSION snappy)`,
    );
  }
  fs.mkdirSync(path.join(model, 'metadata'));
  fs.writeFileSync(
    path.join(model, 'metadata', 'part-00000'),
    `${JSON.stringify({ class: 'org.apache.spark.ml.recommendation.ALSModel', timestamp: Date.now(), sparkVersion: '3.5.1', uid: 'ALS_bench', paramMap: { implicitPrefs: true, rank: K, regParam: 0.01, alpha: 10 }, defaultParamMap: { maxIter: 10 }, rank: K })}\n`,
  );
  console.log(`setup: ${items.toLocaleString('en')} items, ${customers.toLocaleString('en')} customers, exported and model written in ${((performance.now() - t) / 1000).toFixed(1)} s`);
  const size = fs.statSync(path.join(model, 'itemFactors', 'part-00000-bench-c000.snappy.parquet')).size;
  console.log(`itemFactors part file: ${(size / 1e6).toFixed(0)} MB (DuckDB, snappy)`);
  return { ws, model };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

async function mainBench(): Promise<void> {
  const items = Number(process.env.BENCH_ITEMS ?? 1_000_000);
  const runs = Number(process.env.BENCH_RUNS ?? 3);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-bench-cluster-'));
  try {
    const { ws, model } = await setup(dir, items, 2000);
    if (process.env.BENCH_KEEP) console.log(`workspace ${ws}, model ${model}`);
    const imports = Array.from({ length: runs }, () => child('import', [`--ws=${ws}`, `--dir=${model}`]));
    imports.forEach((r, q) =>
      console.log(
        `import ${q + 1}: ${(r.wallMs! / 1000).toFixed(2)} s wall (read ${(r.readMs! / 1000).toFixed(2)} s, fold-in ${(r.foldMs! / 1000).toFixed(2)} s, store ${(r.saveMs! / 1000).toFixed(2)} s), peak RSS ${r.maxRssMb!.toFixed(0)} MB (after ids ${r.afterIds!.toFixed(0)}, after factors ${r.afterFactors!.toFixed(0)}, after storing ${r.afterStore!.toFixed(0)})`,
      ),
    );
    const score = child('score', [`--ws=${ws}`]);
    const factorMb = (items * K * 4) / 1e6;
    console.log(`import of ${items.toLocaleString('en')} × ${K} factors (${factorMb.toFixed(0)} MB as float32): median ${(median(imports.map((r) => r.wallMs!)) / 1000).toFixed(2)} s, peak RSS median ${median(imports.map((r) => r.maxRssMb!)).toFixed(0)} MB`);
    console.log(`score one customer over ${score.items!.toLocaleString('en')} items: median ${score.medianMs!.toFixed(1)} ms wall, ${score.cpuMedianMs!.toFixed(1)} ms CPU (wall min ${score.minMs!.toFixed(1)}, max ${score.maxMs!.toFixed(1)}) over 31 customers; model load ${score.loadMs!.toFixed(0)} ms; peak RSS ${score.maxRssMb!.toFixed(0)} MB (target < 50 ms)`);
    console.log(`load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')} on ${os.cpus().length} cores`);
  } finally {
    if (process.env.BENCH_KEEP) console.log(`kept ${dir}`);
    else fs.rmSync(dir, { recursive: true, force: true });
  }
}

const phase = arg('phase');
if (phase === 'import') await importPhase(arg('ws')!, arg('dir')!);
else if (phase === 'score') await scorePhase(arg('ws')!);
else await mainBench();
