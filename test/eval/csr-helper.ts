import type { Csr } from '../../src-main/core/matrix/csr.ts';

/** A CSR matrix from per-row lists of [column, value] (columns sorted here), for hand-built fixtures. */
export function csrFromRows(rows: readonly (readonly (readonly [number, number])[])[], cols: number): Csr {
  const indptr = new Int32Array(rows.length + 1);
  const indices: number[] = [];
  const data: number[] = [];
  rows.forEach((row, r) => {
    for (const [c, v] of [...row].sort((a, b) => a[0] - b[0])) {
      indices.push(c);
      data.push(v);
    }
    indptr[r + 1] = indices.length;
  });
  return { rows: rows.length, cols, indptr, indices: Int32Array.from(indices), data: Float32Array.from(data) };
}

/** Binary rows: each listed column gets 1. */
export function binaryRows(rows: readonly (readonly number[])[], cols: number): Csr {
  return csrFromRows(rows.map((r) => r.map((c) => [c, 1] as const)), cols);
}
