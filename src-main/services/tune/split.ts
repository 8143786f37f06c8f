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

/** How many of the signals carry a time: what decides whether a split by time can stand for "recommend now". */
export interface TimeCoverage {
  signals: number;
  timed: number;
}

export function timeCoverage(ds: Dataset): TimeCoverage {
  const s = ds.signals;
  let timed = 0;
  for (let k = 0; k < s.length; k++) if (s.at[k] === s.at[k]) timed++;
  return { signals: s.length, timed };
}

/**
 * The tuner's rule for splitting by time: at least 3 timed signals (quantileCuts' least) and at least half of
 * all signals timed, since untimed signals always stay in train and a split over a timed minority measures
 * that minority (common practice, no source). `evaluate` chooses its split by the same rule.
 */
export function timesCarrySplit(c: TimeCoverage): boolean {
  return c.timed >= 3 && c.timed * 2 >= c.signals;
}

/** Why the tuner's rule refuses a time split, in words an editor reads beside the figures. */
export function noTimeSplitWords(c: TimeCoverage): string {
  return c.timed === 0
    ? `none of the ${c.signals.toLocaleString('en')} signals has a time`
    : `only ${c.timed.toLocaleString('en')} of ${c.signals.toLocaleString('en')} signals have a time (a split by time needs at least half of them, and at least 3)`;
}

export function validationSplit(ds: Dataset, o: { share?: number; seed?: number } = {}): ValidationSplit {
  const share = o.share ?? 0.2;
  if (!(share > 0 && share < 1)) throw new InputError(`the validation share must be between 0 and 1, got ${share}`);
  if (timesCarrySplit(timeCoverage(ds))) {
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

/**
 * The per-customer random holdout above, over `rows` (signal indices; default all signals): `validation` holds
 * the held-out pairs' signals among `rows`, `train` the rest of `rows`. `evaluate` applies it twice (test from
 * all signals, then validation from what is left) when the signals cannot carry a split by time.
 */
export function randomHoldout(ds: Dataset, share: number, seed: number, rows?: Int32Array): { train: Int32Array; validation: Int32Array } {
  if (!(share > 0 && share < 1)) throw new InputError(`the held-out share must be between 0 and 1, got ${share}`);
  if (!rows) return randomSplit(ds, share, seed);
  const s = ds.signals;
  const sub = {
    length: rows.length,
    customer: Int32Array.from(rows, (k) => s.customer[k]!),
    item: Int32Array.from(rows, (k) => s.item[k]!),
    kind: Uint8Array.from(rows, (k) => s.kind[k]!),
    value: Float32Array.from(rows, (k) => s.value[k]!),
    at: Float64Array.from(rows, (k) => s.at[k]!),
  };
  const r = randomSplit({ ...ds, signals: sub }, share, seed);
  return { train: Int32Array.from(r.train, (q) => rows[q]!), validation: Int32Array.from(r.validation, (q) => rows[q]!) };
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
