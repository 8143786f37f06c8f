import { describe, expect, it } from 'vitest';
import { packSections } from '../../src-main/core/matrix/bytes.ts';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitItemKnn, loadItemKnn } from '../../src-main/core/models/itemknn.ts';
import { seededRng } from '../../src-main/core/rng.ts';

/** Presence columns with skewed popularity (a few items in most baskets), as in real logs. */
function basketMatrix(rows: number, cols: number, seed: number): number[] {
  const rng = seededRng(seed);
  const d = new Array<number>(rows * cols).fill(0);
  for (let u = 0; u < rows; u++) for (let t = 0; t < 2 + rng.int(6); t++) d[u * cols + Math.floor(cols * rng.next() ** 2)] = 1;
  return d;
}

/** Sarwar et al. (2001) §3.1.1 cosine with the shrunk denominator, straight from the definition over the dense matrix. */
function cosine(d: number[], rows: number, cols: number, shrink: number, a: number, b: number): number {
  let dot = 0;
  let na = 0;
  let nb = 0;
  for (let u = 0; u < rows; u++) {
    dot += d[u * cols + a]! * d[u * cols + b]!;
    na += d[u * cols + a]! ** 2;
    nb += d[u * cols + b]! ** 2;
  }
  return dot / (Math.sqrt(na) * Math.sqrt(nb) + shrink);
}

describe('item-kNN similarity normalisation (Deshpande & Karypis 2004, ACM TOIS 22(1), §4.2)', () => {
  const rows = 120;
  const cols = 30;
  const d = basketMatrix(rows, cols, 11);
  const x = csrFromDense(rows, cols, d);
  const k = 6;
  const shrink = 2;

  it("scores Σ_h sim(h, j) / Σ_j' sim(h, j') over h's kept neighbours: each history item's similarities sum to 1", () => {
    const plain = fitItemKnn(x, { k, shrink }).model;
    const norm = fitItemKnn(x, { k, shrink, normalize: 'sum' }).model;
    // The paper's model matrix, written from its definition: item h's kept neighbours (from the plain fit, whose
    // lists the first test file checks against the dense cosine), their cosines divided by their sum.
    const m = new Float64Array(cols * cols);
    for (let h = 0; h < cols; h++) {
      const kept = plain.similarItems(h, cols).items;
      let sum = 0;
      for (const j of kept) sum += cosine(d, rows, cols, shrink, h, j);
      for (const j of kept) m[h * cols + j] = cosine(d, rows, cols, shrink, h, j) / sum;
    }
    const out = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      norm.scoreInto(u, x, out);
      for (let j = 0; j < cols; j++) {
        let e = 0;
        for (let h = 0; h < cols; h++) e += d[u * cols + h]! * m[h * cols + j]!;
        expect(out[j]).toBeCloseTo(e, 5);
      }
    }
    // Similar items and their similarities are the cosines either way (the normalisation is a scoring rule).
    for (let i = 0; i < cols; i++) expect(norm.similarItems(i, k)).toEqual(plain.similarItems(i, k));
  });

  it('stores the normalisation (format 3) and reads format 2 models as not normalised', () => {
    const m = fitItemKnn(x, { k, shrink, normalize: 'sum' }).model;
    const back = loadItemKnn(m.serialize());
    expect(back.normalize).toBe('sum');
    const a = new Float32Array(cols);
    const b = new Float32Array(cols);
    for (let u = 0; u < rows; u++) {
      m.scoreInto(u, x, a);
      back.scoreInto(u, x, b);
      expect(Array.from(b)).toEqual(Array.from(a));
    }
    const nb = m.neighbours;
    const v2 = packSections('SWITMKNN', 2, [Int32Array.of(nb.items), nb.indptr, nb.indices, nb.data, Int32Array.of(0)]);
    expect(loadItemKnn(v2).normalize).toBe('none');
    const bad = packSections('SWITMKNN', 3, [Int32Array.of(nb.items), nb.indptr, nb.indices, nb.data, Int32Array.of(0), Int32Array.of(7)]);
    expect(() => loadItemKnn(bad)).toThrow(/unknown normalisation code 7/);
  });

  it('rejects an unknown normalisation, naming the parameter', () => {
    expect(() => fitItemKnn(x, { normalize: 'max' as never })).toThrow(/normalize must be one of none, sum, got max/);
  });
});

describe('item-kNN neighbours tied with the K-th', () => {
  // Item 0 was bought with items 1, 2 and 3 by one customer each, and items 1..3 are alike in popularity, so
  // their cosines with item 0 are equal (1 / (√3·√2 + 0)); item 4 shares two customers with item 0.
  const dense = [
    [1, 1, 0, 0, 1],
    [1, 0, 1, 0, 1],
    [1, 0, 0, 1, 0],
    [0, 1, 1, 1, 0],
  ];
  it('are all kept, whatever the order of the catalogue (Venables & Ripley 2002 §12.3: ties for the kth are included)', () => {
    const rows = dense.length;
    const cols = dense[0]!.length;
    const m = fitItemKnn(csrFromDense(rows, cols, dense.flat()), { k: 2, shrink: 0 }).model;
    const list = m.similarItems(0, 10);
    expect(Array.from(list.items)).toEqual([4, 1, 2, 3]);
    expect(list.scores[1]).toBe(list.scores[3]);
    // The same shop with its items numbered backwards: the same neighbours, renumbered.
    const rev = dense.map((r) => [...r].reverse());
    const mr = fitItemKnn(csrFromDense(rows, cols, rev.flat()), { k: 2, shrink: 0 }).model;
    const back = Array.from(mr.similarItems(cols - 1, 10).items).map((j) => cols - 1 - j);
    expect(new Set(back)).toEqual(new Set([4, 1, 2, 3]));
    expect(back[0]).toBe(4);
  });
});
