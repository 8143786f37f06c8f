/**
 * Paired standard errors for the quality table: two rankers measured on the same test customers differ far
 * less from customer to customer than either's NDCG does, so the standard error of a gap is that of the
 * per-customer differences, sd(a − b)/√n (a paired comparison; e.g. Sakai 2014, "Statistical reform in
 * information retrieval?", SIGIR Forum 48). A ratio's standard error is that SE divided by the reference mean.
 */
import { ndcgFromHits } from '../../src-main/core/metrics/index.ts';
import type { ReferenceLists } from './metric-check.ts';

/** Each customer's NDCG@K, by customer id. */
export type PerCustomer = Map<string, number>;

/** Mean and standard error of a − b over the customers both hold (their ids in `a`'s order). */
export function pairedDifference(a: PerCustomer, b: PerCustomer): { n: number; mean: number; se: number } {
  const x: number[] = [];
  const y: number[] = [];
  for (const [c, v] of a) {
    const w = b.get(c);
    if (w !== undefined) {
      x.push(v);
      y.push(w);
    }
  }
  return pairedArrays(Float64Array.from(x), Float64Array.from(y));
}

/** Mean and standard error of a − b, customer by customer (the arrays in the same customers' order). */
export function pairedArrays(a: Float64Array, b: Float64Array): { n: number; mean: number; se: number } {
  const n = Math.min(a.length, b.length);
  if (n === 0) return { n, mean: Number.NaN, se: Number.NaN };
  let s = 0;
  for (let i = 0; i < n; i++) s += a[i]! - b[i]!;
  const mean = s / n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (a[i]! - b[i]! - mean) ** 2;
  return { n, mean, se: n > 1 ? Math.sqrt(ss / (n - 1) / n) : Number.NaN };
}

/** The reference's per-customer NDCG@K of each model, from its ranked lists (metrics as metric-check.ts). */
export function referencePerCustomer(ref: ReferenceLists): Record<string, PerCustomer> {
  const out: Record<string, PerCustomer> = {};
  for (const [model, byCustomer] of Object.entries(ref.lists)) {
    const m: PerCustomer = new Map();
    for (const [customer, truthList] of Object.entries(ref.truth)) {
      const truth = new Set(truthList);
      const hits = new Uint8Array(ref.k);
      (byCustomer[customer] ?? []).slice(0, ref.k).forEach((item, r) => (hits[r] = truth.has(item) ? 1 : 0));
      m.set(customer, ndcgFromHits(hits, truth.size, ref.k));
    }
    out[model] = m;
  }
  return out;
}

/** `evaluate --holdout --per-customer --json`'s answer as one map per model. */
export function oursPerCustomer(p: { customers: string[]; ndcg: Record<string, number[]> }): Record<string, PerCustomer> {
  return Object.fromEntries(Object.entries(p.ndcg).map(([m, xs]) => [m, new Map(p.customers.map((c, i) => [c, xs[i]!]))]));
}
