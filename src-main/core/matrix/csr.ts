/**
 * Compressed sparse rows: row r's entries are `indices[indptr[r] .. indptr[r+1])` with values in `data`
 * at the same positions. Columns within a row are sorted ascending. Rows are customers and columns
 * items in an interaction matrix (dense indices of `Dataset`).
 */
export interface Csr {
  rows: number;
  cols: number;
  indptr: Int32Array;
  indices: Int32Array;
  data: Float32Array;
  /**
   * Per entry (same positions as `data`), the age in days of the pair's latest signal before the matrix's
   * reference time (matrix/build.ts); absent when no signal had a time. Matrices derived by value (a transform)
   * keep it; a transpose or any re-ordering drops it.
   */
  ageDays?: Float32Array;
}

/** The number of stored entries. */
export function nnz(m: Csr): number {
  return m.indptr[m.rows] ?? 0;
}

/**
 * The transpose, by counting sort on columns: O(nnz + rows + cols), no per-entry allocation. Because
 * rows are visited in order, each output row lists its columns ascending whether or not the input's
 * rows were sorted, which `buildInteractionMatrix` relies on.
 */
export function transpose(m: Csr): Csr {
  return transposeRows(m, (n) => new Float32Array(n));
}

/** Sparse rows with any float array for values (TF-IDF builds in Float64 before storing Float32). */
export interface SparseRowsOf<D extends Float32Array | Float64Array> {
  rows: number;
  cols: number;
  indptr: Int32Array;
  indices: Int32Array;
  data: D;
}

/** `transpose` for any value precision; `alloc` makes the output's value array. */
export function transposeRows<D extends Float32Array | Float64Array>(m: SparseRowsOf<D>, alloc: (n: number) => D): SparseRowsOf<D> {
  const total = m.indptr[m.rows] ?? 0;
  const indptr = new Int32Array(m.cols + 1);
  for (let p = 0; p < total; p++) indptr[m.indices[p]! + 1]!++;
  for (let c = 0; c < m.cols; c++) indptr[c + 1]! += indptr[c]!;
  const next = indptr.slice(0, m.cols);
  const indices = new Int32Array(total);
  const data = alloc(total);
  for (let r = 0; r < m.rows; r++) {
    for (let p = m.indptr[r]!, end = m.indptr[r + 1]!; p < end; p++) {
      const q = next[m.indices[p]!]!++;
      indices[q] = r;
      data[q] = m.data[p]!;
    }
  }
  return { rows: m.cols, cols: m.rows, indptr, indices, data };
}

/** A CSR from dense row-major values (zeros dropped); for tests and tiny inputs. */
export function csrFromDense(rows: number, cols: number, values: ArrayLike<number>): Csr {
  const indptr = new Int32Array(rows + 1);
  let count = 0;
  for (let k = 0; k < rows * cols; k++) if (values[k] !== 0) count++;
  const indices = new Int32Array(count);
  const data = new Float32Array(count);
  let q = 0;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const v = values[r * cols + c]!;
      if (v !== 0) {
        indices[q] = c;
        data[q++] = v;
      }
    }
    indptr[r + 1] = q;
  }
  return { rows, cols, indptr, indices, data };
}
