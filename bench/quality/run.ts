/**
 * Quality benchmark on real data (issue 10 item 8): `npm run bench:quality [-- options]`.
 *
 * Reads the import files bench/quality/prepare.py makes from the UCI Online Retail log, or prepare_movielens.py
 * from MovieLens 100K (see bench/quality/README.md): items.csv, train.csv (signals before the split time),
 * test.csv (held-out pairs), split.json (whose `dataset` names the data in the table's title).
 * Ours: both files are imported into a temporary workspace through the `shelfwright` command (the real import
 * path), trained once with `train --tune --k K` and once with plain `train`, and scored with
 * `evaluate --holdout test.csv --k K` (every model, the hybrid, a random baseline; items the customer has in
 * training are never ranked). Reference: bench/quality/reference.py over numpy/scipy on the same three files,
 * tuned on the same kind of validation split. The two metric implementations are cross-checked on the
 * reference's ranked lists. Prints the side-by-side table; writes bench/out/quality.{json,txt}.
 *
 * Options: --data DIR (default $SHELFWRIGHT_QUALITY_DATA, else /work/data/online-retail/shelfwright),
 * --k K (default 20), --skip-reference, --skip-plain, --skip-tuned, --quick (the reference's small grids),
 * --keep (keep the temporary workspaces and print where they are), --root DIR (measure the `shelfwright` of another
 * checkout, e.g. a teammate's worktree, with this harness; results go to DIR/bench/out), --reference-from DIR
 * (reuse reference.json and reference-lists.json of an earlier run instead of running the reference again).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { cli, findPython, ROOT, run } from './children.ts';
import { checkMetrics, type ReferenceLists } from './metric-check.ts';
import { oursPerCustomer, referencePerCustomer } from './paired.ts';
import { qualityTable, type Metrics } from './table.ts';

const args = process.argv.slice(2);
const flag = (name: string) => args.includes(`--${name}`);
const option = (name: string): string | undefined => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? args[i + 1] : undefined;
};
const k = Number(option('k') ?? 20);
const data = path.resolve(option('data') ?? process.env.SHELFWRIGHT_QUALITY_DATA ?? '/work/data/online-retail/shelfwright');
/** The checkout whose `shelfwright` is measured (default this one); results go to its bench/out. */
const root = path.resolve(option('root') ?? ROOT);
const out = path.join(root, 'bench', 'out');

for (const f of ['items.csv', 'train.csv', 'test.csv']) {
  if (!fs.existsSync(path.join(data, f))) {
    console.error(`${path.join(data, f)} is missing: make the import files first (bench/quality/README.md), or pass --data DIR`);
    process.exit(1);
  }
}
/** The data set's name for the table's title: split.json's `dataset` (prepare.py and prepare_movielens.py write it). */
function datasetName(): string {
  const file = path.join(data, 'split.json');
  if (!fs.existsSync(file)) return 'unnamed data (no split.json)';
  const name = (JSON.parse(fs.readFileSync(file, 'utf8')) as { dataset?: unknown }).dataset;
  return typeof name === 'string' && name !== '' ? name : 'unnamed data (split.json names none)';
}
fs.mkdirSync(out, { recursive: true });
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-quality-'));
const say = (s: string) => console.log(`[${new Date().toISOString().slice(11, 19)}] ${s}`);
say(`measuring ${root}; data ${data}; K = ${k}; load average ${os.loadavg().map((x) => x.toFixed(1)).join(' ')} on ${os.availableParallelism()} cores`);

interface HoldoutAnswer {
  customers: number;
  pairs: number;
  models: { model: string; ndcg: number; recall: number }[];
  weightsFrom: string;
  perCustomer?: { customers: string[]; ndcg: Record<string, number[]> };
}
interface TrainAnswer {
  models: { kind: string; params: Record<string, unknown>; trainMs: number; tuning: { grid?: { best?: unknown } } | null }[];
}

async function ours(mode: 'tuned' | 'plain', base: string) {
  const ws = path.join(tmp, `${mode}.sqlite`);
  fs.copyFileSync(base, ws);
  const trainArgs = mode === 'tuned' ? ['train', '--tune', '--k', String(k)] : ['train'];
  const trained = await cli<TrainAnswer>(root, ws, trainArgs, path.join(out, `train-${mode}.log`));
  say(`ours, ${trainArgs.join(' ')}: ${(trained.ms / 1000).toFixed(1)} s`);
  const evaluated = await cli<HoldoutAnswer>(root, ws, ['evaluate', '--holdout', path.join(data, 'test.csv'), '--k', String(k), '--per-customer']);
  const metrics: Record<string, Metrics> = {};
  for (const m of evaluated.body.models) metrics[m.model] = { ndcg: m.ndcg, recall: m.recall };
  const params = Object.fromEntries(trained.body.models.map((m) => [m.kind, m.params]));
  const perCustomer = evaluated.body.perCustomer ? oursPerCustomer(evaluated.body.perCustomer) : null;
  return { metrics, params, trainSeconds: trained.ms / 1000, customers: evaluated.body.customers, pairs: evaluated.body.pairs, weightsFrom: evaluated.body.weightsFrom, perCustomer };
}

/** A reference run kept from before (its report and ranked lists): it changes only when the split does. */
function keptReference(dir: string) {
  const read = (f: string): unknown => JSON.parse(fs.readFileSync(path.join(dir, f), 'utf8'));
  say(`reference: kept from ${dir}`);
  return { report: read('reference.json') as { models: Record<string, Metrics & { params: unknown }> }, lists: read('reference-lists.json') as ReferenceLists };
}

async function reference() {
  const kept = option('reference-from');
  if (kept) return keptReference(path.resolve(kept));
  const py = await findPython();
  if ('missing' in py) {
    say(`reference skipped: ${py.missing}`);
    return null;
  }
  const json = path.join(out, 'reference.json');
  const lists = path.join(out, 'reference-lists.json');
  const r = await run(py.python, [path.join(ROOT, 'bench/quality/reference.py'), data, '--out', json, '--lists', lists, ...(flag('quick') ? ['--quick'] : [])], {
    log: path.join(out, 'reference.log'),
  });
  if (r.code !== 0) throw new Error(`reference.py failed (exit ${r.code}): ${r.stderr.slice(-3000)}`);
  say(`reference: ${(r.ms / 1000).toFixed(1)} s (log in bench/out/reference.log)`);
  const report = JSON.parse(fs.readFileSync(json, 'utf8')) as { models: Record<string, Metrics & { params: unknown }> };
  return { report, lists: JSON.parse(fs.readFileSync(lists, 'utf8')) as ReferenceLists };
}

async function main() {
  // The reference runs beside our side (quality, not speed, is measured here).
  const refRun = flag('skip-reference') ? Promise.resolve(null) : reference();
  const base = path.join(tmp, 'imported.sqlite');
  const items = await cli<{ added: number }>(root, base, ['import', 'items', path.join(data, 'items.csv')]);
  const signals = await cli<{ added: number; customersCreated: number }>(root, base, ['import', 'signals', path.join(data, 'train.csv'), '--create-customers']);
  say(`imported ${items.body.added} items, ${signals.body.added} signals, ${signals.body.customersCreated} customers (${((items.ms + signals.ms) / 1000).toFixed(1)} s)`);
  const plain = flag('skip-plain') ? null : await ours('plain', base);
  const tuned = flag('skip-tuned') ? null : await ours('tuned', base);
  const ref = await refRun;
  const check = ref ? checkMetrics(ref.lists) : null;
  const table = qualityTable({
    k,
    tuned: tuned?.metrics ?? null,
    plain: plain?.metrics ?? null,
    reference: ref ? Object.fromEntries(Object.entries(ref.report.models).map(([m, v]) => [m, { ndcg: v.ndcg, recall: v.recall }])) : null,
    tunedPer: tuned?.perCustomer ?? null,
    referencePer: ref ? referencePerCustomer(ref.lists) : null,
  });
  const lines = [
    `Quality on ${datasetName()}, ${data}; measured: ${root}`,
    `test: ${tuned?.customers ?? plain?.customers ?? '?'} customers, ${tuned?.pairs ?? plain?.pairs ?? '?'} held-out pairs; K = ${k}; items a customer has in training are not ranked`,
    `machine: ${os.availableParallelism()} cores, load average ${os.loadavg().map((x) => x.toFixed(1)).join(' ')} at the end`,
    '',
    table.text,
    '',
    check
      ? `metric cross-check (our core/metrics on the reference's ranked lists): ${check.agree ? 'agree' : 'DISAGREE'} to 4 digits, largest difference ${Math.max(...check.rows.map((r) => r.difference)).toExponential(1)}`
      : 'metric cross-check: not run (no reference)',
    '',
    `ours, tuned: ${JSON.stringify(tuned?.params ?? null)}; hybrid ${tuned?.weightsFrom ?? '—'}`,
    `reference, tuned: ${ref ? JSON.stringify(Object.fromEntries(Object.entries(ref.report.models).map(([m, v]) => [m, v.params]))) : '—'}`,
    recencyLine(tuned?.params ?? plain?.params ?? null),
  ];
  const text = lines.join('\n');
  console.log(`\n${text}`);
  fs.writeFileSync(path.join(out, 'quality.txt'), `${text}\n`);
  fs.writeFileSync(path.join(out, 'quality.json'), JSON.stringify({ k, data, tuned: tuned && { ...tuned, perCustomer: undefined }, plain: plain && { ...plain, perCustomer: undefined }, reference: ref?.report ?? null, metricCheck: check, targets: table.targets }, null, 1));
  if (flag('keep')) say(`workspaces kept in ${tmp}`);
  else fs.rmSync(tmp, { recursive: true, force: true });
}

/**
 * Which of our models score with recency (core/matrix/values.ts "Recency") and their half-lives: the reference
 * fits the published methods without decay, so a reader sees where ours differs from it by that alone.
 */
function recencyLine(params: Record<string, Record<string, unknown>> | null): string {
  if (!params) return 'recency: —';
  const days = (h: unknown) => (typeof h === 'number' ? `${h} d` : 'off');
  const used = Object.entries(params)
    .filter(([, p]) => typeof p['fitHalfLifeDays'] === 'number' || typeof p['profileHalfLifeDays'] === 'number')
    .map(([m, p]) => `${m} (fit ${days(p['fitHalfLifeDays'])}, profile ${days(p['profileHalfLifeDays'])})`);
  return `recency (ours only; the reference has no time decay): ${used.length ? `half-lives chosen on validation for ${used.join(', ')}` : 'no model uses it'}`;
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : e);
  process.exitCode = 1;
});
