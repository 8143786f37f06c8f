/**
 * Slow, obvious reference computations over the generated files, written for the tests only:
 * CSV reading, and item-item cosine over binary customer co-occurrence with top-n neighbours, as in
 * item-based collaborative filtering (Sarwar, Karypis, Konstan & Riedl 2001, section 3.1.1, cosine).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';

export type Row = Record<string, string>;

export interface DemoFiles {
  header: { items: string[]; customers: string[]; signals: string[] };
  items: Row[];
  customers: Row[];
  signals: Row[];
  truth: {
    seed: number;
    groups: { id: string; name: string; description: string; topCategories: string[] }[];
    itemGroup: Record<string, string>;
    customerGroup: Record<string, string>;
  };
}

function readCsv(path: string): { header: string[]; rows: Row[] } {
  const records = parse(readFileSync(path, 'utf8'), { bom: false, relax_quotes: false }) as string[][];
  const header = records[0] ?? [];
  const rows = records.slice(1).map((r) => Object.fromEntries(header.map((h, k) => [h, r[k] ?? ''])));
  return { header, rows };
}

export function readDemo(dir: string): DemoFiles {
  const items = readCsv(join(dir, 'items.csv'));
  const customers = readCsv(join(dir, 'customers.csv'));
  const signals = readCsv(join(dir, 'signals.csv'));
  return {
    header: { items: items.header, customers: customers.header, signals: signals.header },
    items: items.rows,
    customers: customers.rows,
    signals: signals.rows,
    truth: JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as DemoFiles['truth'],
  };
}

/**
 * For each item, the share of its top-n cosine neighbours (customer co-occurrence, binary) that
 * belong to its own group; items without any co-occurring item are left out. Dense and slow on
 * purpose: a customer x item 0/1 matrix and every pair's dot product.
 */
export function neighbourAgreement(files: DemoFiles, n = 10): { mean: number; items: number } {
  const itemIndex = new Map(files.items.map((r, k) => [r.id!, k]));
  const customerIndex = new Map(files.customers.map((r, k) => [r.id!, k]));
  const nI = files.items.length;
  const nC = files.customers.length;
  const m = new Uint8Array(nI * nC);
  for (const s of files.signals) m[itemIndex.get(s.item!)! * nC + customerIndex.get(s.customer!)!] = 1;
  const norm = new Float64Array(nI);
  for (let i = 0; i < nI; i++) {
    let c = 0;
    for (let u = 0; u < nC; u++) c += m[i * nC + u]!;
    norm[i] = Math.sqrt(c);
  }
  const group = files.items.map((r) => files.truth.itemGroup[r.id!]);
  let total = 0;
  let counted = 0;
  for (let i = 0; i < nI; i++) {
    if (norm[i] === 0) continue;
    const sims: { j: number; sim: number }[] = [];
    for (let j = 0; j < nI; j++) {
      if (j === i || norm[j] === 0) continue;
      let dot = 0;
      for (let u = 0; u < nC; u++) dot += m[i * nC + u]! & m[j * nC + u]!;
      if (dot > 0) sims.push({ j, sim: dot / (norm[i]! * norm[j]!) });
    }
    if (sims.length === 0) continue;
    sims.sort((a, b) => b.sim - a.sim || a.j - b.j);
    const top = sims.slice(0, n);
    total += top.filter((x) => group[x.j] === group[i]).length / top.length;
    counted++;
  }
  return { mean: total / counted, items: counted };
}

/** A small demo shop for the fast tests: 300 items, 1,500 customers, 30,000 signals. */
export const SMALL = { items: 300, customers: 1500, signals: 30_000 } as const;
