import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { spdInverseF32, type SpdWorkspace } from '../../src-main/core/linalg/spd-f32.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { invertInThreads } from '../../src-main/services/train/ease-inverse-threads.ts';

/** An EASE-like Gram matrix XᵀX + λI over a skewed random 0/1 X, n items (seeded). */
function gram(n: number, seed: number): Float64Array {
  const rng = seededRng(seed);
  const g = new Float64Array(n * n);
  for (let u = 0; u < 4 * n; u++) {
    const set = [...new Set(Array.from({ length: 1 + rng.int(10) }, () => Math.floor(n * rng.next() ** 2)))];
    for (const i of set) for (const j of set) g[i * n + j]! += 1;
  }
  for (let i = 0; i < n; i++) g[i * n + i]! += 5;
  return g;
}

const writer = (g: Float64Array, n: number) => (ws: SpdWorkspace) => {
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) ws.f32[ws.at(i, j)] = g[i * n + j]!;
};

describe('invertInThreads', () => {
  it('gives, on two threads, the single-thread result bit for bit, which matches ml-matrix inverse (reference library)', () => {
    const n = 330; // six tiles, the last padded: both threads get rows, columns and tiles in every phase
    const g = gram(n, 3);
    const one = spdInverseF32(n, writer(g, n));
    let claims: number[] = [];
    const two = invertInThreads(n, writer(g, n), 2, { onClaims: (c) => (claims = c) });
    expect(claims.every((c) => c > 0)).toBe(true); // both threads took tiles
    const ref = inverse(new Matrix(Array.from({ length: n }, (_, i) => Array.from(g.subarray(i * n, (i + 1) * n)))));
    let err = 0;
    let scale = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        expect(two.f32[two.at(i, j)]).toBe(one.f32[one.at(i, j)]);
        err = Math.max(err, Math.abs(two.f32[two.at(i, j)]! - ref.get(i, j)));
        scale = Math.max(scale, Math.abs(ref.get(i, j)));
      }
    }
    expect(err / scale).toBeLessThan(1e-4);
  });

  it('reports a matrix that is not positive definite and leaves no thread waiting', () => {
    const n = 200;
    const g = gram(n, 4);
    g[150 * n + 150] = -1; // a negative diagonal entry: the Cholesky pivot of row 150 fails
    expect(() => invertInThreads(n, writer(g, n), 2)).toThrow(/not positive definite/);
  });
});
