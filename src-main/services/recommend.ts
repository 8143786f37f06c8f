/**
 * Per-customer top-N export (issue 6): for each customer, the hybrid's N best items over the whole catalogue
 * minus what the customer already has, ranked by the validated blend (services/tune/blend.ts) with each model's part of the score, as CSV or JSON Lines.
 *
 * Tie rule (documented, deterministic): higher score first; equal scores are ordered by the item's external
 * id, lower first, comparing UTF-16 code units (JavaScript's `<` on strings), so the file depends on the data
 * only — never on the catalogue's row order or the machine. Scores are written rounded to 6 decimals and the
 * ranking is made on the same rounded values, so what a reader sees in the file explains the order.
 * The file is written beside its destination and renamed into place: a failed export leaves no half file.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.ts';
import { BLEND_MODELS, type BlendModel } from '../core/eval/validated-blend.ts';
import type { BlendScorer } from '../core/scoring/blend-scorer.ts';
import { loadDataset } from '../store/dataset.ts';
import type { Db } from '../store/workspace.ts';
import { csvCell } from './export/csv.ts';
import { SPONSORED } from './export/labels.ts';
import { checkReplaceableExport } from './recommend-out.ts';
import { checkInputFile, checkOutputFile } from './user-file.ts';
import type { UnknownIds } from './holdout/evaluate.ts';
import { loadTrainedModels, ownedMatrix } from './holdout/trained.ts';

export type RecommendFormat = 'csv' | 'jsonl';

export interface RecommendOptions {
  /** External customer ids; or `all`. */
  customers?: readonly string[];
  all?: boolean;
  /** List length per customer. */
  n: number;
  out: string;
  format?: RecommendFormat;
}

export interface RecommendReport {
  file: string;
  format: RecommendFormat;
  customers: number;
  rows: number;
  unknownCustomers: UnknownIds;
  /** Customers listed twice are written once. */
  duplicateCustomers: number;
  weightsFrom: string;
  tieRule: string;
  elapsedMs: number;
  notes: string[];
}

export const TIE_RULE = 'higher score first; equal scores by item external id, lower first (code-unit order)';
export const RECOMMEND_CSV_HEADER = ['customer', 'rank', 'item', 'title', 'score', ...BLEND_MODELS, 'sponsored'];

/** Reads a customer list: one external id per line (or the first column of a CSV); a header line is skipped. */
export function readCustomerList(file: string): string[] {
  checkInputFile(file, 'customer list');
  let text: string;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch (e) {
    throw new InputError(`cannot read the customer list: ${(e as Error).message}`, { file });
  }
  const ids = text
    .split(/\r?\n/)
    .map((l) => (l.split(/[,;\t]/)[0] ?? '').trim().replace(/^"(.*)"$/, '$1'))
    .filter((l) => l !== '');
  if (ids.length > 0 && /^(customer|customer[ _-]?id|id|user|user[ _-]?id|reader)$/i.test(ids[0]!)) ids.shift();
  if (ids.length === 0) throw new InputError('the customer list is empty', { file });
  return ids;
}

export function recommend(db: Db, o: RecommendOptions): RecommendReport {
  const started = performance.now();
  const format = o.format ?? (path.extname(o.out).toLowerCase() === '.jsonl' ? 'jsonl' : 'csv');
  if (!Number.isInteger(o.n) || o.n < 1 || o.n > 1000) throw new InputError(`top must be a whole number from 1 to 1000, got ${o.n}`, { column: 'top' });
  if (!o.all && !(o.customers && o.customers.length > 0)) throw new InputError('give a list of customers or ask for all of them');
  checkOutputFile(o.out); // before the work, so a long run never ends in a failed write
  checkReplaceableExport(o.out, RECOMMEND_CSV_HEADER.join(',')); // an older export may be replaced, nothing else
  const ds = loadDataset(db);
  const models = loadTrainedModels(db, ds);
  const blend = models.blend;
  if (!blend) throw new InputError('no trained model: run train first');
  const N = ds.items.length;

  // Which customers, in the order asked (all: workspace order).
  const index = new Map<string, number>();
  ds.customerExternalIds.forEach((id, u) => index.set(id, u));
  const targets: number[] = [];
  const unknown = new Map<string, number>();
  let duplicates = 0;
  if (o.all) for (let u = 0; u < ds.customerIds.length; u++) targets.push(u);
  else {
    const seen = new Set<number>();
    for (const id of o.customers!) {
      const u = index.get(id);
      if (u === undefined) unknown.set(id, (unknown.get(id) ?? 0) + 1);
      else if (seen.has(u)) duplicates++;
      else {
        seen.add(u);
        targets.push(u);
      }
    }
  }

  // Rank of each item's external id, so ties compare integers in the hot loop.
  const byExt = Array.from({ length: N }, (_, i) => i).sort((a, b) => {
    const x = ds.items[a]!.externalId;
    const y = ds.items[b]!.externalId;
    return x < y ? -1 : x > y ? 1 : 0;
  });
  const extRank = new Int32Array(N);
  byExt.forEach((i, r) => (extRank[i] = r));

  const owned = ownedMatrix(ds);
  const mark = new Uint8Array(N);
  const scores = new Float32Array(N);
  const n = Math.min(o.n, N);
  const top = new Int32Array(n);
  const topScore = new Float64Array(n);
  const tmp = `${o.out}.partial-${process.pid}`;
  const fd = openOut(tmp);
  let rows = 0;
  try {
    if (format === 'csv') fs.writeSync(fd, `${RECOMMEND_CSV_HEADER.join(',')}\r\n`);
    for (const u of targets) {
      // The validated blend: one model's own scores, or the weighted per-customer normalised columns.
      const cols = blend.isRawSingle ? null : blend.columnsFor(u, models.matrix);
      if (cols) blend.blendInto(cols, scores);
      else blend.scoreInto(u, models.matrix, scores);
      for (let p = owned.indptr[u]!; p < owned.indptr[u + 1]!; p++) mark[owned.indices[p]!] = 1;
      let filled = 0;
      for (let i = 0; i < N; i++) {
        const s = round6(scores[i]!);
        if (mark[i]) continue;
        // Bounded insertion under the tie rule; most items fail the first comparison with the worst kept.
        if (filled === n && !better(s, i, topScore[n - 1]!, top[n - 1]!, extRank)) continue;
        let q = filled < n ? filled++ : n - 1;
        while (q > 0 && better(s, i, topScore[q - 1]!, top[q - 1]!, extRank)) {
          top[q] = top[q - 1]!;
          topScore[q] = topScore[q - 1]!;
          q--;
        }
        top[q] = i;
        topScore[q] = s;
      }
      for (let p = owned.indptr[u]!; p < owned.indptr[u + 1]!; p++) mark[owned.indices[p]!] = 0;
      const lines: string[] = [];
      for (let r = 0; r < filled; r++) {
        const i = top[r]!;
        const it = ds.items[i]!;
        const contributions = explain(blend, cols, i, scores[i]!);
        const customer = ds.customerExternalIds[u]!;
        if (format === 'csv') {
          lines.push(
            [customer, r + 1, it.externalId, it.title, topScore[r]!, ...BLEND_MODELS.map((c) => contributions[c]), it.promoted ? SPONSORED : '']
              .map((v) => csvCell(v))
              .join(','),
          );
        } else {
          lines.push(
            JSON.stringify({ customer, rank: r + 1, item: it.externalId, title: it.title, score: topScore[r]!, contributions, sponsored: it.promoted }),
          );
        }
      }
      rows += filled;
      if (lines.length) fs.writeSync(fd, `${lines.join(format === 'csv' ? '\r\n' : '\n')}${format === 'csv' ? '\r\n' : '\n'}`);
    }
    fs.closeSync(fd);
    fs.renameSync(tmp, o.out);
  } catch (e) {
    try {
      fs.closeSync(fd);
    } catch {
      // already closed
    }
    fs.rmSync(tmp, { force: true });
    throw e;
  }
  return {
    file: o.out,
    format,
    customers: targets.length,
    rows,
    unknownCustomers: { distinct: unknown.size, rows: [...unknown.values()].reduce((s, c) => s + c, 0), examples: [...unknown.keys()].slice(0, 5) },
    duplicateCustomers: duplicates,
    weightsFrom: models.weightsFrom,
    tieRule: TIE_RULE,
    elapsedMs: performance.now() - started,
    notes: models.notes,
  };
}

/**
 * Each model's part of item i's score: weight × its normalised value for the customer (a cold item's whole
 * score is content's when the blend keeps the content path; a raw single model holds the whole score).
 */
function explain(blend: BlendScorer, cols: { parts: Float32Array[]; content: Float32Array | null } | null, i: number, score: number): Record<BlendModel, number> {
  const out = Object.fromEntries(BLEND_MODELS.map((m) => [m, 0])) as Record<BlendModel, number>;
  if (!cols) out[blend.parts[0]!.model] = round6(score);
  else {
    // A cold item: each part shrunk by (1 − share), content's share added on top.
    const share = cols.content && blend.isCold(i) ? (blend.spec.coldShare ?? 1) : 0;
    blend.parts.forEach((p, q) => (out[p.model] = round6((1 - share) * p.weight * cols.parts[q]![i]!)));
    if (share > 0) out.content = round6(out.content + share * cols.content![i]!);
  }
  return out;
}

/** Item a (score sa) goes before item b (score sb) under the tie rule. */
function better(sa: number, a: number, sb: number, b: number, extRank: Int32Array): boolean {
  return sa > sb || (sa === sb && extRank[a]! < extRank[b]!);
}

function round6(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

function openOut(file: string): number {
  try {
    return fs.openSync(file, 'wx', 0o600); // new only: the scratch file never replaces anything
  } catch (e) {
    throw new InputError(`cannot write the output file: ${(e as Error).message}`, { file: file.replace(/\.partial-\d+$/, '') });
  }
}
