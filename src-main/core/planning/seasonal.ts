/**
 * Seasonal fit: each item's week-of-year demand profile from the history, and a forecast with a named method
 * whose error is measured on held-out weeks beside the seasonal-naive baseline.
 *
 * Method, "smoothed seasonal index" (the multiplicative seasonal factors of classical decomposition, as in
 * Holt-Winters' seasonal component, without trend): for each series y_t (weekly signal counts),
 *   I_k = mean of y_t over weeks of season k / mean of y_t over all weeks      (52 seasons, k = week of year),
 * smoothed over the neighbouring seasons with weights 1 2 3 2 1 (circular), and for an item shrunk towards its
 * category's index by its volume: I = (n·I_item + m·I_category) / (n + m), n = the item's signals, m = 50
 * pseudo-signals (sparse items borrow their category's shape; common practice, no source for m).
 * Forecast for week t: ŷ_t = L · I_season(t), L = the de-seasonalised level of the last 13 training weeks,
 * Σ y / Σ I over them. Baseline, seasonal naive: ŷ_t = y_(t−52).
 * Error: MASE, Hyndman & Koehler (2006), "Another look at measures of forecast accuracy", International
 * Journal of Forecasting 22(4): the mean absolute error scaled by the in-sample mean absolute error of the
 * one-step naive forecast, (1/(n−1)) Σ_{t=2..n} |y_t − y_(t−1)|; averaged over series by the arithmetic mean.
 */
import { DAY_MS } from '../types.ts';

export const SEASONS = 52;
const WEEK_MS = 7 * DAY_MS;
const SHRINK_SIGNALS = 50;
const LEVEL_WEEKS = 13;

/** Week of year 0..51 of a time: days since 1 January / 7, the 53rd partial week folded into the 52nd. */
export function seasonOf(t: number): number {
  const d = new Date(t);
  const jan1 = Date.UTC(d.getUTCFullYear(), 0, 1);
  return Math.min(SEASONS - 1, Math.floor((t - jan1) / WEEK_MS));
}

/** Weekly counts per row (an item, or a category), row-major rows × weeks; week 0 starts at `origin`. */
export interface WeeklySeries {
  origin: number;
  weeks: number;
  rows: number;
  y: Float64Array;
}

/** Counts the signals of each row per 7-day week from `origin` (signals before it or without a time are left out). */
export function weeklySeries(item: Int32Array, at: Float64Array, rowOf: Int32Array, rows: number, origin: number, weeks: number): WeeklySeries {
  const y = new Float64Array(rows * weeks);
  for (let k = 0; k < item.length; k++) {
    const t = at[k]!;
    if (!(t >= origin)) continue;
    const w = Math.floor((t - origin) / WEEK_MS);
    const r = rowOf[item[k]!]!;
    if (w >= weeks || r < 0) continue;
    y[r * weeks + w]! += 1;
  }
  return { origin, weeks, rows, y };
}

/** Season of each week of a series. */
export function seasonsOf(s: WeeklySeries): Int32Array {
  return Int32Array.from({ length: s.weeks }, (_, w) => seasonOf(s.origin + w * WEEK_MS + 3 * DAY_MS));
}

/**
 * The smoothed seasonal index of each row over weeks [0, train), rows × 52, mean 1 over the seasons seen.
 * A season never seen in training gets 1 (no evidence either way). `prior` (rows × 52, with `priorOf` giving
 * each row's prior row and `volume` its signals) shrinks sparse rows towards it.
 */
export function seasonalIndex(
  s: WeeklySeries,
  train: number,
  shrink?: { prior: Float64Array; priorOf: Int32Array; volume: Float64Array },
): Float64Array {
  const season = seasonsOf(s);
  const out = new Float64Array(s.rows * SEASONS);
  const sum = new Float64Array(SEASONS);
  const cnt = new Float64Array(SEASONS);
  const raw = new Float64Array(SEASONS);
  for (let r = 0; r < s.rows; r++) {
    sum.fill(0);
    cnt.fill(0);
    let total = 0;
    // Weeks before the row's first signal are before it existed (an item added later), not weeks of no demand.
    let first = 0;
    while (first < train && s.y[r * s.weeks + first] === 0) first++;
    for (let w = first; w < train; w++) {
      const v = s.y[r * s.weeks + w]!;
      sum[season[w]!]! += v;
      cnt[season[w]!]! += 1;
      total += v;
    }
    const mean = total / Math.max(1, train - first);
    for (let k = 0; k < SEASONS; k++) raw[k] = cnt[k]! === 0 || mean === 0 ? 1 : sum[k]! / cnt[k]! / mean;
    for (let k = 0; k < SEASONS; k++) {
      let acc = 0;
      for (let d = -2; d <= 2; d++) acc += (3 - Math.abs(d)) * raw[(k + d + SEASONS) % SEASONS]!;
      let v = acc / 9;
      if (shrink) {
        const n = shrink.volume[r]!;
        const p = shrink.prior[shrink.priorOf[r]! * SEASONS + k]!;
        v = (n * v + SHRINK_SIGNALS * p) / (n + SHRINK_SIGNALS);
      }
      out[r * SEASONS + k] = v;
    }
  }
  return out;
}

/** Forecasts of row r for weeks [train, train + h) by the seasonal index: level × index. */
export function forecastIndex(s: WeeklySeries, index: Float64Array, r: number, train: number, h: number): Float64Array {
  const season = seasonsOf(s);
  let ys = 0;
  let is = 0;
  for (let w = Math.max(0, train - LEVEL_WEEKS); w < train; w++) {
    ys += s.y[r * s.weeks + w]!;
    is += index[r * SEASONS + season[w]!]!;
  }
  const level = is > 0 ? ys / is : 0;
  return Float64Array.from({ length: h }, (_, j) => {
    const w = train + j;
    const k = w < s.weeks ? season[w]! : seasonOf(s.origin + w * WEEK_MS + 3 * DAY_MS);
    return level * index[r * SEASONS + k]!;
  });
}

/** Seasonal naive: the same week a year (52 weeks) before; NaN where the history does not reach back. */
export function forecastSeasonalNaive(s: WeeklySeries, r: number, train: number, h: number): Float64Array {
  return Float64Array.from({ length: h }, (_, j) => {
    const w = train + j - SEASONS;
    return w >= 0 && w < train ? s.y[r * s.weeks + w]! : NaN;
  });
}

/** MASE (Hyndman & Koehler 2006) of `forecast` against `actual`, scaled by the in-sample one-step naive MAE. NaN when the scale is 0. */
export function mase(actual: ArrayLike<number>, forecast: ArrayLike<number>, insample: ArrayLike<number>): number {
  let scale = 0;
  for (let t = 1; t < insample.length; t++) scale += Math.abs(insample[t]! - insample[t - 1]!);
  scale /= insample.length - 1;
  if (!(scale > 0)) return NaN;
  let e = 0;
  for (let t = 0; t < actual.length; t++) e += Math.abs(actual[t]! - forecast[t]!);
  return e / actual.length / scale;
}

export interface ForecastError {
  method: 'smoothed seasonal index';
  baseline: 'seasonal naive';
  heldOutWeeks: number;
  series: number;
  mase: number;
  baselineMase: number;
}

/**
 * Both methods' MASE over the rows with a usable scale and a seasonal-naive forecast for every held-out
 * week (the last `h` weeks are held out; the index and level see only the weeks before them).
 */
export function forecastError(s: WeeklySeries, index: Float64Array, rows: Iterable<number>, h: number): ForecastError {
  const train = s.weeks - h;
  let a = 0;
  let b = 0;
  let n = 0;
  for (const r of rows) {
    const actual = s.y.subarray(r * s.weeks + train, r * s.weeks + s.weeks);
    const insample = s.y.subarray(r * s.weeks, r * s.weeks + train);
    const naive = forecastSeasonalNaive(s, r, train, h);
    if (naive.some((v) => Number.isNaN(v))) continue;
    const m1 = mase(actual, forecastIndex(s, index, r, train, h), insample);
    const m2 = mase(actual, naive, insample);
    if (!Number.isFinite(m1) || !Number.isFinite(m2)) continue;
    a += m1;
    b += m2;
    n++;
  }
  return { method: 'smoothed seasonal index', baseline: 'seasonal naive', heldOutWeeks: h, series: n, mase: n ? a / n : NaN, baselineMase: n ? b / n : NaN };
}
