import { InputError } from '../errors.ts';
import type { Dataset } from '../types.ts';

/** Signal indices (into `Dataset.signals`) of each part of a split, in signal order. */
export interface TimeSplit {
  train: Int32Array;
  validation: Int32Array;
  test: Int32Array;
}

export interface TimeCuts {
  /** First instant (unix ms) of the validation part. */
  validationFrom: number;
  /** First instant (unix ms) of the test part; >= validationFrom. */
  testFrom: number;
}

/**
 * A global temporal split with the boundaries of lkpy's `split_global_time`: a part holds the signals at
 * or after its cut and before the next cut, so
 *   train = [start, validationFrom), validation = [validationFrom, testFrom), test = [testFrom, end).
 * Signals without a time (NaN) cannot be placed in time; they go to train, the only part where they
 * cannot leak the future into an evaluation.
 */
export function splitByTime(ds: Dataset, cuts: TimeCuts): TimeSplit {
  const { validationFrom, testFrom } = cuts;
  if (Number.isNaN(validationFrom) || Number.isNaN(testFrom) || validationFrom > testFrom) {
    throw new InputError(`split cuts must satisfy validationFrom <= testFrom, got ${validationFrom} and ${testFrom}`);
  }
  const at = ds.signals.at;
  const n = ds.signals.length;
  let nVal = 0;
  let nTest = 0;
  for (let k = 0; k < n; k++) {
    const t = at[k]!;
    if (t >= testFrom) nTest++;
    else if (t >= validationFrom) nVal++;
  }
  const train = new Int32Array(n - nVal - nTest);
  const validation = new Int32Array(nVal);
  const test = new Int32Array(nTest);
  let a = 0;
  let b = 0;
  let c = 0;
  for (let k = 0; k < n; k++) {
    const t = at[k]!;
    if (t >= testFrom) test[c++] = k;
    else if (t >= validationFrom) validation[b++] = k;
    else train[a++] = k; // includes NaN: every comparison with NaN is false
  }
  return { train, validation, test };
}

/**
 * Cuts at quantiles of signal time so that roughly the last `testShare` of timed signals is test and the
 * `validationShare` before it is validation (defaults 10% / 10%: common practice, no source). Ties at a
 * cut all fall on the later side, so the parts can be a little larger than the shares.
 */
export function quantileCuts(ds: Dataset, shares: { validationShare?: number; testShare?: number } = {}): TimeCuts {
  const testShare = shares.testShare ?? 0.1;
  const validationShare = shares.validationShare ?? 0.1;
  if (!(testShare > 0 && validationShare >= 0 && testShare + validationShare < 1)) {
    throw new InputError(
      `split shares must satisfy testShare > 0, validationShare >= 0 and their sum < 1, got ${testShare} and ${validationShare}`,
    );
  }
  const at = ds.signals.at;
  let timed = 0;
  for (let k = 0; k < ds.signals.length; k++) if (at[k] === at[k]) timed++;
  if (timed < 3) throw new InputError(`a time split needs at least 3 signals with a time, found ${timed}`);
  const times = new Float64Array(timed);
  let q = 0;
  for (let k = 0; k < ds.signals.length; k++) if (at[k] === at[k]) times[q++] = at[k]!;
  times.sort();
  const pos = (share: number): number => Math.min(timed - 1, Math.max(1, Math.floor(timed * (1 - share))));
  return { validationFrom: times[pos(testShare + validationShare)]!, testFrom: times[pos(testShare)]! };
}
