import type { SignalColumns } from '../types.ts';
import type { Csr } from './csr.ts';

/**
 * Signal indices grouped by customer, by counting sort (one pass to count, one to place): the signals of
 * customer u are signal[ptr[u] .. ptr[u + 1]), in their original order.
 */
export function signalsByCustomer(s: SignalColumns, customers: number): { ptr: Int32Array; signal: Int32Array } {
  const ptr = new Int32Array(customers + 1);
  for (let k = 0; k < s.length; k++) ptr[s.customer[k]! + 1]!++;
  for (let u = 0; u < customers; u++) ptr[u + 1]! += ptr[u]!;
  const next = ptr.slice(0, customers);
  const signal = new Int32Array(s.length);
  for (let k = 0; k < s.length; k++) signal[next[s.customer[k]!]!++] = k;
  return { ptr, signal };
}

/** Each customer's distinct items, ascending, as a binary CSR (any signal of any kind or value counts once). */
export function customerItemSets(s: SignalColumns, customers: number, items: number): Csr {
  const { ptr, signal } = signalsByCustomer(s, customers);
  const idx = Int32Array.from(signal, (k) => s.item[k]!);
  // Sort and de-duplicate each row in place (the write position never passes the read position).
  const indptr = new Int32Array(customers + 1);
  let q = 0;
  for (let r = 0; r < customers; r++) {
    const row = idx.subarray(ptr[r]!, ptr[r + 1]!).sort();
    let last = -1;
    for (const i of row) {
      if (i !== last) idx[q++] = i;
      last = i;
    }
    indptr[r + 1] = q;
  }
  return { rows: customers, cols: items, indptr, indices: idx.slice(0, q), data: new Float32Array(q).fill(1) };
}
