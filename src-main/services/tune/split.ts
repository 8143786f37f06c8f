/**
 * The validation split tuning measures on, carved from the workspace's own signals (issue 6 item 4).
 *
 * - Timed signals (at least half of them carry a time): by time, the last `share` of timed signals is
 *   validation (core/matrix/split.ts, boundaries as lkpy's split_global_time); untimed signals stay in train.
 * - Otherwise: per customer at random. For every customer with at least two distinct items, a seeded
 *   `share` of their distinct items (at least one, never all) is held out, with every signal on those pairs,
 *   so a held-out pair cannot leak into train through a second signal (common practice, no source).
 *
 * A time split stands for "recommend at `from`", so it is measured the way `evaluate --holdout` and
 * `recommend` measure at the end of the history: over the catalogue of that moment. Items that entered the
 * catalogue at or after `from` (their added date, or when it is unknown their first signal) are
 * `unavailable`: never ranked and never truth. Otherwise validation rewards finding items that did not yet
 * exist, which only the content model (and the hybrid's content path for cold items) can do, and the blend
 * is chosen for a task no served list faces (the held-out window of a time split has no such item).
 */
import { InputError } from '../../core/errors.ts';
import { customerItemSets } from '../../core/matrix/by-customer.ts';
import { quantileCuts, splitByTime } from '../../core/matrix/split.ts';
import { seededRng } from '../../core/rng.ts';
import type { Dataset } from '../../core/types.ts';


/**
 * The two refusals of a shop too small to tune: nothing to hold out, or nothing left to measure on what was held
 * out (tune.ts). The default training (train-tuned.ts) falls back to the default settings on either.
 */
export const NOTHING_TO_HOLD_OUT = 'no customer has two or more items: nothing can be held out for tuning';
export const TOO_LITTLE_TO_TUNE = 'no customer has both train history and new validation items: too little data to tune';

/** Whether an error (possibly rebuilt from a worker thread's message) is one of the refusals above. */
export function tooLittleToTune(e: unknown): e is InputError {
  return e instanceof InputError && (e.message === NOTHING_TO_HOLD_OUT || e.message === TOO_LITTLE_TO_TUNE);
}
export interface ValidationSplit {
  method: 'time' | 'random';
  /** Signal indices of each part, in signal order. */
  train: Int32Array;
  validation: Int32Array;
  /** Time validation starts at (method 'time'), else null. */
  from: number | null;
  /** Per item, 1 = not yet in the catalogue at `from` (method 'time'); null for a random split. */
  unavailable: Uint8Array | null;
}

export function validationSplit(ds: Dataset, o: { share?: number; seed?: number } = {}): ValidationSplit {
  const share = o.share ?? 0.2;
  if (!(share > 0 && share < 1)) throw new InputError(`the validation share must be between 0 and 1, got ${share}`);
  const s = ds.signals;
  let timed = 0;
  for (let k = 0; k < s.length; k++) if (s.at[k] === s.at[k]) timed++;
  if (timed >= 3 && timed * 2 >= s.length) {
    const cuts = quantileCuts(ds, { testShare: share, validationShare: 0 });
    const split = splitByTime(ds, cuts);
    return { method: 'time', train: split.train, validation: split.test, from: cuts.testFrom, unavailable: notYetAvailable(ds, cuts.testFrom) };
  }
  return { ...randomSplit(ds, share, o.seed ?? 1), method: 'random', from: null, unavailable: null };
}

/** Items whose added date (else first signal) is at or after `from`; items with neither stay available. */
export function notYetAvailable(ds: Dataset, from: number): Uint8Array {
  const nI = ds.items.length;
  const first = new Float64Array(nI).fill(Infinity);
  const s = ds.signals;
  for (let k = 0; k < s.length; k++) {
    const t = s.at[k]!;
    const i = s.item[k]!;
    if (t < first[i]!) first[i] = t; // NaN never compares below
  }
  return Uint8Array.from(ds.items, (item, i) => {
    const since = item.addedAt ?? (first[i] === Infinity ? null : first[i]!);
    return since !== null && since >= from ? 1 : 0;
  });
}

function randomSplit(ds: Dataset, share: number, seed: number): { train: Int32Array; validation: Int32Array } {
  const s = ds.signals;
  const nC = ds.customerIds.length;
  // Distinct items of each customer, in ascending item order.
  const owned = customerItemSets(s, nC, ds.items.length);
  const rng = seededRng(seed);
  // Held-out flags per distinct (customer, item) pair, at the pair's place in `owned`: typed arrays, not a Set of
  // u * nItems + i keys (past 2^31 those are heap numbers: tens of millions of pairs cost gigabytes and minutes).
  const held = new Uint8Array(owned.indices.length);
  let longest = 0;
  for (let u = 0; u < nC; u++) longest = Math.max(longest, owned.indptr[u + 1]! - owned.indptr[u]!);
  const order = new Int32Array(longest);
  for (let u = 0; u < nC; u++) {
    const start = owned.indptr[u]!;
    const len = owned.indptr[u + 1]! - start;
    if (len < 2) continue;
    const take = Math.min(len - 1, Math.max(1, Math.round(share * len)));
    for (let q = 0; q < len; q++) order[q] = q;
    // Partial Fisher–Yates with the seeded rng over the row's places: the first `take` are held out.
    for (let q = 0; q < take; q++) {
      const j = q + rng.int(len - q);
      const t = order[q]!;
      order[q] = order[j]!;
      order[j] = t;
      held[start + order[q]!] = 1;
    }
  }
  // Each signal's pair, found by binary search in its customer's ascending row.
  const isValidation = new Uint8Array(s.length);
  let nValidation = 0;
  for (let k = 0; k < s.length; k++) {
    const i = s.item[k]!;
    const u = s.customer[k]!;
    let lo = owned.indptr[u]!;
    let hi = owned.indptr[u + 1]! - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (owned.indices[mid]! < i) lo = mid + 1;
      else hi = mid;
    }
    if (held[lo] === 1) {
      isValidation[k] = 1;
      nValidation++;
    }
  }
  if (nValidation === 0) throw new InputError(NOTHING_TO_HOLD_OUT);
  const train = new Int32Array(s.length - nValidation);
  const validation = new Int32Array(nValidation);
  for (let k = 0, a = 0, b = 0; k < s.length; k++) {
    if (isValidation[k] === 1) validation[b++] = k;
    else train[a++] = k;
  }
  return { train, validation };
}

/**
 * Train, validation and test for a log without times (`evaluate`): per customer at random as the tuner's split
 * does, `testShare` of each customer's distinct items held out for test, then `validationShare` (of the whole)
 * from what is left for validation, each with every signal on those pairs; customers with one item stay in train.
 */
export function randomThreeWay(ds: Dataset, o: { testShare?: number; validationShare?: number; seed?: number } = {}): { train: Int32Array; validation: Int32Array; test: Int32Array } {
  const testShare = o.testShare ?? 0.1;
  const validationShare = o.validationShare ?? 0.1;
  const seed = o.seed ?? 1;
  const first = randomSplit(ds, testShare, seed);
  const rest = first.train;
  const s = ds.signals;
  const pick = <T extends Int32Array | Uint8Array | Float32Array | Float64Array>(a: T): T => {
    const out = new (a.constructor as new (n: number) => T)(rest.length);
    for (let q = 0; q < rest.length; q++) out[q] = a[rest[q]!]!;
    return out;
  };
  const sub: Dataset = {
    ...ds,
    signals: { length: rest.length, customer: pick(s.customer), item: pick(s.item), kind: pick(s.kind), value: pick(s.value), at: pick(s.at) },
  };
  const second = randomSplit(sub, validationShare / (1 - testShare), seed + 1);
  return { train: second.train.map((q) => rest[q]!), validation: second.validation.map((q) => rest[q]!), test: first.validation };
}

/**
 * A validation window cut in two for the validated blend (core/eval/validated-blend.ts `confirm`): weights are
 * chosen on `choose` and must hold on `confirm`. A time split is cut at the median time of its signals, so
 * `confirm` is the later half (consecutive windows, as in rolling-origin evaluation); a random split's
 * customers are dealt to one half or the other by a seeded draw, so the halves share no customer.
 */
export function confirmationHalves(ds: Dataset, rows: Int32Array, method: 'time' | 'random', seed: number): { choose: Int32Array; confirm: Int32Array } {
  const s = ds.signals;
  const choose: number[] = [];
  const confirm: number[] = [];
  if (method === 'time') {
    const times = Float64Array.from(rows, (k) => s.at[k]!).filter((t) => t === t).sort();
    const mid = times.length ? times[Math.floor(times.length / 2)]! : Infinity;
    // Untimed signals (rare in a time split) stay with the earlier half, where the weights are chosen.
    for (const k of rows) (s.at[k]! >= mid ? confirm : choose).push(k);
  } else {
    const rng = seededRng(seed + 7919);
    const side = Uint8Array.from({ length: ds.customerIds.length }, () => rng.int(2));
    for (const k of rows) (side[s.customer[k]!] ? confirm : choose).push(k);
  }
  return { choose: Int32Array.from(choose), confirm: Int32Array.from(confirm) };
}
