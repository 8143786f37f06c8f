import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitEase, loadEase } from '../../src-main/core/models/ease.ts';
import { sparsifyEase } from '../../src-main/core/models/ease-topk.ts';
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

describe('EASE top-k storage (above EASE_DENSE_MAX_BYTES)', () => {
  const rows = 80;
  const cols = 20;
  const rng = seededRng(5);
  const dense = Array.from({ length: rows }, () => Array.from({ length: cols }, () => (rng.next() < 0.25 ? 1 : 0)));
  const x = csrFromDense(rows, cols, dense.flat());
  const model = fitEase(x, { lambda: 3 }).model;

  it('keeping every off-diagonal weight scores exactly as the dense model, through a save and load', () => {
    const all = loadEase(sparsifyEase(cols, model.kept, model.b, cols - 1).serialize());
    const a = new Float32Array(cols);
    const b = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      model.scoreInto(u, x, a);
      all.scoreInto(u, x, b);
      for (let j = 0; j < cols; j++) expect(b[j]).toBeCloseTo(a[j]!, 6);
    }
  });

  it('keeps per item the k weights of largest magnitude, found by sorting each row independently', () => {
    const k = 3;
    const top = sparsifyEase(cols, model.kept, model.b, k);
    const row = new Float32Array(cols);
    for (let i = 0; i < cols; i++) {
      top.similarityInto(i, row);
      const expected = Array.from(model.b.subarray(i * cols, (i + 1) * cols))
        .map((v, j) => [Math.abs(v), j] as const)
        .filter(([, j]) => j !== i)
        .sort((p, q) => q[0] - p[0])
        .slice(0, k)
        .map(([, j]) => j)
        .sort((p, q) => p - q);
      const kept = Array.from(row.keys()).filter((j) => row[j] !== 0);
      expect(kept).toEqual(expected);
      for (const j of kept) expect(row[j]).toBe(model.b[i * cols + j]);
    }
  });
});
