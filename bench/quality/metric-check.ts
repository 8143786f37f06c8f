/**
 * Cross-check of the two metric implementations: the reference's own ranked top-K lists are measured again
 * with our metric functions (core/metrics, the ones `evaluate` uses), and both results must agree to 4
 * digits. Only then does comparing our numbers with the reference's compare models rather than formulas.
 */
import { cappedRecallFromHits, ndcgFromHits } from '../../src-main/core/metrics/index.ts';

export interface ReferenceLists {
  k: number;
  truth: Record<string, string[]>;
  lists: Record<string, Record<string, string[]>>;
  metrics: Record<string, { ndcg: number; recall: number }>;
}

export interface MetricCheckRow {
  model: string;
  customers: number;
  ours: { ndcg: number; recall: number };
  reference: { ndcg: number; recall: number };
  /** Largest absolute difference of the two means. */
  difference: number;
}

export function checkMetrics(ref: ReferenceLists): { rows: MetricCheckRow[]; agree: boolean } {
  const rows: MetricCheckRow[] = [];
  for (const [model, byCustomer] of Object.entries(ref.lists)) {
    let nd = 0;
    let rc = 0;
    let n = 0;
    for (const [customer, truthList] of Object.entries(ref.truth)) {
      const truth = new Set(truthList);
      const ranked = byCustomer[customer] ?? [];
      const hits = new Uint8Array(ref.k);
      ranked.slice(0, ref.k).forEach((item, r) => (hits[r] = truth.has(item) ? 1 : 0));
      nd += ndcgFromHits(hits, truth.size, ref.k);
      rc += cappedRecallFromHits(hits, truth.size, ref.k);
      n++;
    }
    const ours = { ndcg: nd / n, recall: rc / n };
    const reference = ref.metrics[model]!;
    rows.push({ model, customers: n, ours, reference, difference: Math.max(Math.abs(ours.ndcg - reference.ndcg), Math.abs(ours.recall - reference.recall)) });
  }
  return { rows, agree: rows.every((r) => r.difference < 5e-5) };
}
