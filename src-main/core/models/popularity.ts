import { SectionReader, formatVersion, packSections } from '../matrix/bytes.ts';
import type { Csr } from '../matrix/csr.ts';
import { checkHalfLife, decayedValue, recencyWeight, type ValueTransform } from '../matrix/values.ts';
import { InputError } from '../errors.ts';
import { seededRng } from '../rng.ts';
import { DAY_MS, type Dataset } from '../types.ts';
import type { FitReport, Scorer, TopN } from './scorer.ts';
import { topN } from './topn.ts';

/**
 * Time-decayed popularity: Σ over an item's signals of 2^(−age / halfLifeDays), age in days before `now`
 * (default: the latest signal time, never the clock). Signals after `now` count fully; signals without a
 * time count fully (age unknown, not old). Default half-life 30 days: common practice, no source.
 */
export function decayedCounts(ds: Dataset, opts: { halfLifeDays?: number; now?: number; rows?: Int32Array } = {}): Float64Array {
  const half = opts.halfLifeDays ?? 30;
  if (!(half > 0)) throw new InputError(`halfLifeDays must be > 0, got ${half}`);
  const s = ds.signals;
  const count = opts.rows ? opts.rows.length : s.length;
  const pick = (k: number): number => (opts.rows ? opts.rows[k]! : k);
  let now = opts.now ?? -Infinity;
  if (opts.now === undefined) {
    for (let k = 0; k < count; k++) {
      const t = s.at[pick(k)]!;
      if (t > now) now = t; // false for NaN
    }
  }
  const out = new Float64Array(ds.items.length);
  for (let k = 0; k < count; k++) {
    const j = pick(k);
    const t = s.at[j]!;
    out[s.item[j]!]! += t === t ? recencyWeight(Math.max(0, now - t) / DAY_MS, half) : 1;
  }
  return out;
}

export interface TrendParams {
  /** End of the recent window (unix ms, exclusive). Default: just after the latest signal. */
  now?: number;
  /** Length of each window in days. Default 14 (common practice, no source). */
  windowDays?: number;
  /** Smoothing added to the recent count. Default 5 (common practice, no source). */
  a?: number;
  /** Smoothing added to the previous count. Default 5 (common practice, no source). */
  b?: number;
}

/**
 * Trend per item: (recent + a) / (previous + b), with recent = signals in [now − w, now) and previous =
 * signals in [now − 2w, now − w). With a = b the ratio is 1 for an item without signals and moves away
 * from 1 only as evidence accumulates, so one view of a new item does not make it "trending".
 */
export function trendRatios(ds: Dataset, params: TrendParams = {}): Float64Array {
  const a = params.a ?? 5;
  const b = params.b ?? 5;
  if (!(a >= 0 && b > 0)) throw new InputError(`trend smoothing needs a >= 0 and b > 0, got a=${a}, b=${b}`);
  const { recent, previous } = trendWindows(ds, params);
  for (let i = 0; i < recent.length; i++) recent[i] = (recent[i]! + a) / (previous[i]! + b);
  return recent;
}

/** The two windows trendRatios compares, as counts: what an editor is told when an item is rising. */
export interface TrendWindows {
  /** End of the recent window (unix ms, exclusive). */
  now: number;
  windowDays: number;
  /** Signals per dense item in [now − w, now) and in [now − 2w, now − w). */
  recent: Float64Array;
  previous: Float64Array;
  /** The one signal kind code of each item's signals in both windows; -1 none, -2 more than one kind. */
  kind: Int8Array;
}

/** Counts each item's signals in the recent and previous windows (defaults as trendRatios'). */
export function trendWindows(ds: Dataset, params: Pick<TrendParams, 'now' | 'windowDays'> = {}): TrendWindows {
  const windowDays = params.windowDays ?? 14;
  const w = windowDays * DAY_MS;
  if (!(w > 0)) throw new InputError(`windowDays must be > 0, got ${params.windowDays}`);
  const s = ds.signals;
  let now = params.now ?? -Infinity;
  if (params.now === undefined) {
    for (let k = 0; k < s.length; k++) if (s.at[k]! > now) now = s.at[k]!;
    now += 1;
  }
  const recent = new Float64Array(ds.items.length);
  const previous = new Float64Array(ds.items.length);
  const kind = new Int8Array(ds.items.length).fill(-1);
  for (let k = 0; k < s.length; k++) {
    const t = s.at[k]!;
    const i = s.item[k]!;
    if (t >= now - w && t < now) recent[i]!++;
    else if (t >= now - 2 * w && t < now - w) previous[i]!++;
    else continue;
    const was = kind[i]!;
    const c = s.kind[k]!;
    if (was === -1) kind[i] = c;
    else if (was !== c) kind[i] = -2;
  }
  return { now, windowDays, recent, previous, kind };
}

/**
 * The non-personalised baseline: every customer gets the same ranking by a per-item score (popularity,
 * decayed popularity or trend). similarityInto gives every other item its score, so "similar items" are
 * simply the most popular others — what a shelf without any model would show.
 */
/**
 * The name of recent popularity's row where evaluations show it beside the all-time "popularity" baseline
 * (evaluate, the holdout table): the baseline stays all-time counts, as the quality reference's popularity is.
 */
export const RECENT_POPULARITY = 'popularity-recent';

/** Popularity's training parameters: the fit half-life of recent popularity (null or left out: all-time counts). */
export interface PopularityParams {
  fitHalfLifeDays?: number | null;
}

export class PopularityModel implements Scorer {
  readonly kind = 'popularity' as const;
  /** The fit half-life the scores were counted with (null: all-time counts); stored so `models` shows it. */
  constructor(
    readonly scores: Float32Array,
    readonly fitHalfLifeDays: number | null = null,
  ) {}

  get itemCount(): number {
    return this.scores.length;
  }
  scoreInto(_u: number, _history: Csr, out: Float32Array): void {
    out.set(this.scores);
  }
  similarityInto(i: number, out: Float32Array): void {
    out.set(this.scores);
    out[i] = 0;
  }
  similarItems(i: number, n: number): TopN {
    return topN(this.scores, n, i);
  }
  /** Format 2: the scores and the fit half-life (NaN for off); format 1 had the scores only. */
  serialize(): Uint8Array {
    return packSections(MAGIC, 2, [this.scores, Float64Array.of(this.fitHalfLifeDays ?? Number.NaN)]);
  }
}

const MAGIC = 'SWPOPULR';

/** Restores format 2, and format 1 (before recency: all-time counts, half-life off). */
export function loadPopularity(bytes: Uint8Array): PopularityModel {
  const version = formatVersion(bytes);
  if (version === 1) return new PopularityModel(new SectionReader(bytes, MAGIC, 1).f32());
  const r = new SectionReader(bytes, MAGIC, 2);
  const scores = r.f32();
  const h = r.f64();
  if (h.length !== 1 || !(Number.isNaN(h[0]!) || (h[0]! > 0 && Number.isFinite(h[0]!)))) {
    throw new InputError(`not a valid popularity model: half-life ${Array.from(h).join(', ')}`);
  }
  return new PopularityModel(scores, Number.isNaN(h[0]!) ? null : h[0]!);
}

/**
 * Popularity as column sums of an interaction matrix after the value transform (matrix/values.ts). By default
 * presence: the number of distinct customers who interacted with the item, as DESIGN.md's popularity
 * component says; summed raw values would let one wholesale buyer of 10,000 units outweigh a thousand
 * customers. 'linear' keeps the sums (with a matrix built with halfLifeDays: decayed popularity).
 *
 * Recent popularity (`fitHalfLifeDays`, off by default): each entry also weighs 2^(−age / h), age = days since
 * the pair's latest signal (matrix/values.ts "Recency", the law item-kNN and EASE use), so the score is
 * Σ over customers of presence × 2^(−age / h): what customers bought lately rather than ever. Why as a
 * model parameter, beside decayedCounts (the editorial trend dial's per-signal decay): this one counts
 * customers, not signals, as the all-time popularity does, and is chosen on validation by tuning.
 */
export function fitPopularity(x: Csr, values: ValueTransform = 'presence', fitHalfLifeDays: number | null = null): { model: PopularityModel; report: FitReport } {
  const start = performance.now();
  const h = checkHalfLife(fitHalfLifeDays, 'popularity fitHalfLifeDays');
  const scores = new Float32Array(x.cols);
  const total = x.indptr[x.rows]!;
  for (let p = 0; p < total; p++) scores[x.indices[p]!]! += decayedValue(x, p, values, h);
  const notes = h !== null && x.ageDays ? [`popularity: recent counts, half-life ${h} d`] : [];
  return { model: new PopularityModel(scores, h), report: { kind: 'popularity', elapsedMs: performance.now() - start, notes } };
}

/**
 * The random baseline an evaluation compares against: scores uniform in [0, 1), drawn from
 * seededRng(seed ⊕ hash(u)), so the same customer always gets the same scores for the same seed.
 */
export function randomScorer(seed: number, itemCount: number): Scorer {
  const fill = (key: number, out: Float32Array): void => {
    const rng = seededRng((seed ^ Math.imul(key + 1, 0x9e3779b1)) >>> 0);
    for (let j = 0; j < out.length; j++) out[j] = rng.next();
  };
  const similarityInto = (i: number, out: Float32Array): void => {
    fill(-1 - i, out); // negative keys: item streams never coincide with customer streams
    out[i] = 0;
  };
  return {
    kind: 'random',
    itemCount,
    scoreInto: (u, _h, out) => fill(u, out),
    similarityInto,
    similarItems: (i, n) => {
      const out = new Float32Array(itemCount);
      similarityInto(i, out);
      return topN(out, n, i);
    },
    serialize: () => packSections(RANDOM_MAGIC, 1, [Int32Array.of(seed, itemCount)]),
  };
}

const RANDOM_MAGIC = 'SWRANDOM';

export function loadRandom(bytes: Uint8Array): Scorer {
  const [seed, itemCount] = new SectionReader(bytes, RANDOM_MAGIC, 1).i32();
  return randomScorer(seed!, itemCount!);
}
