import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evalTruth, RankingEvaluator, sampleTruth, type Ranker } from '../../src-main/core/eval/index.ts';
import { averagePrecisionFromHits, hitsAtK, ndcgAtK } from '../../src-main/core/metrics/index.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { binaryRows } from './csr-helper.ts';

/** A ranker with fixed scores per customer (row u of `scores`). */
function fixed(name: string, scores: number[][]): Ranker {
  return { name, scoreInto: (u, _h, out) => out.set(scores[u]!) };
}

describe('evalTruth', () => {
  it('drops customers without history, and truth items already in history', () => {
    const history = binaryRows([[0, 1], [], [2]], 5);
    const window = binaryRows([[1, 3], [4], [2]], 5);
    const t = evalTruth(history, window);
    // customer 0 keeps item 3 (1 is a repeat); 1 has no history; 2 only repeats item 2.
    expect(Array.from(t.customers)).toEqual([0]);
    expect(Array.from(t.items)).toEqual([3]);
  });

  it('rejects matrices of different shapes', () => {
    expect(() => evalTruth(binaryRows([[0]], 3), binaryRows([[0]], 4))).toThrow(/build both from one dataset/);
  });
});

describe('sampleTruth', () => {
  const history = binaryRows(Array.from({ length: 50 }, () => [0]), 3);
  const window = binaryRows(Array.from({ length: 50 }, (_, u) => [1 + (u % 2)]), 3);
  const all = evalTruth(history, window);
  it('keeps at most the cap, ascending, the same for the same seed', () => {
    const a = sampleTruth(all, 10, seededRng(3));
    const b = sampleTruth(all, 10, seededRng(3));
    expect(a.customers.length).toBe(10);
    expect(Array.from(a.customers)).toEqual(Array.from(b.customers));
    expect(Array.from(a.customers)).toEqual(Array.from(a.customers).sort((x, y) => x - y));
    a.customers.forEach((u, c) => expect(a.items[a.ptr[c]!]).toBe(1 + (u % 2)));
  });
  it('returns everything when the cap is not smaller', () => {
    expect(sampleTruth(all, 500, seededRng(1))).toBe(all);
  });
});

describe('RankingEvaluator', () => {
  // 2 customers, 6 items. Customer 0 had items 0 and 1; in the window 2 and 5. Customer 1 had item 5;
  // in the window item 0.
  const history = binaryRows([[0, 1], [5]], 6);
  const window = binaryRows([[2, 5], [0]], 6);
  const truth = evalTruth(history, window);

  it('never ranks history items and measures by the textbook formulas (hand-worked)', () => {
    // Customer 0's scores put history items 0, 1 on top; once removed the list is 3, 2, 4 (K = 3):
    // hit at rank 2 only. NDCG = (1/log2 3) / (1 + 1/log2 3); P = 1/3; R = 1/2; AP = (1/2)/2 (IIR ch. 8).
    // Customer 1's list is 0, 1, 2 (5 removed): hit at rank 1 of 1 → NDCG 1, P 1/3, R 1, AP 1.
    const r = new RankingEvaluator(history, truth, 3).evaluate(
      fixed('fixed', [
        [9, 8, 6, 7, 5, 1],
        [6, 5, 4, 3, 2, 9],
      ]),
    );
    const n0 = 1 / Math.log2(3) / (1 + 1 / Math.log2(3));
    expect(r.customers).toBe(2);
    expect(r.ndcg).toBeCloseTo((n0 + 1) / 2, 6);
    expect(r.precision).toBeCloseTo(1 / 3, 6);
    expect(r.recall).toBeCloseTo(0.75, 6);
    expect(r.cappedRecall).toBeCloseTo(0.75, 6);
    expect(r.map).toBeCloseTo((0.25 + 1) / 2, 6);
    expect(r.hitRate).toBe(1);
    // Lists {3, 2, 4} and {0, 1, 2}: 5 distinct of 6 items.
    expect(r.coverage).toBeCloseTo(5 / 6, 6);
    // p_i from history: items 0, 1, 5 held by 1 of 2 customers (1 bit), others by none (clipped to 1 bit).
    expect(r.novelty).toBeCloseTo(1, 6);
    expect(r.model).toBe('fixed');
    expect(r.k).toBe(3);
  });

  // Property: the heap-based top-K gives the same metrics as a full sort of the non-history items.
  it('matches a full-sort reference on random scores (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.float({ min: 0, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
        fc.array(fc.float({ min: 0, max: 1, noNaN: true }), { minLength: 12, maxLength: 12 }),
        fc.integer({ min: 1, max: 8 }),
        (s0, s1, k) => {
          const h = binaryRows([[0, 3, 7], [1]], 12);
          const w = binaryRows([[2, 5, 9, 11], [4, 6]], 12);
          const t = evalTruth(h, w);
          const r = new RankingEvaluator(h, t, k).evaluate(fixed('x', [s0, s1]));
          const ref = [s0, s1].map((s, u) => {
            const hist = u === 0 ? [0, 3, 7] : [1];
            const f32 = Float32Array.from(s);
            const ranked = Array.from({ length: 12 }, (_, j) => j)
              .filter((j) => !hist.includes(j))
              .sort((a, b) => f32[b]! - f32[a]! || a - b)
              .slice(0, k);
            const tr = new Set(u === 0 ? [2, 5, 9, 11] : [4, 6]);
            return { ndcg: ndcgAtK(ranked, tr, k), ap: averagePrecisionFromHits(hitsAtK(ranked, tr, k), tr.size, k) };
          });
          expect(r.ndcg).toBeCloseTo((ref[0]!.ndcg + ref[1]!.ndcg) / 2, 6);
          expect(r.map).toBeCloseTo((ref[0]!.ap + ref[1]!.ap) / 2, 6);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('gives NaN means and no lists when nobody can be evaluated', () => {
    const t = evalTruth(binaryRows([[]], 3), binaryRows([[1]], 3));
    const r = new RankingEvaluator(binaryRows([[]], 3), t, 2).evaluate(fixed('x', [[1, 2, 3]]));
    expect(r.customers).toBe(0);
    expect(r.ndcg).toBeNaN();
    expect(r.coverage).toBe(0);
  });
});
