import { describe, expect, it } from 'vitest';
import { packSections } from '../../src-main/core/matrix/bytes.ts';
import { csrFromDense, type Csr } from '../../src-main/core/matrix/csr.ts';
import { ContentModel, loadContent } from '../../src-main/core/models/content.ts';
import { fitPopularity, loadPopularity, PopularityModel } from '../../src-main/core/models/popularity.ts';

/**
 * Recency on popularity's fit side and content's profile side. Every expected value below is computed by hand
 * from the half-life law of the exponential time weight, w = 2^(−age / h) (Ding & Li 2005, "Time weight
 * collaborative filtering", CIKM, in the half-life form: weight ½ after h days), as test/models/recency.test.ts
 * does for item-kNN and EASE.
 */

/** 3 customers × 3 items, presence values (counts 1–4), and an age per entry. */
function aged(): Csr {
  const m = csrFromDense(3, 3, [
    [2, 1, 0],
    [1, 0, 0],
    [4, 0, 3],
  ].flat());
  // Ages by (customer, item): (0,0) 0 d, (0,1) 30 d, (1,0) 10 d, (2,0) 20 d, (2,2) 10 d.
  const byPair: Record<string, number> = { '0,0': 0, '0,1': 30, '1,0': 10, '2,0': 20, '2,2': 10 };
  const ageDays = new Float32Array(m.data.length);
  for (let u = 0; u < 3; u++) for (let p = m.indptr[u]!; p < m.indptr[u + 1]!; p++) ageDays[p] = byPair[`${u},${m.indices[p]!}`]!;
  return { ...m, ageDays };
}

describe('recent popularity', () => {
  it('counts customers weighed by 2^(−age/h) (h = 10 d: 1 + ½ + ¼ for item 0, ⅛ for item 1, ½ for item 2)', () => {
    const m = fitPopularity(aged(), 'presence', 10).model;
    // Presence: the count 2 or 4 counts once; weights 2^(−0/10) + 2^(−10/10) + 2^(−20/10) = 1.75.
    expect(Array.from(m.scores)).toEqual([1.75, 0.125, 0.5]);
    expect(m.fitHalfLifeDays).toBe(10);
    // Off: the number of customers, as before.
    expect(Array.from(fitPopularity(aged()).model.scores)).toEqual([3, 1, 1]);
  });

  it('stores its half-life (format 2), loads a format-1 file with it off, and refuses a bad half-life', () => {
    const m = fitPopularity(aged(), 'presence', 45).model;
    const back = loadPopularity(m.serialize());
    expect(back.fitHalfLifeDays).toBe(45);
    expect(Array.from(back.scores)).toEqual(Array.from(m.scores));
    const old = loadPopularity(packSections('SWPOPULR', 1, [Float32Array.of(3, 1, 1)]));
    expect(old.fitHalfLifeDays).toBeNull();
    expect(Array.from(old.scores)).toEqual([3, 1, 1]);
    expect(loadPopularity(new PopularityModel(Float32Array.of(1)).serialize()).fitHalfLifeDays).toBeNull();
    expect(() => fitPopularity(aged(), 'presence', 0)).toThrow(/popularity fitHalfLifeDays/);
  });
});

describe("content's profile half-life", () => {
  // Three unit item vectors over 2 features: a = (1, 0), b = (0, 1), c = (0.6, 0.8); cosines by hand:
  // cos(c, a) = 0.6, cos(c, b) = 0.8, cos(a, b) = 0.
  const vectors: Csr = { rows: 3, cols: 2, indptr: Int32Array.of(0, 1, 2, 4), indices: Int32Array.of(0, 1, 0, 1), data: Float32Array.of(1, 1, 0.6, 0.8) };
  const noLists = { items: 3, indptr: new Int32Array(4), indices: new Int32Array(0), data: new Float32Array(0) };
  // One customer with a (10 days old) and b (today).
  const history: Csr = { rows: 1, cols: 3, indptr: Int32Array.of(0, 2), indices: Int32Array.of(0, 1), data: Float32Array.of(1, 1), ageDays: Float32Array.of(10, 0) };

  it('weighs each history item by 2^(−age/h) in the mean cosine: (½·0.6 + 1·0.8) / 1.5 for c at h = 10 d', () => {
    const out = new Float32Array(3);
    new ContentModel(vectors, noLists, 10).scoreInto(0, history, out);
    expect(out[2]).toBeCloseTo((0.5 * 0.6 + 1 * 0.8) / 1.5, 6);
    // a: its own cosine is left out, b contributes cos(a, b) = 0: (½·0 + 1·0) / 1.5.
    expect(out[0]).toBeCloseTo(0, 6);
    // Off: the plain mean (0.6 + 0.8) / 2, as before.
    new ContentModel(vectors, noLists).scoreInto(0, history, out);
    expect(out[2]).toBeCloseTo(0.7, 6);
    // A history without ages is not decayed.
    const { ageDays: _, ...timeless } = history;
    new ContentModel(vectors, noLists, 10).scoreInto(0, timeless, out);
    expect(out[2]).toBeCloseTo(0.7, 6);
  });

  it('stores its half-life (format 2) and loads a format-1 file with it off', () => {
    const m = new ContentModel(vectors, noLists, 45);
    expect(loadContent(m.serialize()).profileHalfLifeDays).toBe(45);
    const v1 = packSections('SWCONTNT', 1, [Int32Array.of(3, 2), vectors.indptr, vectors.indices, vectors.data, noLists.indptr, noLists.indices, noLists.data]);
    const old = loadContent(v1);
    expect(old.profileHalfLifeDays).toBeNull();
    expect(() => new ContentModel(vectors, noLists, -1)).toThrow(/content profileHalfLifeDays/);
  });
});
