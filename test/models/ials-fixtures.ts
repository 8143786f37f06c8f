import { csrFromDense, type Csr } from '../../src-main/core/matrix/csr.ts';
import { seededRng } from '../../src-main/core/rng.ts';

/** A seeded random customers × items matrix with about `density` of its cells holding 1..5. */
export function randomInteractions(customers: number, items: number, density: number, seed: number): Csr {
  const rng = seededRng(seed);
  const dense = new Float64Array(customers * items);
  for (let q = 0; q < dense.length; q++) if (rng.next() < density) dense[q] = 1 + rng.int(5);
  // every customer and every item gets at least one entry, so no row is empty by accident
  for (let u = 0; u < customers; u++) dense[u * items + (u % items)] ||= 1;
  for (let i = 0; i < items; i++) dense[(i % customers) * items + i] ||= 1;
  return csrFromDense(customers, items, dense);
}

/** The dense value of cell (u, i), 0 when absent. */
export function cell(m: Csr, u: number, i: number): number {
  for (let q = m.indptr[u]!; q < m.indptr[u + 1]!; q++) if (m.indices[q] === i) return m.data[q]!;
  return 0;
}
