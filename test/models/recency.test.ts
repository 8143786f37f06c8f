import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { packSections } from '../../src-main/core/matrix/bytes.ts';
import { csrFromDense, type Csr } from '../../src-main/core/matrix/csr.ts';
import { EASE_MAGIC, sparsifyEase } from '../../src-main/core/models/ease-topk.ts';
import { EaseModel, fitEase, loadEase } from '../../src-main/core/models/ease.ts';
import { fitItemKnn, loadItemKnn } from '../../src-main/core/models/itemknn.ts';
import { seededRng } from '../../src-main/core/rng.ts';

/** A random count matrix with a random age (0–400 days) per entry, seeded. */
function agedMatrix(rows: number, cols: number, seed: number): { m: Csr; dense: number[][]; ages: number[][] } {
  const rng = seededRng(seed);
  const dense = Array.from({ length: rows }, () => Array.from({ length: cols }, () => (rng.next() < 0.35 ? 1 + rng.int(3) : 0)));
  const ages = dense.map((r) => r.map((v) => (v > 0 ? rng.int(400) : 0)));
  const m = csrFromDense(rows, cols, dense.flat());
  const ageDays = new Float32Array(m.data.length);
  for (let u = 0; u < rows; u++) for (let p = m.indptr[u]!; p < m.indptr[u + 1]!; p++) ageDays[p] = ages[u]![m.indices[p]!]!;
  return { m: { ...m, ageDays }, dense, ages };
}

/** The matrix without its ages (as built from a log without times). */
const withoutAges = ({ ageDays: _, ...rest }: Csr): Csr => rest;

const decay = (age: number, h: number | null) => (h === null ? 1 : 2 ** (-age / h));

describe('EASE with recency', () => {
  const rows = 40;
  const cols = 10;
  const lambda = 4;
  const { m, dense, ages } = agedMatrix(rows, cols, 11);
  const fitH = 180;
  const profileH = 45;
  // The decayed binary X by hand: x_ui = 1 × 2^(−age/h) where the customer has the item.
  const decayed = (h: number | null) => dense.map((r, u) => r.map((v, i) => (v > 0 ? decay(ages[u]![i]!, h) : 0)));

  it('fits B on the decayed X (Steck 2019 eq. 8 computed with ml-matrix on X_ui = 2^(−age/h)) and scores x_u decayed by the profile half-life', () => {
    // Reference: ml-matrix inverse of XᵀX + λI with X decayed entry by entry (values.ts; Ding & Li 2005's time weight).
    const X = new Matrix(decayed(fitH));
    const P = inverse(X.transpose().mmul(X).add(Matrix.eye(cols).mul(lambda)));
    const B = (i: number, j: number) => (i === j ? 0 : -P.get(i, j) / P.get(j, j));
    const model = fitEase(m, { lambda, fitHalfLifeDays: fitH, profileHalfLifeDays: profileH }).model;
    const row = new Float32Array(cols);
    for (let i = 0; i < cols; i++) {
      model.similarityInto(i, row);
      for (let j = 0; j < cols; j++) expect(Math.abs(row[j]! - B(i, j))).toBeLessThan(1e-5);
    }
    const q = decayed(profileH);
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      model.scoreInto(u, m, out);
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let i = 0; i < cols; i++) e += q[u]![i]! * B(i, j);
        expect(out[j]).toBeCloseTo(e, 5);
      }
    }
  });

  it('with both half-lives off, or on a matrix without ages, is plain EASE', () => {
    const plain = fitEase(withoutAges(m), { lambda }).model;
    const off = fitEase(m, { lambda, fitHalfLifeDays: null, profileHalfLifeDays: null }).model;
    const noAges = fitEase(withoutAges(m), { lambda, fitHalfLifeDays: 30, profileHalfLifeDays: 30 });
    expect(Array.from(off.b)).toEqual(Array.from(plain.b));
    expect(Array.from((noAges.model as EaseModel).b)).toEqual(Array.from(plain.b));
    expect(noAges.report.notes.join(' ')).toMatch(/no signal has a time/);
  });

  it('changes only scoring when the profile half-life is swapped on a fitted model (no refit)', () => {
    const a = fitEase(m, { lambda, fitHalfLifeDays: fitH }).model.withProfileHalfLife(profileH);
    const b = fitEase(m, { lambda, fitHalfLifeDays: fitH, profileHalfLifeDays: profileH }).model;
    const x = new Float32Array(cols);
    const y = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      a.scoreInto(u, m, x);
      b.scoreInto(u, m, y);
      expect(Array.from(x)).toEqual(Array.from(y));
    }
  });

  it('stores its half-lives (dense format 4, top-k format 5) and loads older files with both off', () => {
    const model = fitEase(m, { lambda, fitHalfLifeDays: fitH, profileHalfLifeDays: profileH }).model;
    const back = loadEase(model.serialize());
    expect(back.recency).toEqual({ fitHalfLifeDays: fitH, profileHalfLifeDays: profileH });
    const top = loadEase(sparsifyEase(cols, model.kept, model.b, 4, 'presence', model.recency).serialize());
    expect(top.recency).toEqual({ fitHalfLifeDays: fitH, profileHalfLifeDays: profileH });
    const offOnly = loadEase(fitEase(m, { lambda, profileHalfLifeDays: 90 }).model.serialize());
    expect(offOnly.recency).toEqual({ fitHalfLifeDays: null, profileHalfLifeDays: 90 });
    // Format 2 (dense, transform, no recency) and format 3 (top-k, no recency), as written before format 4/5.
    const v2 = packSections(EASE_MAGIC, 2, [Int32Array.of(cols), model.kept, model.b, Int32Array.of(0)]);
    expect(loadEase(v2).recency).toEqual({ fitHalfLifeDays: null, profileHalfLifeDays: null });
    const t = sparsifyEase(cols, model.kept, model.b, 4);
    const v3 = packSections(EASE_MAGIC, 3, [Int32Array.of(cols), t.kept, t.indptr, t.cols, t.values, Int32Array.of(0)]);
    expect(loadEase(v3).recency).toEqual({ fitHalfLifeDays: null, profileHalfLifeDays: null });
  });

  it('refuses a half-life that is not a number of days > 0, naming the field', () => {
    expect(() => fitEase(m, { lambda, fitHalfLifeDays: 0 })).toThrow(/EASE fitHalfLifeDays must be a number of days > 0/);
    expect(() => fitEase(m, { lambda, profileHalfLifeDays: Number.NaN })).toThrow(/EASE profileHalfLifeDays/);
  });
});

describe('item-kNN with recency', () => {
  const rows = 30;
  const cols = 8;
  const { m, dense, ages } = agedMatrix(rows, cols, 5);
  const fitH = 90;
  const profileH = 30;

  it('takes cosines of the decayed columns and scores Σ_h x_uh·2^(−age/h)·sim(h, j) (Sarwar et al. 2001 §3.1.1, computed by hand)', () => {
    const model = fitItemKnn(m, { k: cols, shrink: 0, fitHalfLifeDays: fitH, profileHalfLifeDays: profileH }).model;
    const col = (i: number, h: number) => dense.map((r, u) => (r[i]! > 0 ? decay(ages[u]![i]!, h) : 0));
    const cos = (i: number, j: number) => {
      const a = col(i, fitH);
      const b = col(j, fitH);
      const dot = a.reduce((s, v, u) => s + v * b[u]!, 0);
      const n = Math.sqrt(a.reduce((s, v) => s + v * v, 0)) * Math.sqrt(b.reduce((s, v) => s + v * v, 0));
      return n > 0 ? dot / n : 0;
    };
    const row = new Float32Array(cols);
    for (let i = 0; i < cols; i++) {
      model.similarityInto(i, row);
      for (let j = 0; j < cols; j++) if (j !== i) expect(row[j]).toBeCloseTo(Math.max(0, cos(i, j)), 5);
    }
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      model.scoreInto(u, m, out);
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let h = 0; h < cols; h++) if (h !== j && dense[u]![h]! > 0) e += decay(ages[u]![h]!, profileH) * Math.max(0, cos(h, j));
        expect(out[j]).toBeCloseTo(e, 5);
      }
    }
  });

  it('stores its half-lives (format 4) and loads format 3 files with both off', () => {
    const model = fitItemKnn(m, { k: 3, fitHalfLifeDays: fitH, profileHalfLifeDays: profileH }).model;
    expect(loadItemKnn(model.serialize()).recency).toEqual({ fitHalfLifeDays: fitH, profileHalfLifeDays: profileH });
    const nb = model.neighbours;
    const v3 = packSections('SWITMKNN', 3, [Int32Array.of(nb.items), nb.indptr, nb.indices, nb.data, Int32Array.of(0), Int32Array.of(0)]);
    expect(loadItemKnn(v3).recency).toEqual({ fitHalfLifeDays: null, profileHalfLifeDays: null });
    expect(() => fitItemKnn(m, { fitHalfLifeDays: -1 })).toThrow(/item-kNN fitHalfLifeDays must be a number of days > 0/);
  });
});
