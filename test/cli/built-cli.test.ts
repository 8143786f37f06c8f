import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { staleReason } from '../../bin/launch.js';
import { StringIdTable } from '../../src-main/core/util/string-id-table.ts';
import { readSignals } from '../../src-main/ingest/signal-read.ts';
import type { SignalThreadData, SignalThreadMessage } from '../../src-main/ingest/signal-thread.ts';
import type { SignalBatch } from '../../src-main/store/catalogue-writes.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { handPng } from '../ingest/png.ts';
import { capture } from './capture.ts';
import { importSmallShop } from './small-shop.ts';

/**
 * The command line as `npm install` builds it (dist-node/, scripts/build-node.mjs) must do what the sources
 * do: the same help, the same answers, and task threads that start from the bundle's own worker files. The
 * reference is the source CLI itself, run in this process (a build that changed behaviour would differ).
 */
const ROOT = path.resolve(import.meta.dirname, '../..');
const BIN = path.join(ROOT, 'bin/shelfwright.js');
const DIST = path.join(ROOT, 'dist-node');

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** bin/shelfwright.js as a user runs it: without the test suite's SHELFWRIGHT_FROM_SOURCE. */
function runBuilt(args: string[]): Promise<Run> {
  const env = { ...process.env };
  delete env['SHELFWRIGHT_FROM_SOURCE'];
  const child = spawn(process.execPath, [BIN, ...args], { cwd: os.tmpdir(), env, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
  child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
  return new Promise((resolve) => child.on('close', (code) => resolve({ code, stdout, stderr })));
}

function runBuildScript(args: string[]): Promise<number | null> {
  const child = spawn(process.execPath, [path.join(ROOT, 'scripts/build-node.mjs'), ...args], { cwd: ROOT, stdio: 'ignore' });
  return new Promise((resolve) => child.on('close', (code) => resolve(code)));
}

/** What the source CLI prints for `args`, as the process entry (run.ts) writes it. */
async function fromSource(args: string[]): Promise<{ code: number; stdout: string }> {
  const io = capture();
  const code = await main(args, io, {});
  return { code, stdout: io.stdout.map((t) => (t.endsWith('\n') ? t : `${t}\n`)).join('') };
}

let dir: string;
let ws: string;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-built-cli-'));
  ws = path.join(dir, 'shop.sqlite');
  // The prepared build when it is up to date, else a fresh one (what `npm run build:node` does). It stays
  // inside the project: the bundle finds better-sqlite3 in node_modules from where it lies.
  if (staleReason(DIST) !== null) expect(await runBuildScript([])).toBe(0);
  expect(staleReason(DIST)).toBeNull();
  await importSmallShop(ws, path.join(dir, 'shop'), 5);
});

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('the built command line (dist-node)', () => {
  it('prints the same --help as the sources, with no note about running from sources', async () => {
    const built = await runBuilt(['--help']);
    expect(built.stderr).toBe('');
    expect(built.code).toBe(0);
    const source = await fromSource(['--help']);
    expect(built.stdout).toBe(source.stdout);
    expect(built.stdout).toMatch(/^usage: shelfwright <command>/m);
  });

  it('answers info on a workspace as the sources do', async () => {
    const built = await runBuilt(['info', '-w', ws, '--json']);
    expect(built.stderr).toBe('');
    expect(built.code).toBe(0);
    expect(JSON.parse(built.stdout)).toEqual(JSON.parse((await fromSource(['info', '-w', ws, '--json'])).stdout));
    expect(JSON.parse(built.stdout)).toMatchObject({ file: ws });
  });

  it('imports items with a picture: sharp, a native addon, is loaded from node_modules, not bundled', async () => {
    const bundles = fs.readdirSync(DIST).filter((f) => f.endsWith('.js')).map((f) => fs.readFileSync(path.join(DIST, f), 'utf8'));
    // Loaded on first use (a dynamic import, so other commands start without it), never inlined.
    expect(bundles.some((b) => /import\("sharp"\)/.test(b))).toBe(true);
    expect(bundles.some((b) => /node_modules\/sharp\//.test(b))).toBe(false);
    fs.writeFileSync(path.join(dir, 'lamp.png'), handPng(120, 60, () => [200, 160, 40]));
    const file = path.join(dir, 'pictured.csv');
    fs.writeFileSync(file, 'id,title,image\np1,Moss Lantern,lamp.png\n');
    const built = await runBuilt(['import', 'items', file, '-w', path.join(dir, 'pictured.sqlite'), '--json']);
    expect(built.code, built.stderr).toBe(0);
    expect(JSON.parse(built.stdout)).toMatchObject({ committed: true, pictures: { named: 1, ready: 1, made: 1 } });
  });

  it('trains and evaluates with task threads started from the bundle', async () => {
    // Every model (train-worker, ease-worker, and ials-worker when a second core is there), then the offline evaluation
    // (offline-worker): each thread is a dist-node/<name>.js file, so a missing or broken one fails the run.
    for (const name of ['train-worker', 'ease-worker', 'ials-worker', 'offline-worker', 'signal-worker']) {
      expect(fs.existsSync(path.join(DIST, `${name}.js`)), name).toBe(true);
    }
    const train = await runBuilt(['train', '-w', ws, '--iterations', '3', '--json']);
    expect(train.code, train.stderr).toBe(0);
    const trained = JSON.parse(train.stdout) as { models: { kind: string }[] };
    expect(trained.models.map((m) => m.kind).sort()).toEqual(['content', 'ease', 'ials', 'itemknn', 'popularity']);
    const evaluate = await runBuilt(['evaluate', '-w', ws, '--json']);
    expect(evaluate.code, evaluate.stderr).toBe(0);
    expect(evaluate.stdout).toMatch(/ndcg/i);
  });
});

describe('the built signal-parsing thread (dist-node/signal-worker.js)', () => {
  it('parses a signal file into the same batches and report as the source readSignals', async () => {
    // Imports pick this thread only for files of 64 MiB or more, too big for a test: started directly here.
    const file = path.join(dir, 'signals.csv');
    const rows = ['customer,item,kind,value,at', 'r1,b0,view,1,1700000000', 'r2,b1,purchase,2,1700000100', 'r1,b9,view,1,1700000200', 'r2,b2,cart,1,1700000300'];
    fs.writeFileSync(file, `${rows.join('\n')}\n`);
    const options = { file, format: 'csv' as const, createCustomers: false };
    const items = { keys: ['b0', 'b1', 'b2'], ids: [1, 2, 3] };
    const customers = { keys: ['r1', 'r2'], ids: [1, 2] };
    const unwritten = new Int32Array(new SharedArrayBuffer(4));
    const data: SignalThreadData = { options, items, customers, nextCustomerId: 3, unwritten: unwritten.buffer as SharedArrayBuffer };
    const worker = new Worker(pathToFileURL(path.join(DIST, 'signal-worker.js')), { workerData: data });
    const batches: SignalBatch[] = [];
    const result = await new Promise<unknown>((resolve, reject) => {
      worker.on('message', (m: SignalThreadMessage) => {
        if (m.type === 'batch') {
          batches.push(m.batch);
          Atomics.sub(unwritten, 0, 1);
          Atomics.notify(unwritten, 0);
        } else if (m.type === 'done') resolve(m.result);
        else reject(new Error(m.error.message));
      });
      worker.on('error', reject);
    });
    await worker.terminate();
    const ids = { items: StringIdTable.from(items.keys, items.ids), customers: StringIdTable.from(customers.keys, customers.ids), nextCustomerId: 3 };
    const expected: SignalBatch[] = [];
    const reference = await readSignals(options, ids, (b) => expected.push(b), true);
    expect(result).toEqual(reference);
    expect(batches).toEqual(expected);
    expect(reference).toMatchObject({ rows: 4, valid: 3, rejected: 1 }); // b9 is no known item
  });
});

describe('whether the build is up to date (bin/launch.js)', () => {
  it('refuses a missing build and one older than the sources, accepts a newer one', () => {
    const fake = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-stale-'));
    try {
      expect(staleReason(fake)).toBe('the command line is not built');
      fs.writeFileSync(path.join(fake, 'built.json'), JSON.stringify({ started: 0 }));
      expect(staleReason(fake)).toBe('sources changed since the last build');
      fs.writeFileSync(path.join(fake, 'built.json'), JSON.stringify({ started: Date.now() + 86_400_000 }));
      expect(staleReason(fake)).toBeNull();
    } finally {
      fs.rmSync(fake, { recursive: true, force: true });
    }
  });
});
