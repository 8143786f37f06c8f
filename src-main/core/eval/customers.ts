import type { Csr } from '../matrix/csr.ts';
import type { Rng } from '../rng.ts';

/**
 * Who can be evaluated in a window, and what each of them has to be found.
 *
 * A customer counts when they have at least one interaction in `history` (otherwise no personal model
 * has anything to go on; cold customers are a separate question) and at least one item in the window
 * that is not already in their history. Repeat interactions are dropped from the truth because the
 * evaluator never ranks history items (a shelf does not propose what a customer already has), so they
 * could never be found and would only lower every model alike.
 */
export interface EvalTruth {
  /** Evaluated customers, ascending. */
  customers: Int32Array;
  /** Truth items of customers[c] are items[ptr[c] .. ptr[c + 1]). */
  ptr: Int32Array;
  items: Int32Array;
}

/** `unavailable` (1 = not in the catalogue when the window starts): never truth, since it is never ranked. */
export function evalTruth(history: Csr, window: Csr, customers?: Int32Array, unavailable?: Uint8Array | null): EvalTruth {
  if (history.rows !== window.rows || history.cols !== window.cols) {
    throw new RangeError(
      `history is ${history.rows}×${history.cols} but the window is ${window.rows}×${window.cols}; build both from one dataset`,
    );
  }
  const rows = customers ?? Int32Array.from({ length: window.rows }, (_, u) => u);
  const keep: number[] = [];
  const ptr: number[] = [0];
  const items: number[] = [];
  for (let c = 0; c < rows.length; c++) {
    const u = rows[c]!;
    const hs = history.indptr[u]!;
    const he = history.indptr[u + 1]!;
    if (he === hs) continue;
    const before = items.length;
    // Both rows have ascending columns: a merge walk finds the window items missing from history.
    let h = hs;
    for (let p = window.indptr[u]!, end = window.indptr[u + 1]!; p < end; p++) {
      const i = window.indices[p]!;
      while (h < he && history.indices[h]! < i) h++;
      if (h < he && history.indices[h] === i) continue;
      if (unavailable?.[i]) continue;
      items.push(i);
    }
    if (items.length > before) {
      keep.push(u);
      ptr.push(items.length);
    }
  }
  return { customers: Int32Array.from(keep), ptr: Int32Array.from(ptr), items: Int32Array.from(items) };
}

/**
 * At most `cap` of the evaluated customers, drawn uniformly without replacement with the seeded rng
 * (partial Fisher–Yates), returned in ascending order. Sampling trades a little precision of the mean for
 * speed: the standard error of a mean over n customers shrinks as 1/√n, so 1,000–2,000 customers are
 * enough to rank models whose NDCG differ by a few hundredths (common practice, no source). Every model
 * of one evaluation sees the same sample, so their comparison stays paired.
 */
export function sampleTruth(truth: EvalTruth, cap: number, rng: Rng): EvalTruth {
  const n = truth.customers.length;
  if (!(cap >= 1) || cap >= n) return truth;
  const order = Int32Array.from({ length: n }, (_, c) => c);
  for (let c = 0; c < cap; c++) {
    const j = c + rng.int(n - c);
    const t = order[c]!;
    order[c] = order[j]!;
    order[j] = t;
  }
  const chosen = order.subarray(0, cap).sort();
  const customers = new Int32Array(cap);
  const ptr = new Int32Array(cap + 1);
  let total = 0;
  for (const c of chosen) total += truth.ptr[c + 1]! - truth.ptr[c]!;
  const items = new Int32Array(total);
  let q = 0;
  chosen.forEach((c, r) => {
    customers[r] = truth.customers[c]!;
    items.set(truth.items.subarray(truth.ptr[c]!, truth.ptr[c + 1]!), q);
    q += truth.ptr[c + 1]! - truth.ptr[c]!;
    ptr[r + 1] = q;
  });
  return { customers, ptr, items };
}

/** Customers per item in a matrix (column counts of stored entries): the p_i of novelty and popularity. */
export function customersPerItem(m: Csr): Int32Array {
  const counts = new Int32Array(m.cols);
  const end = m.indptr[m.rows]!;
  for (let p = 0; p < end; p++) counts[m.indices[p]!]!++;
  return counts;
}
