import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { CancelledError, InputError, ModelFitError } from '../../src-main/core/errors.ts';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitIals, loadIals } from '../../src-main/core/models/ials.ts';
import { topN } from '../../src-main/core/models/topn.ts';
import { randomInteractions } from './ials-fixtures.ts';

/**
 * The planted answer of benfred/implicit's tests/recommender_base_test.py (a checkerboard with the
 * diagonal withheld): customer u has every item of its own parity except item u, so item u must be
 * the best item u has not seen.
 */
function checkerboard(n: number) {
  const dense = new Float64Array(n * n);
  for (let u = 0; u < n; u++) for (let i = 0; i < n; i++) if ((u + i) % 2 === 0 && u !== i) dense[u * n + i] = 1;
  return csrFromDense(n, n, dense);
}

const small = { factors: 8, regularization: 0.01, alpha: 2, iterations: 10, seed: 42 };

describe('IalsModel', () => {
  it('ranks the withheld diagonal item first among unseen items (planted checkerboard)', () => {
    const n = 20;
    const m = checkerboard(n);
    // The board has rank 2; with many factors and almost no regularisation a model can learn the
    // withheld zeros themselves (overfitting), so this check uses a few factors and λ = 0.1.
    const { model } = fitIals(m, { ...small, factors: 3, regularization: 0.1 });
    const scores = new Float32Array(n);
    for (let u = 0; u < n; u++) {
      model.scoreInto(u, m, scores);
      const seen = new Uint8Array(n);
      for (let q = m.indptr[u]!; q < m.indptr[u + 1]!; q++) seen[m.indices[q]!] = 1;
      expect(topN(scores, 1, -1, seen).items[0]).toBe(u);
    }
  });

  it('is deterministic given a seed, and the seed matters', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const a = fitIals(m, small).model;
    const b = fitIals(m, small).model;
    const c = fitIals(m, { ...small, seed: 43 }).model;
    expect(Buffer.from(a.itemFactors.buffer).equals(Buffer.from(b.itemFactors.buffer))).toBe(true);
    expect(Buffer.from(a.customerFactors.buffer).equals(Buffer.from(b.customerFactors.buffer))).toBe(true);
    expect(Buffer.from(a.itemFactors.buffer).equals(Buffer.from(c.itemFactors.buffer))).toBe(false);
  });

  it('throws CancelledError at the next iteration boundary after an abort', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const ctl = new AbortController();
    const seen: number[] = [];
    const run = () =>
      fitIals(m, small, {
        signal: ctl.signal,
        onIteration: (p) => {
          seen.push(p.iteration);
          if (p.iteration === 2) ctl.abort();
        },
      });
    expect(run).toThrow(CancelledError);
    expect(seen).toEqual([1, 2]);
    expect(() => fitIals(m, small, { signal: AbortSignal.abort() })).toThrow(CancelledError);
  });

  it('reports progress with a loss per iteration', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const seen: { iteration: number; iterations: number; loss?: number }[] = [];
    const { report } = fitIals(m, { ...small, iterations: 3 }, { onIteration: (p) => seen.push(p) });
    expect(seen.map((p) => p.iteration)).toEqual([1, 2, 3]);
    expect(seen.every((p) => p.iterations === 3)).toBe(true);
    expect(report.losses).toEqual(seen.map((p) => p.loss));
    expect(report.kind).toBe('ials');
  });

  it('fails loudly with ModelFitError when the factors overflow', () => {
    const m = csrFromDense(2, 2, [3e38, 1, 0, 2e38]);
    expect(() => fitIals(m, { ...small, alpha: 10 })).toThrow(ModelFitError);
  });

  it('refuses bad parameters and non-finite input, naming the problem', () => {
    const m = randomInteractions(5, 5, 0.3, 1);
    expect(() => fitIals(m, { factors: 0 })).toThrow(/factors must be an integer/);
    expect(() => fitIals(m, { cgSteps: 0 })).toThrow(InputError);
    expect(() => fitIals(m, { scaling: 'cubic' as 'log' })).toThrow(/scaling/);
    const bad = csrFromDense(2, 2, [1, Number.NaN, 0, 1]);
    expect(() => fitIals(bad, small)).toThrow(/non-finite value \(NaN\) at customer 0, item 1/);
  });

  it('trains with log scaling (Hu et al. 2008: c = 1 + α·log(1 + r/ε))', () => {
    const n = 20;
    const m = checkerboard(n);
    const { model, report } = fitIals(m, { ...small, scaling: 'log', alpha: 5 });
    expect(report.losses!.at(-1)!).toBeLessThan(report.losses![0]!);
    const scores = new Float32Array(n);
    model.scoreInto(0, m, scores);
    expect(scores[0]!).toBeGreaterThan(scores[1]!);
  });

  it('round-trips through serialize / loadIals, also from an unaligned buffer', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const { model } = fitIals(m, small);
    const bytes = model.serialize();
    const shifted = new Uint8Array(bytes.length + 1);
    shifted.set(bytes, 1);
    const back = loadIals(shifted.subarray(1));
    expect(Array.from(back.itemFactors)).toEqual(Array.from(model.itemFactors));
    expect(Array.from(back.customerFactors)).toEqual(Array.from(model.customerFactors));
    expect(back.params).toEqual(model.params);
    expect(() => loadIals(bytes.subarray(0, bytes.length - 4))).toThrow(/length does not match/);
    expect(() => loadIals(new Uint8Array(30))).toThrow(/wrong header/);
  });

  it('similarityInto is the cosine of item factors (textbook definition), 0 for the item itself', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const { model } = fitIals(m, small);
    const k = model.factors;
    const Y = model.itemFactors;
    const sims = new Float32Array(model.itemCount);
    model.similarityInto(3, sims);
    for (let j = 0; j < model.itemCount; j++) {
      if (j === 3) continue;
      let dot = 0;
      let a = 0;
      let b = 0;
      for (let f = 0; f < k; f++) {
        dot += Y[3 * k + f]! * Y[j * k + f]!;
        a += Y[3 * k + f]! ** 2;
        b += Y[j * k + f]! ** 2;
      }
      expect(sims[j]!).toBeCloseTo(dot / Math.sqrt(a * b), 5);
    }
    expect(sims[3]).toBe(0);
    const top = model.similarItems(3, 5);
    expect(top.items).not.toContain(3);
    for (let q = 1; q < top.scores.length; q++) expect(top.scores[q]!).toBeLessThanOrEqual(top.scores[q - 1]!);
    expect(() => model.similarityInto(99, sims)).toThrow(/outside/);
  });

  it('folds in a customer beyond the trained rows by solving eq. (4) (checked against ml-matrix)', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const { model } = fitIals(m, small);
    // a 26th customer who has items 2, 5 and 9 with values 1, 3, 2
    const later = csrFromDense(26, 18, (() => {
      const d = new Float64Array(26 * 18);
      d[25 * 18 + 2] = 1;
      d[25 * 18 + 5] = 3;
      d[25 * 18 + 9] = 2;
      return d;
    })());
    const k = model.factors;
    const Y = new Matrix(18, k);
    for (let i = 0; i < 18; i++) for (let f = 0; f < k; f++) Y.set(i, f, model.itemFactors[i * k + f]!);
    const c = new Array<number>(18).fill(1);
    c[2] = 1 + 2 * 1;
    c[5] = 1 + 2 * 3;
    c[9] = 1 + 2 * 2;
    const CY = Y.clone();
    for (let i = 0; i < 18; i++) for (let f = 0; f < k; f++) CY.set(i, f, c[i]! * Y.get(i, f));
    const A = Y.transpose().mmul(CY).add(Matrix.eye(k, k).mul(small.regularization));
    const b = Y.transpose().mmul(Matrix.columnVector(c.map((ci, i) => ([2, 5, 9].includes(i) ? ci : 0))));
    const want = solve(A, b).getColumn(0);
    const got = model.foldIn(25, later);
    for (let f = 0; f < k; f++) expect(got[f]!).toBeCloseTo(want[f]!, 4);
    const scores = new Float32Array(18);
    model.scoreInto(25, later, scores);
    let s = 0;
    for (let f = 0; f < k; f++) s += got[f]! * model.itemFactors[5 * k + f]!;
    expect(scores[5]!).toBeCloseTo(s, 5);
    model.scoreInto(40, later, scores); // unknown everywhere: no evidence, all zeros
    expect(scores.every((v) => v === 0)).toBe(true);
  });

  it('folds a trained customer in from a grown history when asked (scoreFromHistoryInto), checked against eq. (4) solved by ml-matrix', () => {
    const m = randomInteractions(25, 18, 0.2, 11);
    const { model } = fitIals(m, small);
    // Customer 3's row after a later window: what training saw, plus item 7 with value 2.
    const d = new Float64Array(25 * 18);
    for (let u = 0; u < 25; u++) for (let q = m.indptr[u]!; q < m.indptr[u + 1]!; q++) d[u * 18 + m.indices[q]!] = m.data[q]!;
    d[3 * 18 + 7] = 2;
    const grown = csrFromDense(25, 18, d);
    const k = model.factors;
    const Y = new Matrix(18, k);
    for (let i = 0; i < 18; i++) for (let f = 0; f < k; f++) Y.set(i, f, model.itemFactors[i * k + f]!);
    // Hu, Koren & Volinsky (2008) eq. (4): x_u = (YᵀC_uY + λI)⁻¹ YᵀC_u p(u), c_ui = 1 + α·r_ui (small's linear α = 2).
    const c = Array.from({ length: 18 }, (_, i) => 1 + 2 * d[3 * 18 + i]!);
    const CY = Y.clone();
    for (let i = 0; i < 18; i++) for (let f = 0; f < k; f++) CY.set(i, f, c[i]! * Y.get(i, f));
    const A = Y.transpose().mmul(CY).add(Matrix.eye(k, k).mul(small.regularization));
    const b = Y.transpose().mmul(Matrix.columnVector(c.map((ci, i) => (d[3 * 18 + i]! > 0 ? ci : 0))));
    const x = solve(A, b).getColumn(0);
    const want = Array.from({ length: 18 }, (_, i) => x.reduce((s, xf, f) => s + xf * model.itemFactors[i * k + f]!, 0));
    const folded = new Float32Array(18);
    model.foldingIn().scoreInto(3, grown, folded);
    for (let i = 0; i < 18; i++) expect(folded[i]!).toBeCloseTo(want[i]!, 4);
    // scoreInto keeps the trained row for a trained customer, so it does not see item 7 join the history.
    const kept = new Float32Array(18);
    model.scoreInto(3, grown, kept);
    let trained = 0;
    for (let f = 0; f < k; f++) trained += model.customerFactors[3 * k + f]! * model.itemFactors[7 * k + f]!;
    expect(kept[7]!).toBeCloseTo(trained, 5);
    expect(Math.abs(folded[7]! - kept[7]!)).toBeGreaterThan(1e-3);
  });
});
