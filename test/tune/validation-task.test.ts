/**
 * The validation the tuner and the blend measure on must be the task the held-out evaluation measures
 * (bench/quality/README.md, the protocol of prepare.py on UCI Online Retail, Chen 2015): at the moment of a
 * time cut, rank the catalogue of that moment minus what the customer already has, and find the new items
 * they bought after the cut. A repeat purchase is never a hit and an item that entered the catalogue after
 * the cut is neither ranked nor truth.
 */
import { describe, expect, it } from 'vitest';
import { evalTruth, RankingEvaluator, type Ranker } from '../../src-main/core/eval/index.ts';
import type { Dataset, Item } from '../../src-main/core/types.ts';
import { learnBlend } from '../../src-main/services/tune/blend.ts';
import { validationSplit } from '../../src-main/services/tune/split.ts';
import { binaryRows } from '../eval/csr-helper.ts';

const fixed = (scores: number[]): Ranker => ({ name: 'fixed', scoreInto: (_u, _h, out) => out.set(scores) });

describe('RankingEvaluator with unavailable items', () => {
  // Customer 0 has item 0; truth is item 3. The ranker puts the unavailable item 4 first, item 3 second.
  const history = binaryRows([[0]], 5);
  const window = binaryRows([[0, 3, 4]], 5);
  const scores = [9, 1, 2, 5, 8];
  const unavailable = Uint8Array.of(0, 0, 0, 0, 1);

  it('never ranks them and never counts them as truth; repeats are not truth either', () => {
    const truth = evalTruth(history, window, undefined, unavailable);
    expect(Array.from(truth.items)).toEqual([3]); // 0 is a repeat, 4 did not exist yet
    // Binary NDCG with log2 discount (Järvelin & Kekäläinen 2002): one truth item at rank 1 → 1;
    // at rank 2 (item 4 still ranked above it) → 1/log2(3).
    expect(new RankingEvaluator(history, truth, 2, unavailable).evaluate(fixed(scores)).ndcg).toBeCloseTo(1, 12);
    expect(new RankingEvaluator(history, truth, 2).evaluate(fixed(scores)).ndcg).toBeCloseTo(1 / Math.log2(3), 12);
  });

  it('rejects a mask of the wrong length', () => {
    expect(() => new RankingEvaluator(history, evalTruth(history, window), 2, new Uint8Array(4))).toThrow(/unavailable has 4 items/);
  });
});

/** Items a..f; signals [customer, item, time]. */
function shop(): Dataset {
  const added = [0, 0, null, null, 14, null]; // a, b: long listed; c, d: unknown (c first sold at 15); e: added at 14, unsold; f: nothing known
  const items = added.map((addedAt, i) => ({ id: i + 1, externalId: 'abcdef'[i]!, addedAt }) as Item);
  const rows: [number, number, number][] = [
    [0, 0, 1], [1, 0, 2], [1, 3, 3], [2, 0, 4], [2, 1, 5], [2, 3, 6], [3, 1, 7], [3, 0, 8], [3, 3, 9],
    [4, 0, 10], [4, 1, 11], [4, 3, 12],
    // After the cut (the last 20% of 15 timed signals starts at t = 13):
    [0, 0, 13], // customer 0 buys a again: a repeat, never a hit
    [1, 1, 14], // customer 1 buys b, new to them: the one thing to find
    [0, 2, 15], // customer 0 buys c, which first appears now
  ];
  const n = rows.length;
  return {
    items,
    customerIds: Int32Array.from({ length: 5 }, (_, u) => u + 1),
    customerExternalIds: ['u0', 'u1', 'u2', 'u3', 'u4'],
    signals: {
      length: n,
      customer: Int32Array.from(rows, (r) => r[0]),
      item: Int32Array.from(rows, (r) => r[1]),
      kind: new Uint8Array(n).fill(2),
      value: new Float32Array(n).fill(1),
      at: Float64Array.from(rows, (r) => r[2]),
    },
  };
}

describe('the tuner\'s time validation measures the held-out task', () => {
  it('marks items added (or first sold) at or after the cut as unavailable', () => {
    const s = validationSplit(shop(), { share: 0.2 });
    expect(s.method).toBe('time');
    expect(s.from).toBe(13);
    expect(Array.from(s.unavailable!)).toEqual([0, 0, 1, 0, 1, 0]);
  });

  it('the blend is chosen on customers with a new, then-available item only', async () => {
    const r = await learnBlend(shop(), ['popularity'], {}, { k: 2 });
    // Customer 0's window holds only a repeat (a) and a not-yet-listed item (c): not a validation customer.
    // Customer 1 must find b; with a and d (theirs) out, popularity ranks b first (3 training customers).
    expect(r.validation.customers).toBe(1);
    expect(r.validation.ndcg).toBeCloseTo(1, 12);
    expect(r.validation.method).toBe('time');
  });
});
