import { describe, expect, it } from 'vitest';
import { contentNeighbours, contentVectors, fitContent, loadContent } from '../../src-main/core/models/content.ts';
import { fitTfidf } from '../../src-main/core/text/tfidf.ts';
import { tokenize } from '../../src-main/core/text/tokenize.ts';
import type { Item } from '../../src-main/core/types.ts';
import { describeScorerContract, plantedBlocks } from './contract.ts';

/** An invented catalogue entry. */
function item(id: number, title: string, extra: Partial<Item> = {}): Item {
  return {
    id,
    externalId: `it-${id}`,
    title,
    description: '',
    category: '',
    tags: [],
    supplier: '',
    price: null,
    addedAt: null,
    promoted: false,
    available: true,
    attributes: {},
    ...extra,
  };
}

// Three topics of four items each, matching plantedBlocks' item blocks; each item adds a word of its own.
const TOPICS = ['lantern brass wick', 'garden seed soil', 'violin string bow'];
const UNIQUE = ['amber', 'birch', 'cobalt', 'dune'];
const planted = TOPICS.flatMap((t, b) => UNIQUE.map((u, k) => item(b * 4 + k, `${t} ${u}`)));

describeScorerContract('content', () => {
  const p = plantedBlocks();
  return { ...p, scorer: fitContent(planted, { k: 5 }).model, load: loadContent };
});

describe('contentVectors', () => {
  const items = [
    item(0, 'Copper kettle', { description: 'A whistling kettle', tags: ['kitchen'], category: 'home', supplier: 'Nimbledale', price: 10 }),
    item(1, 'Copper pan', { category: 'home', supplier: 'Orrin & Vale', price: 20 }),
    item(2, 'Star chart', { category: 'books', supplier: 'Nimbledale', price: 30 }),
    item(3, 'Pocket atlas', { category: 'books', price: null }),
  ];

  it('puts the l2-normalised TF-IDF part first, then one-hot attributes at attributeWeight, then renormalises', () => {
    const w = 0.5;
    const { vectors, featureNames } = contentVectors(items, { attributeWeight: w, priceBands: 2 });
    const tf = fitTfidf(items.map((it) => tokenize(`${it.title}\n${it.description}\n${it.tags.join('\n')}`)));
    expect(featureNames.slice(0, tf.vocabulary.length)).toEqual(tf.vocabulary);
    expect(featureNames.slice(tf.vocabulary.length)).toEqual([
      'category:books',
      'category:home',
      'supplier:Nimbledale',
      'supplier:Orrin & Vale',
      'price:0',
      'price:1',
    ]);
    // Item 0: text part has unit norm, plus category, supplier and price band (3 × w): total norm √(1 + 3w²).
    const norm = Math.sqrt(1 + 3 * w * w);
    const dense = new Float64Array(vectors.cols);
    for (let p = vectors.indptr[0]!; p < vectors.indptr[1]!; p++) dense[vectors.indices[p]!] = vectors.data[p]!;
    for (let p = tf.matrix.indptr[0]!; p < tf.matrix.indptr[1]!; p++) {
      expect(dense[tf.matrix.indices[p]!]).toBeCloseTo(tf.matrix.data[p]! / norm, 6);
    }
    const col = (name: string): number => featureNames.indexOf(name);
    expect(dense[col('category:home')]).toBeCloseTo(w / norm, 6);
    expect(dense[col('supplier:Nimbledale')]).toBeCloseTo(w / norm, 6);
    expect(dense[col('price:0')]).toBeCloseTo(w / norm, 6); // prices 10, 20, 30: median edge 20, 10 is below it
    // Item 3 has no price: no band column.
    const row3 = Array.from(vectors.indices.subarray(vectors.indptr[3]!, vectors.indptr[4]!));
    expect(row3).not.toContain(col('price:0'));
    expect(row3).not.toContain(col('price:1'));
  });

  it('gives each non-empty row unit length', () => {
    const { vectors } = contentVectors(items);
    for (let r = 0; r < vectors.rows; r++) {
      let s = 0;
      for (let p = vectors.indptr[r]!; p < vectors.indptr[r + 1]!; p++) s += vectors.data[p]! ** 2;
      expect(s).toBeCloseTo(1, 6);
    }
  });

  it('leaves price out by default, so a shared price band alone makes no similarity', () => {
    // Two items with no word, category or supplier in common, in the same price band.
    const pair = [item(0, 'brass lantern', { price: 5 }), item(1, 'violin bow', { price: 5 }), item(2, 'seed tray', { price: 90 })];
    const plain = contentVectors(pair);
    expect(plain.featureNames.some((f) => f.startsWith('price:'))).toBe(false);
    const m = fitContent(pair).model;
    const sim = new Float32Array(3);
    m.similarityInto(0, sim);
    expect(sim[1]).toBe(0);
    // Asked for, the band one-hot at weight w on a unit text part gives the pair cosine w²/(1 + w²)
    // (hand computation: rows (t, w)/√(1+w²) with orthogonal t).
    const w = 0.5;
    const banded = fitContent(pair, { priceBands: 2, attributeWeight: w }).model;
    banded.similarityInto(0, sim);
    expect(sim[1]).toBeCloseTo((w * w) / (1 + w * w), 6);
  });

  it('rejects a negative attribute weight', () => {
    expect(() => contentVectors(items, { attributeWeight: -1 })).toThrow(/attributeWeight/);
  });
});

describe('contentNeighbours', () => {
  it('keeps the K best cosines of a brute-force comparison of all pairs', () => {
    const words = ['moss', 'fern', 'cedar', 'quartz', 'slate', 'ember', 'tide', 'reed'];
    const items = Array.from({ length: 30 }, (_, i) =>
      item(i, `${words[i % 8]} ${words[(i * 3) % 8]} ${words[(i * 5 + 1) % 8]}`, { category: `c${i % 3}` }),
    );
    const { vectors } = contentVectors(items);
    const k = 4;
    const nb = contentNeighbours(vectors, k);
    const dense = (r: number): Float64Array => {
      const d = new Float64Array(vectors.cols);
      for (let p = vectors.indptr[r]!; p < vectors.indptr[r + 1]!; p++) d[vectors.indices[p]!] = vectors.data[p]!;
      return d;
    };
    for (let i = 0; i < items.length; i++) {
      const a = dense(i);
      const cos = items.map((_, j) => (j === i ? -1 : dense(j).reduce((s, v, f) => s + v * a[f]!, 0)));
      const best = cos.filter((c) => c > 0).sort((x, y) => y - x).slice(0, k);
      const got = Array.from(nb.data.subarray(nb.indptr[i]!, nb.indptr[i + 1]!));
      expect(got.length).toBe(best.length);
      got.forEach((g, q) => expect(g).toBeCloseTo(best[q]!, 5));
    }
  });
});

describe('ContentModel', () => {
  it('scores an item by its mean similarity to the history items', () => {
    const model = fitContent(planted, { k: 11 }).model; // K = all others: every similarity kept
    const p = plantedBlocks();
    const out = new Float32Array(model.itemCount);
    model.scoreInto(p.customer, p.history, out);
    const sim = new Float32Array(model.itemCount);
    const hist = [1, 2, 3];
    const expected = new Float64Array(model.itemCount);
    for (const h of hist) {
      model.similarityInto(h, sim);
      sim.forEach((v, j) => (expected[j]! += v / hist.length));
    }
    out.forEach((v, j) => {
      if (!hist.includes(j)) expect(v).toBeCloseTo(expected[j]!, 6);
    });
  });

  it('scores by exact cosine, not only through the top-K neighbour lists', () => {
    // The quality reference (bench/quality/reference.py `content`) scores with the full cosine matrix, its
    // diagonal zeroed: score(u, j) = mean over the distinct history items h ≠ j of cos(h, j). Checked here
    // against brute-force dense dot products of the item vectors, with lists cut to one neighbour each.
    const model = fitContent(planted, { k: 1 }).model;
    const p = plantedBlocks();
    const hist = Array.from(p.history.indices.subarray(p.history.indptr[p.customer]!, p.history.indptr[p.customer + 1]!));
    const v = model.vectors;
    const dense = (r: number): Float64Array => {
      const d = new Float64Array(v.cols);
      for (let q = v.indptr[r]!; q < v.indptr[r + 1]!; q++) d[v.indices[q]!] = v.data[q]!;
      return d;
    };
    const out = new Float32Array(model.itemCount);
    model.scoreInto(p.customer, p.history, out);
    let beyondLists = 0;
    for (let j = 0; j < model.itemCount; j++) {
      const dj = dense(j);
      const expected = hist.filter((h) => h !== j).reduce((s, h) => s + dense(h).reduce((t, x, f) => t + x * dj[f]!, 0), 0) / hist.length;
      expect(out[j]).toBeCloseTo(expected, 6);
      if (expected > 0 && !hist.some((h) => model.similarItems(h, 1).items.includes(j))) beyondLists++;
    }
    expect(beyondLists).toBeGreaterThan(0); // the check covers items no neighbour list holds
  });

  it('takes the history as presence: quantities do not change the scores', () => {
    // The quality reference (bench/quality/reference.py, `content`) scores with the binary history matrix.
    const model = fitContent(planted, { k: 11 }).model;
    const p = plantedBlocks();
    const heavy = { ...p.history, data: p.history.data.map((v, q) => v * (q + 7)) };
    const a = new Float32Array(model.itemCount);
    const b = new Float32Array(model.itemCount);
    model.scoreInto(p.customer, p.history, a);
    model.scoreInto(p.customer, heavy, b);
    expect(Array.from(b)).toEqual(Array.from(a));
  });

  it('rejects bytes of another model', () => {
    expect(() => loadContent(new Uint8Array(32))).toThrow(/not a valid SWCONTNT model/);
  });
});
