import { describe, expect, it } from 'vitest';
import { quantileCuts, splitByTime } from '../../src-main/core/matrix/split.ts';
import type { Dataset, Item } from '../../src-main/core/types.ts';

function withTimes(at: number[]): Dataset {
  const n = at.length;
  return {
    items: [{ id: 0 } as Item],
    customerIds: Int32Array.of(1),
    customerExternalIds: ['c'],
    signals: { length: n, customer: new Int32Array(n), item: new Int32Array(n), kind: new Uint8Array(n), value: new Float32Array(n).fill(1), at: Float64Array.from(at) },
  };
}

describe('splitByTime', () => {
  it('uses the boundaries of lkpy split_global_time: each part runs from its cut (inclusive) to the next (exclusive)', () => {
    // lkpy src/lenskit/splitting/_temporal.py: train is before the first cut, test starts at its cut.
    const ds = withTimes([5, 10, 19, 20, 29, 30, 31, NaN]);
    const s = splitByTime(ds, { validationFrom: 20, testFrom: 30 });
    expect(Array.from(s.train)).toEqual([0, 1, 2, 7]); // untimed signal 7 goes to train
    expect(Array.from(s.validation)).toEqual([3, 4]);
    expect(Array.from(s.test)).toEqual([5, 6]);
  });

  it('allows an empty validation part and rejects cuts in the wrong order', () => {
    const ds = withTimes([1, 2, 3]);
    expect(Array.from(splitByTime(ds, { validationFrom: 3, testFrom: 3 }).validation)).toEqual([]);
    expect(() => splitByTime(ds, { validationFrom: 3, testFrom: 2 })).toThrow(/validationFrom <= testFrom/);
  });
});

describe('quantileCuts', () => {
  it('puts the last 10% of timed signals in test and the 10% before in validation by default', () => {
    const ds = withTimes([...Array.from({ length: 100 }, (_, k) => 100 - k), NaN]);
    const cuts = quantileCuts(ds);
    expect(cuts).toEqual({ validationFrom: 81, testFrom: 91 });
    const s = splitByTime(ds, cuts);
    expect([s.train.length, s.validation.length, s.test.length]).toEqual([81, 10, 10]);
  });

  it('rejects shares that leave no training data and datasets without times', () => {
    expect(() => quantileCuts(withTimes([1, 2, 3, 4]), { testShare: 0.6, validationShare: 0.4 })).toThrow(/sum < 1/);
    expect(() => quantileCuts(withTimes([NaN, NaN]))).toThrow(/at least 3 signals with a time/);
  });
});
