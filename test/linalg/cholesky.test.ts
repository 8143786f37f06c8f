import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { choleskyInPlace, lowerInverseInPlace, spdInverseInPlace } from '../../src-main/core/linalg/cholesky.ts';
import { seededRng } from '../../src-main/core/rng.ts';

/** A random SPD matrix R Rᵀ + n·I (seeded), flat row-major. */
function randomSpd(n: number, seed: number): Float64Array {
  const rng = seededRng(seed);
  const r = Float64Array.from({ length: n * n }, () => rng.normal());
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let s = i === j ? n : 0;
      for (let k = 0; k < n; k++) s += r[i * n + k]! * r[j * n + k]!;
      a[i * n + j] = s;
    }
  }
  return a;
}

const toMatrix = (a: Float64Array, n: number): Matrix => new Matrix(Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, (i + 1) * n))));

// Sizes around the 4-row blocking: a remainder of 0, 1, 2 and 3 rows, and one bigger case.
const SIZES = [1, 2, 3, 4, 5, 7, 8, 30, 61];

describe('choleskyInPlace', () => {
  it.each(SIZES)('matches ml-matrix CholeskyDecomposition (reference library) for n = %i', (n) => {
    const a = randomSpd(n, n);
    const ref = new CholeskyDecomposition(toMatrix(a, n)).lowerTriangularMatrix;
    choleskyInPlace(a, n);
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) expect(a[i * n + j]).toBeCloseTo(ref.get(i, j), 9);
  });

  it('rejects a matrix that is not positive definite, saying what to do', () => {
    expect(() => choleskyInPlace(Float64Array.of(1, 2, 2, 1), 2)).toThrow(/not positive definite.*regularization/);
  });
});

describe('lowerInverseInPlace', () => {
  it.each(SIZES)('gives L⁻¹ with L · L⁻¹ = I for n = %i', (n) => {
    const a = randomSpd(n, 100 + n);
    choleskyInPlace(a, n);
    const l = Float64Array.from(a);
    lowerInverseInPlace(a, n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        let s = 0;
        for (let k = j; k <= i; k++) s += l[i * n + k]! * a[k * n + j]!;
        expect(s).toBeCloseTo(i === j ? 1 : 0, 9);
      }
    }
  });
});

describe('spdInverseInPlace', () => {
  it.each(SIZES)('matches ml-matrix inverse (reference library) for n = %i', (n) => {
    const a = randomSpd(n, 200 + n);
    const ref = inverse(toMatrix(a, n));
    spdInverseInPlace(a, n);
    const scale = Math.max(...ref.to1DArray().map(Math.abs));
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(Math.abs(a[i * n + j]! - ref.get(i, j))).toBeLessThan(1e-10 * scale);
  });
});
