import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { addGramRows, addObservedTerms, GROUP, gramTimesGroup, mirrorGram } from '../../src-main/core/models/ials-kernels.ts';
import { seededRng } from '../../src-main/core/rng.ts';

/**
 * The register-blocked loops against plain matrix algebra done by ml-matrix (reference library):
 * every blocking has a remainder path (k not a multiple of 4, row counts not multiples of 4), so the
 * sizes below cover each remainder.
 */
const rng = seededRng(31);
const normals = (n: number) => Float64Array.from({ length: n }, () => rng.normal());
const KS = [1, 3, 4, 6, 9, 16];

describe('gramTimesGroup', () => {
  it.each(KS)('equals (G + λI)·v for each of the GROUP vectors (ml-matrix mmul), k = %i', (k) => {
    const g = normals(k * k);
    const vs = normals(GROUP * k + 3); // the vectors start at offset 3
    const out = new Float64Array(GROUP * k + 5);
    gramTimesGroup(g, 0.7, vs, 3, out, 5, k);
    const G = Matrix.from1DArray(k, k, Array.from(g)).add(Matrix.eye(k, k).mul(0.7));
    for (let v = 0; v < GROUP; v++) {
      const want = G.mmul(Matrix.columnVector(Array.from(vs.subarray(3 + v * k, 3 + (v + 1) * k)))).getColumn(0);
      for (let f = 0; f < k; f++) expect(out[5 + v * k + f]).toBeCloseTo(want[f]!, 10);
    }
  });
});

describe('addObservedTerms', () => {
  it.each(KS)('adds Σ_q (base·c_q + sign·(c_q − 1)·y_qᵀv)·y_q over 0..9 entries (dense evaluation), k = %i', (k) => {
    const items = 12;
    const fixed = Float32Array.from(normals(items * k));
    const indices = Int32Array.of(7, 2, 11, 0, 5, 9, 3, 1, 10, 4);
    const conf = Float32Array.from({ length: indices.length }, () => 1 + 4 * rng.next());
    const v = normals(k);
    const Y = new Matrix(items, k);
    for (let i = 0; i < items; i++) for (let f = 0; f < k; f++) Y.set(i, f, fixed[i * k + f]!);
    for (const [base, sign] of [[0, 1], [1, -1]] as const) {
      for (let n = 0; n <= indices.length; n++) {
        const start = normals(k);
        const out = Float64Array.from(start);
        addObservedTerms(fixed, indices, conf, 0, n, v, 0, out, 0, k, base, sign);
        // Reference: start + Yᵀ w with w_i = base·c + sign·(c − 1)·(Y v)_i on the chosen rows.
        const yv = Y.mmul(Matrix.columnVector(Array.from(v))).getColumn(0);
        const w = new Array<number>(items).fill(0);
        for (let q = 0; q < n; q++) {
          const c = conf[q]!;
          w[indices[q]!]! += base * c + sign * (c - 1) * yv[indices[q]!]!;
        }
        const want = Y.transpose().mmul(Matrix.columnVector(w)).getColumn(0);
        for (let f = 0; f < k; f++) expect(out[f]).toBeCloseTo(start[f]! + want[f]!, 9);
      }
    }
  });
});

describe('addGramRows', () => {
  it.each(KS)('sums FᵀF over a row range of any length (ml-matrix), k = %i', (k) => {
    const n = 11;
    const f32 = Float32Array.from(normals(n * k));
    const F = new Matrix(n, k);
    for (let u = 0; u < n; u++) for (let f = 0; f < k; f++) F.set(u, f, f32[u * k + f]!);
    for (const [start, end] of [[0, 11], [1, 8], [2, 3], [5, 5]] as const) {
      const out = new Float64Array(k * k);
      addGramRows(f32, k, start, end, out);
      mirrorGram(out, k);
      const part = F.subMatrix(start, Math.max(start, end - 1), 0, k - 1);
      const want = end > start ? part.transpose().mmul(part) : Matrix.zeros(k, k);
      for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) expect(out[a * k + b]).toBeCloseTo(want.get(a, b), 9);
    }
  });
});
