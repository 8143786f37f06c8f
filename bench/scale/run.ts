/**
 * `npm run bench:scale`: Shelfwright as a new user runs it on a large synthetic log (generate.ts: Zipf item
 * popularity, heavy-tailed histories and counts), one step at a time through the built command line, each
 * under /usr/bin/time -v (wall, user + system CPU, peak RSS):
 *   import items, import signals --kind purchase --create-customers, train (the default: tunes when the data
 *   changed), train --no-tune, evaluate, recommend for one customer, and the app's first screen plus a first
 *   shelf through the api the web shell serves (shell-open.ts).
 * Data and workspaces go to /tmp/sw-scale (never the repo). Prints a markdown table and writes its JSON beside.
 *   npm run bench:scale -- [--shape counts|wide|repeats] [--scale 0.1] [--steps items,signals,train,...] [--repeat 1]
 * Each step gets a fresh copy of the workspace it needs, so a repeat measures the same work. Steps run with
 * `nice -n 10`, one at a time (a shared machine).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { generate, SHAPES, type Shape } from './generate.ts';

const { values } = parseArgs({
  options: {
    shape: { type: 'string', default: 'counts' },
    scale: { type: 'string', default: '0.1' },
    steps: { type: 'string', default: 'items,signals,train,notune,evaluate,recommend,shell' },
    repeat: { type: 'string', default: '1' },
    seed: { type: 'string', default: '7' },
  },
});
const shape = values.shape as Shape;
if (!(shape in SHAPES)) throw new Error(`--shape must be one of ${Object.keys(SHAPES).join(', ')}`);
const steps = values.steps.split(',');
const repeat = Math.max(1, Number(values.repeat));
const root = path.resolve(import.meta.dirname, '../..');
const work = path.join('/tmp/sw-scale', `${shape}-${values.scale}`);
const cli = path.join(root, 'bin', 'shelfwright.js');

if (!fs.existsSync(path.join(work, 'signals.csv'))) {
  console.log(`generating ${shape} × ${values.scale} into ${work} ...`);
  generate(shape, Number(values.scale), Number(values.seed), work);
}
spawnSync('npm', ['run', 'build:node'], { cwd: root, stdio: 'inherit' });

interface Measure {
  step: string;
  wallS: number;
  cpuS: number;
  rssMB: number;
  ok: boolean;
  tail: string;
}

/** Runs one command under /usr/bin/time -v and nice; returns its figures and the last lines it printed. */
function timed(step: string, args: string[]): Measure {
  const timeFile = path.join(work, `time.${step}`);
  const r = spawnSync('/usr/bin/time', ['-v', '-o', timeFile, 'nice', '-n', '10', ...args], { cwd: root, encoding: 'utf8', maxBuffer: 1 << 28 });
  const t = fs.readFileSync(timeFile, 'utf8');
  const num = (re: RegExp) => Number(re.exec(t)?.[1] ?? NaN);
  const wall = /Elapsed \(wall clock\) time \(h:mm:ss or m:ss\): (?:(\d+):)?(\d+):([\d.]+)/.exec(t);
  const wallS = wall ? Number(wall[1] ?? 0) * 3600 + Number(wall[2]) * 60 + Number(wall[3]) : NaN;
  const out = `${r.stdout}\n${r.stderr}`.trim().split('\n');
  return {
    step,
    wallS,
    cpuS: num(/User time \(seconds\): ([\d.]+)/) + num(/System time \(seconds\): ([\d.]+)/),
    rssMB: num(/Maximum resident set size \(kbytes\): (\d+)/) / 1024,
    ok: r.status === 0,
    tail: out.slice(-3).join(' | '),
  };
}

const base = path.join(work, 'ws.sqlite');
const imported = path.join(work, 'imported.sqlite');
const trained = path.join(work, 'trained.sqlite');
const fresh = (from: string, to: string) => {
  for (const s of ['', '-wal', '-shm']) fs.rmSync(to + s, { force: true });
  fs.copyFileSync(from, to);
  return to;
};
const firstCustomer = () => fs.readFileSync(path.join(work, 'signals.csv'), 'utf8').slice(0, 4096).split('\n')[1]!.split(',')[0]!;

const results: Measure[] = [];
const loadBefore = os.loadavg();
for (let rep = 0; rep < repeat; rep++) {
  for (const step of steps) {
    let m: Measure;
    if (step === 'items') {
      for (const s of ['', '-wal', '-shm']) fs.rmSync(base + s, { force: true });
      m = timed(step, ['node', cli, 'import', 'items', path.join(work, 'items.csv'), '-w', base]);
    } else if (step === 'signals') {
      m = timed(step, ['node', cli, 'import', 'signals', path.join(work, 'signals.csv'), ...(SHAPES[shape].counts ? ['--kind', 'purchase'] : ['--kind', 'view']), '--create-customers', '-w', base]);
      fs.copyFileSync(base, imported);
    } else if (step === 'train') {
      m = timed(step, ['node', cli, 'train', '-w', fresh(imported, path.join(work, 'train.sqlite'))]);
    } else if (step === 'notune') {
      m = timed('train --no-tune', ['node', cli, 'train', '--no-tune', '-w', fresh(imported, trained)]);
    } else if (step === 'evaluate') {
      m = timed(step, ['node', cli, 'evaluate', '-w', fresh(trained, path.join(work, 'eval.sqlite'))]);
    } else if (step === 'recommend') {
      const list = path.join(work, 'one-customer.txt');
      fs.writeFileSync(list, `${firstCustomer()}\n`);
      m = timed('recommend (1 customer)', ['node', cli, 'recommend', '--customers', list, '--top', '20', '--out', path.join(work, 'top20.csv'), '-w', trained]);
    } else if (step === 'shell') {
      m = timed('open the app + first shelf', ['npx', 'tsx', path.join(root, 'bench/scale/shell-open.ts'), fresh(trained, path.join(work, 'shell.sqlite'))]);
    } else throw new Error(`unknown step ${step}`);
    results.push(m);
    console.log(`${m.step}: ${m.ok ? '' : 'FAILED '}${m.wallS.toFixed(1)} s wall, ${m.cpuS.toFixed(1)} CPU-s, ${m.rssMB.toFixed(0)} MB peak | ${m.tail}`);
  }
}
const loadAfter = os.loadavg();

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
};
const names = [...new Set(results.map((r) => r.step))];
console.log(`\n${shape} × ${values.scale}; load average ${loadBefore[0]!.toFixed(1)} before, ${loadAfter[0]!.toFixed(1)} after; medians of ${repeat}`);
console.log('| step | wall s | CPU s | peak RSS MB |\n| --- | --- | --- | --- |');
for (const n of names) {
  const rs = results.filter((r) => r.step === n);
  console.log(`| ${n}${rs.every((r) => r.ok) ? '' : ' (failed)'} | ${median(rs.map((r) => r.wallS)).toFixed(1)} | ${median(rs.map((r) => r.cpuS)).toFixed(1)} | ${median(rs.map((r) => r.rssMB)).toFixed(0)} |`);
}
fs.writeFileSync(path.join(work, 'bench.json'), JSON.stringify({ shape, scale: values.scale, loadBefore, loadAfter, results }, null, 2));
