import { InputError } from '../errors.ts';
import { DAY_MS, SIGNAL_KIND_CODE, SIGNAL_KINDS, type Dataset, type SignalKind } from '../types.ts';
import { transpose, type Csr } from './csr.ts';

/**
 * How much one signal of each kind says about a customer's preference. Stronger commitment weighs more:
 * a purchase more than a basket, a basket more than a view. The figures are common practice, no source;
 * editors may override any of them per workspace.
 */
export const DEFAULT_KIND_WEIGHTS: Readonly<Record<SignalKind, number>> = {
  view: 1,
  click: 1,
  read: 1,
  basket: 3,
  purchase: 5,
  rating: 1,
  other: 1,
};

/**
 * Ratings at or below this value carry no positive evidence (on a 1–5 scale, 1 and 2 stars are
 * dislikes): a rating r contributes weight_rating · max(0, r − RATING_NEUTRAL). Common practice, no source.
 */
export const RATING_NEUTRAL = 2.5;

export interface BuildOptions {
  /** Overrides of DEFAULT_KIND_WEIGHTS; a weight of 0 drops that kind. */
  kindWeights?: Partial<Record<SignalKind, number>>;
  /** Exponential time decay: a signal `age` days before `now` weighs 2^(−age / halfLifeDays). */
  halfLifeDays?: number;
  /** Keep only signals with from <= at < to (unix ms). Signals without a time are dropped when a window is set. */
  window?: { from?: number; to?: number };
  /** Reference time for the decay (unix ms). Default: the latest time among the signals used (never the clock). */
  now?: number;
  /** Use only these signal indices (e.g. the train part of a split). Default: all signals. */
  rows?: Int32Array;
}

/**
 * The customers × items interaction matrix (DESIGN.md "Data flow"). Entry (u, i) is the sum over u's
 * signals on i of weight(kind, value) · decay(age). Non-rating signals weigh w_kind · value (value is a
 * count or quantity, usually 1); ratings weigh w_rating · max(0, value − RATING_NEUTRAL); signals whose
 * weight is not positive are left out. Signals without a time are not decayed (age unknown, not old).
 *
 * When any signal used has a time, the matrix also carries `ageDays`: per entry, the age in days of the pair's
 * latest signal before `now` (untimed signals count as age 0, i.e. never decayed). Models that weigh entries by
 * recency (matrix/values.ts `decayedValue`) read it; one Float32Array per entry, none for an untimed log.
 *
 * Built without per-signal allocation: weights go into one Float32Array; the entries are counted and
 * filled item-major (a counting sort on items), then transposed, which yields customer rows whose columns
 * are already ascending — an O(nnz) alternative to sorting each row — and duplicates, now adjacent, are
 * summed in place.
 */
export function buildInteractionMatrix(ds: Dataset, opts: BuildOptions = {}): Csr {
  const s = ds.signals;
  const nCustomers = ds.customerIds.length;
  const nItems = ds.items.length;
  const kindWeight = resolveKindWeights(opts.kindWeights);
  const halfLife = opts.halfLifeDays;
  if (halfLife !== undefined && !(halfLife > 0)) throw new InputError(`halfLifeDays must be > 0, got ${halfLife}`);
  const from = opts.window?.from ?? -Infinity;
  const to = opts.window?.to ?? Infinity;
  const windowed = opts.window !== undefined;
  const count = opts.rows ? opts.rows.length : s.length;
  const pick = (k: number): number => (opts.rows ? opts.rows[k]! : k);

  // The latest time among the signals used (untimed ones are NaN and never win), whether or not a half-life is
  // set: every entry's age is counted back from it. `timed` says whether any used signal has a time at all.
  let latest = -Infinity;
  for (let k = 0; k < count; k++) {
    const t = s.at[pick(k)]!;
    if (t > latest && t >= from && t < to) latest = t;
  }
  const timed = latest > -Infinity;
  const now = opts.now ?? latest;

  // Pass 1: weight of every selected signal (0 = left out) and entries per item.
  const w = new Float32Array(count);
  const perItem = new Int32Array(nItems + 1);
  for (let k = 0; k < count; k++) {
    const j = pick(k);
    if (j < 0 || j >= s.length) throw new InputError(`signal index ${j} is out of range 0..${s.length - 1}`);
    const t = s.at[j]!;
    if (windowed && !(t >= from && t < to)) continue;
    const kind = s.kind[j]!;
    const v = s.value[j]!;
    let weight = kind === RATING_CODE ? kindWeight[kind]! * Math.max(0, v - RATING_NEUTRAL) : kindWeight[kind]! * v;
    if (halfLife !== undefined && t === t) weight *= Math.pow(2, -Math.max(0, now - t) / DAY_MS / halfLife);
    weight = Math.fround(weight); // as stored: a weight decayed below Float32's range is left out, not counted
    if (!(weight > 0)) continue;
    const c = s.customer[j]!;
    const i = s.item[j]!;
    if (c < 0 || c >= nCustomers || i < 0 || i >= nItems) {
      throw new InputError(`signal ${j} refers to customer ${c} / item ${i} outside the dataset`);
    }
    w[k] = weight;
    perItem[i + 1]!++;
  }
  for (let i = 0; i < nItems; i++) perItem[i + 1]! += perItem[i]!;

  // Pass 2: fill item-major (customers as columns), then transpose to customer-major with sorted columns.
  const total = perItem[nItems]!;
  const byItem: Csr = {
    rows: nItems,
    cols: nCustomers,
    indptr: perItem,
    indices: new Int32Array(total),
    data: new Float32Array(total),
  };
  // Ages (only when some signal has a time) ride along in item-major order, then are placed by the same counting
  // sort as the transpose's (csr.ts), so position p of the customer-major matrix gets its own entry's age.
  const ages = timed ? new Float32Array(total) : null;
  const next = perItem.slice(0, nItems);
  for (let k = 0; k < count; k++) {
    if (w[k] === 0) continue;
    const j = pick(k);
    const q = next[s.item[j]!]!++;
    byItem.indices[q] = s.customer[j]!;
    byItem.data[q] = w[k]!;
    if (ages) {
      const t = s.at[j]!;
      ages[q] = t === t ? Math.max(0, now - t) / DAY_MS : 0;
    }
  }
  const m = transpose(byItem);
  if (ages) {
    const ageDays = new Float32Array(total);
    const at = m.indptr.slice(0, nCustomers);
    for (let i = 0; i < nItems; i++) {
      for (let p = byItem.indptr[i]!, e = byItem.indptr[i + 1]!; p < e; p++) ageDays[at[byItem.indices[p]!]!++] = ages[p]!;
    }
    m.ageDays = ageDays;
  }
  return mergeDuplicates(m);
}

const RATING_CODE = SIGNAL_KIND_CODE.rating;

/** Weights indexed by kind code (SIGNAL_KIND_CODE). */
export function resolveKindWeights(over: Partial<Record<SignalKind, number>> | undefined): Float64Array {
  const out = new Float64Array(SIGNAL_KINDS.length);
  SIGNAL_KINDS.forEach((kind) => {
    const v = over?.[kind] ?? DEFAULT_KIND_WEIGHTS[kind];
    if (!Number.isFinite(v) || v < 0) throw new InputError(`weight for kind '${kind}' must be a finite number >= 0, got ${v}`);
    out[SIGNAL_KIND_CODE[kind]] = v;
  });
  return out;
}

/**
 * Sums adjacent equal columns of each (sorted) row in place and compacts the arrays. With `ageDays`, a merged
 * entry keeps the smallest age: the age of the pair's latest signal.
 */
export function mergeDuplicates(m: Csr): Csr {
  const age = m.ageDays;
  let q = 0;
  let start = 0;
  for (let r = 0; r < m.rows; r++) {
    const end = m.indptr[r + 1]!;
    let last = -1;
    for (let p = start; p < end; p++) {
      const c = m.indices[p]!;
      if (c === last) {
        m.data[q - 1]! += m.data[p]!;
        if (age && age[p]! < age[q - 1]!) age[q - 1] = age[p]!;
      } else {
        m.indices[q] = c;
        if (age) age[q] = age[p]!;
        m.data[q++] = m.data[p]!;
        last = c;
      }
    }
    start = end;
    m.indptr[r + 1] = q;
  }
  if (q === m.indices.length) return m;
  return { ...m, indices: m.indices.slice(0, q), data: m.data.slice(0, q), ...(age && { ageDays: age.slice(0, q) }) };
}
