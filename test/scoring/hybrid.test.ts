import { describe, expect, it } from 'vitest';
import { COMPONENTS, HybridScorer, type HybridItemData } from '../../src-main/core/scoring/index.ts';
import type { BlendWeights } from '../../src-main/core/curation/types.ts';
import { DAY_MS } from '../../src-main/core/types.ts';
import { matrixScorer } from './fakes.ts';

// Six items. Anchors are items 0 and 1; the pool is items 2..5.
const content = [
  [0, 0.9, 0.8, 0.1, 0.5, 0.0],
  [0.9, 0, 0.6, 0.3, 0.7, 0.1],
  [0.8, 0.6, 0, 0.2, 0.3, 0.1],
  [0.1, 0.3, 0.2, 0, 0.1, 0.2],
  [0.5, 0.7, 0.3, 0.1, 0, 0.4],
  [0.0, 0.1, 0.1, 0.2, 0.4, 0],
];
const collab = [
  [0, 0.5, 0.1, 0.9, 0.2, 0.3],
  [0.5, 0, 0.2, 0.8, 0.1, 0.6],
  [0.1, 0.2, 0, 0.3, 0.2, 0.1],
  [0.9, 0.8, 0.3, 0, 0.1, 0.2],
  [0.2, 0.1, 0.2, 0.1, 0, 0.3],
  [0.3, 0.6, 0.1, 0.2, 0.3, 0],
];
const ed = Date.UTC(2026, 5, 1);
const data: HybridItemData = {
  // Item 4 is cold (2 customers < 5).
  customersPerItem: Int32Array.of(50, 40, 30, 20, 2, 10),
  trend: Float32Array.of(1, 1, 0.5, 2, 1, 1.5),
  addedAt: Float64Array.of(ed - 400 * DAY_MS, ed - 300 * DAY_MS, ed - 200 * DAY_MS, ed - 100 * DAY_MS, ed, Number.NaN),
};
const models = { content: matrixScorer('content', content), collaborative: matrixScorer('itemknn', collab), affinity: null };
const only = (c: keyof BlendWeights): BlendWeights => ({
  content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 0, freshness: 0, [c]: 1,
});
const pool = Int32Array.of(2, 3, 4, 5);
const anchors = Int32Array.of(0, 1);

describe('HybridScorer.scorePool', () => {
  it('ranks by the mean anchor similarity when only that weight is set', () => {
    const h = new HybridScorer(models, data);
    // Collaborative means over anchors 0, 1: item 2 → 0.15, 3 → 0.85, 4 → cold, 5 → 0.45.
    const r = h.scorePool({ pool, anchors, weights: only('collaborative'), editionDate: ed });
    const best = r.top(4).map((s) => s.index);
    expect(best[0]).toBe(3);
    expect(r.explain(1).raw.collaborative).toBeCloseTo(0.85, 6);
  });

  it('gives a cold item its content value in place of collaborative and audience, and says so', () => {
    const h = new HybridScorer(models, data);
    const r = h.scorePool({ pool, anchors, weights: { ...only('collaborative'), content: 1 }, editionDate: ed });
    const cold = r.explain(2);
    expect(cold.index).toBe(4);
    expect(cold.coldStart).toBe(true);
    expect(cold.normalised.collaborative).toBe(cold.normalised.content);
    // Content means: 2 → 0.7, 3 → 0.2, 4 → 0.6, 5 → 0.05 → percentile of item 4 is 2/3.
    expect(cold.normalised.content).toBeCloseTo(2 / 3, 6);
    expect(cold.evidence.collaborative).toEqual(cold.evidence.content);
    expect(r.explain(0).coldStart).toBe(false);
  });

  it('has contributions = renormalised weight × normalised value that add up to the blended score', () => {
    const h = new HybridScorer(models, data);
    const weights = { content: 2, collaborative: 1, audience: 5, popularity: 1, trend: 0, freshness: 1 };
    const r = h.scorePool({ pool, anchors, weights, editionDate: ed });
    // No audience affinity given: audience unavailable, the rest renormalised over 2 + 1 + 1 + 1 = 5.
    expect(r.available.audience).toBe(false);
    expect(r.weights.content).toBeCloseTo(0.4, 6);
    for (let p = 0; p < pool.length; p++) {
      const s = r.explain(p);
      let sum = 0;
      for (const c of COMPONENTS) {
        expect(s.contributions[c]).toBeCloseTo(r.weights[c] * s.normalised[c], 6);
        sum += s.contributions[c];
      }
      expect(s.blended).toBeCloseTo(sum, 6);
      expect(s.blended).toBeGreaterThanOrEqual(0);
      expect(s.blended).toBeLessThanOrEqual(1);
    }
  });

  it('lists up to 3 anchors as evidence, strongest first', () => {
    const h = new HybridScorer(models, data);
    const r = h.scorePool({ pool, anchors, weights: only('content'), editionDate: ed });
    expect(r.explain(0).evidence.content).toEqual([
      { item: 0, similarity: expect.closeTo(0.8, 6) as number },
      { item: 1, similarity: expect.closeTo(0.6, 6) as number },
    ]);
    // Item 5 has similarity 0 to anchor 0: only anchor 1 is evidence.
    expect(r.explain(3).evidence.content.map((e) => e.item)).toEqual([1]);
  });

  it('applies boost and sink after blending and reports the percentile of the final score', () => {
    const h = new HybridScorer(models, data);
    const plain = h.scorePool({ pool, anchors, weights: only('content'), editionDate: ed });
    expect(plain.top(1)[0]!.index).toBe(2);
    const sunk = h.scorePool({
      pool, anchors, weights: only('content'), editionDate: ed, multipliers: new Map([[2, 0.1], [3, 2.5]]),
    });
    // Content percentiles: 2 → 1, 4 → 2/3, 3 → 1/3, 5 → 0; item 3 boosted to 5/6, item 2 sunk to 0.1.
    const top = sunk.top(4);
    expect(top[0]!.index).toBe(3);
    expect(top[0]!.score).toBeCloseTo(2.5 / 3, 6);
    expect(top[0]!.percentile).toBe(1);
    expect(top[0]!.blended).toBe(plain.explain(1).blended);
    expect(top.map((t) => t.index)).toEqual([3, 4, 2, 5]);
    expect(top[2]!.multiplier).toBeCloseTo(0.1, 6);
  });

  it('scores freshness and popularity without anchors', () => {
    const h = new HybridScorer(models, data);
    const r = h.scorePool({ pool, anchors: new Int32Array(0), weights: only('freshness'), editionDate: ed });
    expect(r.available.content).toBe(false);
    expect(r.top(4).map((s) => s.index)).toEqual([4, 3, 2, 5]); // newest first; unknown date last
    const p = h.scorePool({ pool, anchors: new Int32Array(0), weights: only('popularity'), editionDate: ed });
    expect(p.top(4).map((s) => s.index)).toEqual([2, 3, 5, 4]);
  });

  it('uses the audience affinity when given', () => {
    const h = new HybridScorer(models, data);
    const aff = Float32Array.of(0, 0, 0.1, 0.2, 0, 0.3);
    const r = h.scorePool({ pool, anchors, weights: only('audience'), editionDate: ed, audienceAffinity: aff });
    // Audience percentiles 4 → 0, 2 → 1/3, 3 → 2/3, 5 → 1; item 4 is cold, so its value becomes its content
    // percentile 2/3 and it ties with item 3 (lower index first). Without the substitution it would be last.
    expect(r.top(4).map((s) => s.index)).toEqual([5, 3, 4, 2]);
  });

  it('names the field for bad weights, indices and lengths', () => {
    const h = new HybridScorer(models, data);
    const bad = { ...only('content'), trend: -1 };
    expect(() => h.scorePool({ pool, anchors, weights: bad, editionDate: ed })).toThrow(/blend weight 'trend'/);
    expect(() => h.scorePool({ pool, anchors: new Int32Array(0), weights: only('content'), editionDate: ed })).toThrow(
      /nothing to score with; components available here: popularity, trend, freshness/,
    );
    expect(() => h.scorePool({ pool: Int32Array.of(9), anchors, weights: only('content'), editionDate: ed })).toThrow(/outside/);
    expect(() =>
      h.scorePool({ pool, anchors, weights: only('audience'), editionDate: ed, audienceAffinity: new Float32Array(2) }),
    ).toThrow(/audience affinity has 2 items/);
    expect(() => new HybridScorer(models, { ...data, addedAt: new Float64Array(2) })).toThrow(/catalogue size 6/);
  });
});

describe('a catalogue and signals without dates', () => {
  it('leaves trend and freshness out, their weight going to the other components, and scores no NaN', () => {
    const undated: HybridItemData = { customersPerItem: data.customersPerItem, trend: null, addedAt: new Float64Array(6).fill(Number.NaN) };
    const h = new HybridScorer(models, undated);
    const weights = { content: 1, collaborative: 1, audience: 0, popularity: 1, trend: 0.5, freshness: 0.5 };
    const r = h.scorePool({ pool, anchors, weights, editionDate: ed });
    expect([r.available.trend, r.available.freshness]).toEqual([false, false]);
    expect([r.weights.trend, r.weights.freshness]).toEqual([0, 0]);
    expect(r.weights.content).toBeCloseTo(1 / 3, 9);
    for (let p = 0; p < pool.length; p++) expect(Number.isFinite(r.explain(p).score)).toBe(true);
    // With one dated item, freshness tells that one apart again.
    const one = new HybridScorer(models, { ...undated, addedAt: Float64Array.of(NaN, NaN, ed, NaN, NaN, NaN) });
    expect(one.scorePool({ pool, anchors, weights, editionDate: ed }).available.freshness).toBe(true);
  });
});
