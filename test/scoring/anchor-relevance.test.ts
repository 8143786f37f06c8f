import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import type { BlendSpec } from '../../src-main/core/eval/validated-blend.ts';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { fitEase } from '../../src-main/core/models/ease.ts';
import { fitIals } from '../../src-main/core/models/ials.ts';
import { fitPopularity } from '../../src-main/core/models/popularity.ts';
import type { Scorer } from '../../src-main/core/models/scorer.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { anchorHistory, anchorRelevanceInto, BlendScorer, HybridScorer } from '../../src-main/core/scoring/index.ts';
import { InputError } from '../../src-main/core/errors.ts';

/** A random 0/1-ish interaction matrix (counts 1..3, about 35% filled). */
function randomDense(rows: number, cols: number, seed: number): number[][] {
  const rng = seededRng(seed);
  return Array.from({ length: rows }, () => Array.from({ length: cols }, () => (rng.next() < 0.35 ? 1 + rng.int(3) : 0)));
}

const ROWS = 30;
const COLS = 10;
const LAMBDA = 4;
const dense = randomDense(ROWS, COLS, 11);
const x = csrFromDense(ROWS, COLS, dense.flat());
const ease = fitEase(x, { lambda: LAMBDA }).model;
const customersPerItem = Int32Array.from({ length: COLS }, (_, j) => dense.filter((r) => r[j]! > 0).length);
const single = (model: 'ease'): BlendSpec => ({ kind: 'single', model, normalisation: 'zscore', weights: { [model]: 1 }, coldContent: false });

/** Steck (2019) eq. 8 by ml-matrix: B = I − P·diag(1/diag P), P = (XᵀX + λI)⁻¹ on the binary X (presence). */
function referenceB(): Matrix {
  const X = new Matrix(dense.map((r) => r.map((v) => (v > 0 ? 1 : 0))));
  const P = inverse(X.transpose().mmul(X).add(Matrix.eye(COLS).mul(LAMBDA)));
  const B = new Matrix(COLS, COLS);
  for (let i = 0; i < COLS; i++) for (let j = 0; j < COLS; j++) B.set(i, j, i === j ? 0 : -P.get(i, j) / P.get(j, j));
  return B;
}

describe('anchorHistory', () => {
  it('is one row beyond the trained customers listing each anchor once, ascending', () => {
    const h = anchorHistory([4, 1, 4], 30, COLS);
    expect(h.rows).toBe(31);
    expect(Array.from(h.indptr.subarray(0, 31))).toEqual(new Array(31).fill(0));
    expect(h.indptr[31]).toBe(2);
    expect(Array.from(h.indices)).toEqual([1, 4]);
  });

  it('refuses an anchor outside the catalogue', () => {
    expect(() => anchorHistory([3, 12], 5, COLS)).toThrow(InputError);
    expect(() => anchorHistory([3, 12], 5, COLS)).toThrow('anchor item index 12 is outside 0..9');
  });
});

describe('anchor relevance through the validated blend', () => {
  it('of an "EASE only" blend is the sum of the anchors\' rows of B (Steck 2019, eq. 8, computed with ml-matrix)', () => {
    // Outside reference: ml-matrix's inverse of the Gram matrix gives B; a customer with history {a} scores
    // item j as Σ_a B[a, j] (Steck 2019, §2: S = X·B).
    const B = referenceB();
    const blend = new BlendScorer(single('ease'), new Map<string, Scorer>([['ease', ease]]), customersPerItem);
    const anchors = [2, 7];
    const out = new Float32Array(COLS);
    anchorRelevanceInto(blend, anchors, ROWS, out);
    const lowest = Math.min(...Array.from(out));
    for (let j = 0; j < COLS; j++) {
      if (anchors.includes(j)) {
        expect(out[j]).toBe(lowest); // a shelf about the anchors does not propose them again
        continue;
      }
      expect(out[j]).toBeCloseTo(B.get(2, j) + B.get(7, j), 5);
    }
  });

  it('weights each model\'s standardised scores by the blend\'s weights, the anchors left out of the statistics', () => {
    // 0.7 EASE + 0.3 popularity, z-scored per customer over the items not in the (pseudo-)history: computed by
    // hand here from the models' raw scores (the same definition as per-customer.ts; common practice, no source).
    const pop = fitPopularity(x).model;
    const spec: BlendSpec = { kind: 'blend', model: null, normalisation: 'zscore', weights: { ease: 0.7, popularity: 0.3 }, coldContent: false };
    const blend = new BlendScorer(spec, new Map<string, Scorer>([['ease', ease], ['popularity', pop]]), customersPerItem);
    const anchors = [0, 5];
    const out = new Float32Array(COLS);
    anchorRelevanceInto(blend, anchors, ROWS, out);
    const h = anchorHistory(anchors, ROWS, COLS);
    const z = (m: Scorer) => {
      const raw = new Float32Array(COLS);
      m.scoreInto(ROWS, h, raw);
      const rest = Array.from(raw).filter((_, j) => !anchors.includes(j));
      const mean = rest.reduce((s, v) => s + v, 0) / rest.length;
      const sd = Math.sqrt(rest.reduce((s, v) => s + (v - mean) ** 2, 0) / rest.length);
      return Array.from(raw, (v) => (v - mean) / sd);
    };
    const ze = z(ease);
    const zp = z(pop);
    for (let j = 0; j < COLS; j++) if (!anchors.includes(j)) expect(out[j]).toBeCloseTo(0.7 * ze[j]! + 0.3 * zp[j]!, 4);
  });

  it('folds the anchors into iALS as a new customer (never a trained customer\'s vector)', () => {
    const ials = fitIals(x, { factors: 4, iterations: 6, regularization: 0.1, alpha: 2, seed: 3 }).model;
    const spec: BlendSpec = { kind: 'single', model: 'ials', normalisation: 'zscore', weights: { ials: 1 }, coldContent: false };
    const blend = new BlendScorer(spec, new Map<string, Scorer>([['ials', ials]]), customersPerItem);
    const out = new Float32Array(COLS);
    anchorRelevanceInto(blend, [3], ROWS, out);
    const folded = ials.foldIn(ROWS, anchorHistory([3], ROWS, COLS));
    for (let j = 0; j < COLS; j++) {
      if (j === 3) continue;
      let s = 0;
      for (let f = 0; f < 4; f++) s += folded[f]! * ials.itemFactors[j * 4 + f]!;
      expect(out[j]).toBeCloseTo(s, 5);
    }
  });

  it('ranks an anchor shelf\'s pool, with only the collaborative dial, as EASE\'s item-to-item scores would', () => {
    // The hybrid's collaborative component takes the blend's anchor relevance in place of the mean of the
    // collaborative model's similarity rows; min–max within the pool keeps the order.
    const B = referenceB();
    const blend = new BlendScorer(single('ease'), new Map<string, Scorer>([['ease', ease]]), customersPerItem);
    const anchors = Int32Array.of(1, 8);
    const rel = new Float32Array(COLS);
    anchorRelevanceInto(blend, anchors, ROWS, rel);
    // A collaborative model that disagrees with EASE (reversed item order), to show it no longer decides.
    const other: Scorer = {
      kind: 'itemknn',
      itemCount: COLS,
      scoreInto: () => undefined,
      similarityInto: (_i, o) => o.set(Float32Array.from({ length: COLS }, (_, j) => j)),
      similarItems: () => ({ items: new Int32Array(0), scores: new Float32Array(0) }),
      serialize: () => new Uint8Array(0),
    };
    const hybrid = new HybridScorer(
      { content: null, collaborative: other, affinity: null },
      { customersPerItem, trend: null, addedAt: new Float64Array(COLS).fill(0) },
      { normalisation: 'minmax' },
    );
    const pool = Int32Array.from({ length: COLS }, (_, j) => j).filter((j) => j !== 1 && j !== 8);
    const weights = { content: 0, collaborative: 1, audience: 0, popularity: 0, trend: 0, freshness: 0 };
    const s = hybrid.scorePool({ pool, anchors, weights, editionDate: 0, anchorRelevance: rel });
    const ranked = Array.from(s.order(), (p) => pool[p]!);
    const expected = Array.from(pool).sort((a, b) => B.get(1, b) + B.get(8, b) - (B.get(1, a) + B.get(8, a)));
    expect(ranked).toEqual(expected);
    // Without the blend's relevance the other model's rows decide (the fallback).
    const fallback = hybrid.scorePool({ pool, anchors, weights, editionDate: 0 });
    expect(Array.from(fallback.order(), (p) => pool[p]!)).toEqual(Array.from(pool).reverse());
  });

  it('refuses relevance of the wrong length', () => {
    const hybrid = new HybridScorer({ content: null, collaborative: null, affinity: null }, { customersPerItem, trend: null, addedAt: new Float64Array(COLS) });
    const weights = { content: 0, collaborative: 1, audience: 0, popularity: 1, trend: 0, freshness: 0 };
    expect(() => hybrid.scorePool({ pool: Int32Array.of(0, 2), anchors: Int32Array.of(1), weights, editionDate: 0, anchorRelevance: new Float32Array(3) })).toThrow(
      'anchor relevance has 3 items, expected 10',
    );
  });
});
