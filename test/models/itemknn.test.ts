import { describe, expect, it } from 'vitest';
import { packSections } from '../../src-main/core/matrix/bytes.ts';
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
    const m = fitItemKnn(x, { k, shrink, values: 'linear' }).model;
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
    const m = fitItemKnn(x, { k: cols, shrink, values: 'linear' }).model; // K = all: every similarity is kept
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

  it('by default (presence) equals the cosine with shrinkage of the binary matrix, in the fit and in scoring', () => {
    // Sarwar et al. (2001) §3.1.1 over 0/1 columns: the counts 1..5 in d must not change any similarity.
    const binary = d.map((v) => (v > 0 ? 1 : 0));
    const refBinary = denseSimilarity(binary, rows, cols, shrink);
    const m = fitItemKnn(x, { k: 1000, shrink }).model; // k above the catalogue keeps every item ("all")
    expect(m.values).toBe('presence');
    const row = new Float32Array(cols);
    for (let i = 0; i < cols; i++) {
      m.similarityInto(i, row);
      for (let j = 0; j < cols; j++) expect(row[j]).toBeCloseTo(i === j ? 0 : Math.max(0, refBinary[i * cols + j]!), 5);
    }
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      m.scoreInto(u, x, out);
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let h = 0; h < cols; h++) if (h !== j) e += binary[u * cols + h]! * Math.max(0, refBinary[h * cols + j]!);
        expect(out[j]).toBeCloseTo(e, 4);
      }
    }
    expect(loadItemKnn(m.serialize()).values).toBe('presence');
  });

  it('on a hand example, one customer with huge counts moves linear cosines but not presence ones', () => {
    // Items 0, 1, 2; customer 0 plays items 0 and 2 a thousand times, customers 1-3 hold items 0 and 1 once.
    // Presence: ‖x0‖ = 2, ‖x1‖ = √3, ‖x2‖ = 1; x0·x1 = 3, x0·x2 = 1: with shrink 0, sim(0,1) = 3/(2√3) = √3/2,
    // sim(0,2) = 1/2 (worked by hand from Sarwar et al. 2001 §3.1.1).
    const counts = csrFromDense(4, 3, [1000, 0, 1000, 1, 1, 0, 1, 1, 0, 1, 1, 0]);
    const presence = fitItemKnn(counts, { shrink: 0 }).model;
    const row = new Float32Array(3);
    presence.similarityInto(0, row);
    expect(row[1]).toBeCloseTo(Math.sqrt(3) / 2, 6);
    expect(row[2]).toBeCloseTo(1 / 2, 6);
    // Linear: x0 = (1000, 1, 1, 1), x2 = (1000, 0, 0, 0): sim(0,2) ≈ 1, item 1 (three customers) nearly 0.
    const linear = fitItemKnn(counts, { shrink: 0, values: 'linear' }).model;
    linear.similarityInto(0, row);
    expect(row[2]).toBeGreaterThan(0.99);
    expect(row[1]).toBeLessThan(0.01);
    // log(1 + v): in between.
    const log = fitItemKnn(counts, { shrink: 0, values: 'log' }).model;
    log.similarityInto(0, row);
    const l = Math.log1p(1000);
    const l1 = Math.log1p(1);
    expect(row[2]).toBeCloseTo((l * l) / (Math.sqrt(l * l + 3 * l1 * l1) * l), 5);
  });

  it('reads a model saved before transforms (format 1) as linear', () => {
    const m = fitItemKnn(x, { k: 5, shrink, values: 'linear' }).model;
    const nb = m.neighbours;
    const v1 = packSections('SWITMKNN', 1, [Int32Array.of(nb.items), nb.indptr, nb.indices, nb.data]);
    const back = loadItemKnn(v1);
    expect(back.values).toBe('linear');
    expect(Array.from(back.neighbours.indices)).toEqual(Array.from(nb.indices));
  });

  it('shrinks similarities resting on few customers', () => {
    const few = csrFromDense(2, 2, [1, 1, 0, 0]); // items 0 and 1 share a single customer
    expect(fitItemKnn(few, { shrink: 0 }).model.similarItems(0, 1).scores[0]).toBeCloseTo(1, 6);
    expect(fitItemKnn(few, { shrink: 10 }).model.similarItems(0, 1).scores[0]).toBeCloseTo(1 / 11, 6);
  });

  it('rejects k = 0 and a negative shrink, naming the parameter', () => {
    expect(() => fitItemKnn(x, { k: 0 })).toThrow(/k must be a positive integer/);
    expect(() => fitItemKnn(x, { shrink: -1 })).toThrow(/shrink must be >= 0/);
    expect(() => fitItemKnn(x, { values: 'binary' as never })).toThrow(/values must be presence, log or linear, got binary/);
  });

  it('stops with CancelledError when aborted', () => {
    const ac = new AbortController();
    ac.abort();
    expect(() => fitItemKnn(x, {}, { signal: ac.signal })).toThrow(/cancelled/);
  });
});
