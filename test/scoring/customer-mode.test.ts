import { describe, expect, it } from 'vitest';
import { evalTruth, RankingEvaluator, searchBlendWeights } from '../../src-main/core/eval/index.ts';
import type { BlendWeights } from '../../src-main/core/curation/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { CustomerHybrid, HybridScorer, percentileInto } from '../../src-main/core/scoring/index.ts';
import { binaryRows } from '../eval/csr-helper.ts';
import { matrixScorer } from './fakes.ts';

/**
 * A planted world: 40 items in 4 blocks of 10; each customer likes one block. Collaborative similarity
 * is 1 within a block (perfect), content is random noise, popularity favours items of block 0.
 */
const N = 40;
const rng = seededRng(11);
const block = (i: number) => Math.floor(i / 10);
const collab = Array.from({ length: N }, (_, i) => Array.from({ length: N }, (_, j) => (i !== j && block(i) === block(j) ? 1 : 0)));
const noise = Array.from({ length: N }, () => Array.from({ length: N }, () => rng.next()));
const content = noise.map((row, i) => row.map((_, j) => (i === j ? 0 : (noise[i]![j]! + noise[j]![i]!) / 2)));
const customers = 80;
const historyRows: number[][] = [];
const futureRows: number[][] = [];
for (let u = 0; u < customers; u++) {
  const b = u % 4;
  historyRows.push([b * 10 + (u % 10), b * 10 + ((u + 3) % 10)]);
  futureRows.push([b * 10 + ((u + 6) % 10)]);
}
const history = binaryRows(historyRows, N);
const future = binaryRows(futureRows, N);
const data = {
  customersPerItem: Int32Array.from({ length: N }, (_, i) => (block(i) === 0 ? 100 : 10) + (i % 10)),
  trend: null,
  addedAt: new Float64Array(N).fill(Date.UTC(2026, 0, 1)),
};
const hybrid = new HybridScorer(
  { content: matrixScorer('content', content), collaborative: matrixScorer('itemknn', collab), affinity: null },
  data,
);
const w = (p: Partial<BlendWeights>): BlendWeights => ({
  content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 0, freshness: 0, ...p,
});

describe('CustomerHybrid', () => {
  const ch = new CustomerHybrid(hybrid, history, Date.UTC(2026, 5, 1));
  it('with only the collaborative weight, equals the percentile of the collaborative scores', () => {
    const out = new Float32Array(N);
    ch.hybridScoresForCustomer(5, w({ collaborative: 1 }), out);
    const raw = new Float32Array(N);
    matrixScorer('itemknn', collab).scoreInto(5, history, raw);
    const ref = new Float32Array(N);
    percentileInto(raw, N, ref, new Float64Array(N));
    expect(Array.from(out)).toEqual(Array.from(ref));
  });

  it('gives the same blend from the cache as computed directly', () => {
    const weights = w({ content: 1, collaborative: 2, popularity: 0.5 });
    ch.precompute(Int32Array.of(3, 7));
    const a = new Float32Array(N);
    const b = new Float32Array(N);
    ch.hybridScoresForCustomer(7, weights, a);
    ch.blendCached(1, ch.effective(weights), b);
    expect(Array.from(b)).toEqual(Array.from(a));
    expect(() => ch.blendCached(2, ch.effective(weights), b)).toThrow(/not precomputed/);
  });
});

describe('searchBlendWeights', () => {
  it('moves weight to the planted collaborative signal and improves validation NDCG', () => {
    const ev = new RankingEvaluator(history, evalTruth(history, future), 5);
    const ch = new CustomerHybrid(hybrid, history, Date.UTC(2026, 5, 1));
    const start = w({ content: 1, collaborative: 1, popularity: 1, freshness: 1, audience: 1, trend: 1 });
    const startNdcg = ev.evaluateFill('start', (u, _c, out) => ch.hybridScoresForCustomer(u, start, out)).ndcg;
    const r = searchBlendWeights(ev, ch, { start });
    expect(r.result.ndcg).toBeGreaterThan(startNdcg);
    // The planted answer: collaborative alone is perfect (8 same-block candidates, 1 of them true).
    expect(r.weights.collaborative).toBeGreaterThan(0);
    expect(r.weights.collaborative).toBeGreaterThan(r.weights.content);
    expect(r.weights.collaborative).toBeGreaterThan(r.weights.popularity);
    const collabOnly = ev.evaluateFill('c', (u, _c, out) => ch.hybridScoresForCustomer(u, w({ collaborative: 1 }), out));
    expect(r.result.ndcg).toBeGreaterThanOrEqual(collabOnly.ndcg - 0.02);
    expect(r.trials.length).toBeGreaterThan(5);
  });

  it('by default is never worse on the search window than the best single component', () => {
    const ev = new RankingEvaluator(history, evalTruth(history, future), 5);
    const ch = new CustomerHybrid(hybrid, history, Date.UTC(2026, 5, 1));
    const r = searchBlendWeights(ev, ch);
    for (const c of ['content', 'collaborative', 'popularity', 'freshness'] as const) {
      const single = ev.evaluateFill(c, (u, _c, out) => ch.hybridScoresForCustomer(u, w({ [c]: 1 }), out));
      expect(r.result.ndcg).toBeGreaterThanOrEqual(single.ndcg - 1e-9);
    }
  });
});
