import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitEase } from '../../src-main/core/models/ease.ts';
import { seededRng } from '../../src-main/core/rng.ts';

describe('EASE weights on several float32 tiles', () => {
  it('match a slow dense float64 reference, B = −P/diag(P) with P from ml-matrix (Steck 2019, eq. 8)', () => {
    // 150 items: two full 64-item tiles and a padded third; skewed popularity as in real logs.
    const rows = 600;
    const cols = 150;
    const rng = seededRng(21);
    const dense = Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
    for (const row of dense) for (let t = 0; t < 1 + rng.int(10); t++) row[Math.floor(cols * rng.next() ** 2)] = 1;
    const lambda = 20;
    const X = new Matrix(dense);
    const P = inverse(X.transpose().mmul(X).add(Matrix.eye(cols).mul(lambda)));
    const model = fitEase(csrFromDense(rows, cols, dense.flat()), { lambda }).model;
    let err = 0;
    let scale = 0;
    for (let i = 0; i < cols; i++) {
      for (let j = 0; j < cols; j++) {
        const expected = i === j ? 0 : -P.get(i, j) / P.get(j, j);
        err = Math.max(err, Math.abs(model.b[i * cols + j]! - expected));
        scale = Math.max(scale, Math.abs(expected));
      }
    }
    // Float32 storage: 1e-4 of the largest weight (common practice for float32 results, no source).
    expect(err / scale).toBeLessThan(1e-4);
    for (let i = 0; i < cols; i++) expect(model.b[i * cols + i]).toBe(0);
  });
});
