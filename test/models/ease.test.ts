import { Matrix, inverse, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitEase, loadEase } from '../../src-main/core/models/ease.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { describeScorerContract, plantedBlocks } from './contract.ts';

describeScorerContract('EASE', () => {
  const p = plantedBlocks();
  return { ...p, scorer: fitEase(p.history, { lambda: 1 }).model, load: loadEase };
});

function randomDense(rows: number, cols: number, seed: number): number[][] {
  const rng = seededRng(seed);
  return Array.from({ length: rows }, () => Array.from({ length: cols }, () => (rng.next() < 0.3 ? 1 + rng.int(3) : 0)));
}

describe('fitEase', () => {
  const rows = 40;
  const cols = 12;
  const dense = randomDense(rows, cols, 3);
  const x = csrFromDense(rows, cols, dense.flat());
  const lambda = 5;

  it('gives B = I − P·diag(1/diag P), P = (XᵀX + λI)⁻¹, as computed with ml-matrix (Steck 2019, eq. 8)', () => {
    // Reference: ml-matrix `inverse` for P and, independently, `solve` for the columns of P.
    const X = new Matrix(dense);
    const G = X.transpose().mmul(X).add(Matrix.eye(cols).mul(lambda));
    const P = inverse(G);
    const P2 = solve(G, Matrix.eye(cols));
    const model = fitEase(x, { lambda, values: 'linear' }).model;
    const row = new Float32Array(cols);
    for (let i = 0; i < cols; i++) {
      model.similarityInto(i, row);
      for (let j = 0; j < cols; j++) {
        const expected = i === j ? 0 : -P.get(i, j) / P.get(j, j);
        expect(Math.abs(row[j]! - expected)).toBeLessThan(1e-6);
        expect(Math.abs(row[j]! - (i === j ? 0 : -P2.get(i, j) / P2.get(j, j)))).toBeLessThan(1e-6);
      }
    }
  });

  it('by default fits and scores the binary matrix (presence), as Steck (2019) does, whatever the counts', () => {
    // Reference: ml-matrix on X with every count replaced by 1 (Steck 2019 §3: X is a binary matrix).
    const binary = dense.map((r) => r.map((v) => (v > 0 ? 1 : 0)));
    const X = new Matrix(binary);
    const P = inverse(X.transpose().mmul(X).add(Matrix.eye(cols).mul(lambda)));
    const model = fitEase(x, { lambda }).model;
    expect(model.values).toBe('presence');
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      model.scoreInto(u, x, out); // x holds counts 1..3: scoring sees them as presence too
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let i = 0; i < cols; i++) if (i !== j) e += binary[u]![i]! * (-P.get(i, j) / P.get(j, j));
        expect(out[j]).toBeCloseTo(e, 5);
      }
    }
    expect(loadEase(model.serialize()).values).toBe('presence');
    expect(loadEase(fitEase(x, { lambda, values: 'log' }).model.serialize()).values).toBe('log');
  });

  it('has a zero diagonal and scores x_u · B', () => {
    const model = fitEase(x, { lambda, values: 'linear' }).model;
    for (let i = 0; i < cols; i++) expect(model.b[i * cols + i]).toBe(0);
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      model.scoreInto(u, x, out);
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let i = 0; i < cols; i++) e += dense[u]![i]! * model.b[i * cols + j]!;
        expect(out[j]).toBeCloseTo(e, 5);
      }
    }
  });

  it('refuses a catalogue above maxItems with a clear InputError', () => {
    expect(() => fitEase(x, { maxItems: 5 })).toThrow(/above the limit of 5 items.*restrict/);
  });

  it('with restrict keeps the most active items, scores the rest 0 and says so in the report', () => {
    const counts = Array.from({ length: cols }, (_, j) => dense.reduce((s, r) => s + (r[j]! > 0 ? 1 : 0), 0));
    const order = counts.map((c, j) => [c, j] as const).sort((a, b) => b[0] - a[0] || a[1] - b[1]);
    const expectedKept = order.slice(0, 5).map(([, j]) => j).sort((a, b) => a - b);
    const { model, report } = fitEase(x, { maxItems: 5, restrict: true, lambda });
    expect(Array.from(model.kept)).toEqual(expectedKept);
    expect(report.notes.join(' ')).toMatch(/restricted to the 5 most active of 12 items/);
    const out = new Float32Array(cols);
    model.scoreInto(0, x, out);
    for (let j = 0; j < cols; j++) if (!expectedKept.includes(j)) expect(out[j]).toBe(0);
    // The kept block equals EASE fitted on the kept columns alone.
    const sub = dense.map((r) => expectedKept.map((j) => r[j]!));
    const alone = fitEase(csrFromDense(rows, 5, sub.flat()), { lambda }).model;
    for (let k = 0; k < 25; k++) expect(model.b[k]).toBeCloseTo(alone.b[k]!, 6);
  });

  it('reports progress per phase of the inverse and stops with CancelledError when aborted', () => {
    const seen: number[] = [];
    fitEase(x, { lambda }, { onIteration: (p) => seen.push(p.iteration) });
    expect(seen).toEqual([1, 2, 3, 4]);
    const ac = new AbortController();
    expect(() =>
      fitEase(x, { lambda }, { signal: ac.signal, onIteration: (p) => (p.iteration === 1 ? ac.abort() : undefined) }),
    ).toThrow(/cancelled/);
  });

  it('rejects lambda <= 0 and an unknown transform, naming the parameter', () => {
    expect(() => fitEase(x, { lambda: 0 })).toThrow(/lambda must be > 0/);
    expect(() => fitEase(x, { values: 'sqrt' as never })).toThrow(/values must be presence, log or linear, got sqrt/);
  });
});
