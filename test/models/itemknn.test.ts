import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitItemKnn, loadItemKnn } from '../../src-main/core/models/itemknn.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { describeScorerContract, plantedBlocks } from './contract.ts';

describeScorerContract('item-kNN', () => {
  const p = plantedBlocks();
  return { ...p, scorer: fitItemKnn(p.history, { k: 5, shrink: 1 }).model, load: loadItemKnn };
});

/** A seeded random sparse matrix with integer weights 1..5, about `density` filled. */
function randomDense(rows: number, cols: number, density: number, seed: number): Float64Array {
  const rng = seededRng(seed);
  const d = new Float64Array(rows * cols);
  for (let k = 0; k < d.length; k++) if (rng.next() < density) d[k] = 1 + rng.int(5);
  return d;
}

/**
 * The slow reference: Sarwar et al. (2001) §3.1.1 cosine between item columns, written straight from the
 * definition over the dense matrix, with the shrunk denominator ‖a‖‖b‖ + shrink.
 */
function denseSimilarity(d: Float64Array, rows: number, cols: number, shrink: number): Float64Array {
  const s = new Float64Array(cols * cols);
  for (let a = 0; a < cols; a++) {
    for (let b = 0; b < cols; b++) {
      if (a === b) continue;
      let dot = 0;
      let na = 0;
      let nb = 0;
      for (let u = 0; u < rows; u++) {
        dot += d[u * cols + a]! * d[u * cols + b]!;
        na += d[u * cols + a]! ** 2;
        nb += d[u * cols + b]! ** 2;
      }
      s[a * cols + b] = dot / (Math.sqrt(na) * Math.sqrt(nb) + shrink);
    }
  }
  return s;
}

describe('fitItemKnn', () => {
  const rows = 60;
  const cols = 40;
  const d = randomDense(rows, cols, 0.15, 7);
  const x = csrFromDense(rows, cols, d);
  const shrink = 10;
  const ref = denseSimilarity(d, rows, cols, shrink);

  it('keeps, for every item, the K most similar items of the dense reference with their similarities', () => {
    const k = 8;
    const m = fitItemKnn(x, { k, shrink }).model;
    for (let i = 0; i < cols; i++) {
      const top = m.similarItems(i, k);
      const expected = Array.from({ length: cols }, (_, j) => j)
        .filter((j) => j !== i && ref[i * cols + j]! > 0)
        .sort((a, b) => ref[i * cols + b]! - ref[i * cols + a]! || a - b)
        .slice(0, k);
      expect(top.items.length).toBe(expected.length);
      for (let q = 0; q < expected.length; q++) {
        // Compare similarities, not indices, so float32 near-ties cannot flip the test.
        expect(top.scores[q]).toBeCloseTo(ref[i * cols + expected[q]!]!, 5);
        expect(top.scores[q]).toBeCloseTo(ref[i * cols + top.items[q]!]!, 5);
      }
    }
  });

  it('scores a customer as the history-weighted sum of the kept neighbour similarities', () => {
    const m = fitItemKnn(x, { k: cols, shrink }).model; // K = all: every similarity is kept
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      m.scoreInto(u, x, out);
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let h = 0; h < cols; h++) e += d[u * cols + h]! * ref[h * cols + j]!;
        expect(out[j]).toBeCloseTo(e, 4);
      }
    }
  });

  it('shrinks similarities resting on few customers', () => {
    const few = csrFromDense(2, 2, [1, 1, 0, 0]); // items 0 and 1 share a single customer
    expect(fitItemKnn(few, { shrink: 0 }).model.similarItems(0, 1).scores[0]).toBeCloseTo(1, 6);
    expect(fitItemKnn(few, { shrink: 10 }).model.similarItems(0, 1).scores[0]).toBeCloseTo(1 / 11, 6);
  });

  it('rejects k = 0 and a negative shrink, naming the parameter', () => {
    expect(() => fitItemKnn(x, { k: 0 })).toThrow(/k must be a positive integer/);
    expect(() => fitItemKnn(x, { shrink: -1 })).toThrow(/shrink must be >= 0/);
  });

  it('stops with CancelledError when aborted', () => {
    const ac = new AbortController();
    ac.abort();
    expect(() => fitItemKnn(x, {}, { signal: ac.signal })).toThrow(/cancelled/);
  });
});
