/**
 * The demo's fixed calendar. Nothing reads the clock: the scenario ends on 2026-11-29, so the same
 * seed gives the same files on any day. Times are whole seconds since the Unix epoch (UTC).
 */

export const DAY_S = 86_400;
export const WEEK_S = 7 * DAY_S;

const utc = (y: number, m: number, d: number): number => Date.UTC(y, m - 1, d) / 1000;

/** Monday 2024-12-02: the shop opens and the first items arrive. Week 0 of the arrival grid. */
export const CATALOGUE_START_S = utc(2024, 12, 2);
/** New items arrive every Monday until this one (2026-11-23), 104 arrival weeks in all. */
export const ARRIVAL_WEEKS = 104;
/** Signals cover 18 months: from 2025-05-30 00:00:00Z up to, not including, 2026-11-30 00:00:00Z. */
export const WINDOW_START_S = utc(2025, 5, 30);
export const WINDOW_END_S = utc(2026, 11, 30);
/** Customers who joined before the window are spread back to this day. */
export const EARLIEST_JOIN_S = utc(2023, 3, 1);

/** Week index on the arrival grid (weeks start on Monday, week 0 = CATALOGUE_START_S). */
export const weekOf = (t: number): number => Math.floor((t - CATALOGUE_START_S) / WEEK_S);
export const weekStart = (w: number): number => CATALOGUE_START_S + w * WEEK_S;
/** Number of grid weeks that any signal can fall in. */
export const GRID_WEEKS = weekOf(WINDOW_END_S - 1) + 1;

const MONTH_OF_WEEK = Int8Array.from({ length: GRID_WEEKS }, (_, w) =>
  new Date((weekStart(w) + 3.5 * DAY_S) * 1000).getUTCMonth(),
);
/** Month (0 = January) that the middle of grid week w falls in. */
export function monthOfWeek(w: number): number {
  return MONTH_OF_WEEK[w] ?? new Date((weekStart(w) + 3.5 * DAY_S) * 1000).getUTCMonth();
}

/** Shop-wide activity by month: gardening peaks in spring, dips in deep winter (illustrative). */
const ACTIVITY_BY_MONTH = [0.7, 0.85, 1.25, 1.5, 1.4, 1.1, 1.0, 0.9, 0.95, 0.9, 0.8, 0.95];
/** By weekday (0 = Sunday): weekends busier. */
const ACTIVITY_BY_WEEKDAY = [1.3, 0.9, 0.9, 0.9, 0.95, 1.0, 1.25];
/** By hour of day (UTC): a morning bump and an evening peak. */
const ACTIVITY_BY_HOUR = [0.3, 0.15, 0.1, 0.08, 0.08, 0.15, 0.4, 0.8, 1.0, 1.0, 1.0, 1.0, 1.2, 1.1, 1.0, 1.0,
  1.0, 1.1, 1.3, 1.6, 1.8, 1.6, 1.1, 0.6];

/** Relative activity of each day in the window (season x weekday x slow growth of the shop). */
export function dailyActivity(): Float64Array {
  const days = (WINDOW_END_S - WINDOW_START_S) / DAY_S;
  const out = new Float64Array(days);
  for (let d = 0; d < days; d++) {
    const date = new Date((WINDOW_START_S + d * DAY_S) * 1000);
    const growth = 0.8 + 0.4 * (d / days);
    out[d] = ACTIVITY_BY_MONTH[date.getUTCMonth()]! * ACTIVITY_BY_WEEKDAY[date.getUTCDay()]! * growth;
  }
  return out;
}

/** Cumulative hour-of-day weights, for drawing a time of day. */
export const HOUR_CUMULATIVE: Float64Array = (() => {
  const c = new Float64Array(24);
  let s = 0;
  for (let h = 0; h < 24; h++) c[h] = s += ACTIVITY_BY_HOUR[h]!;
  return c;
})();

const pad2 = (n: number): string => (n < 10 ? '0' : '') + n;

/** YYYY-MM-DD of a time in seconds. */
export function isoDate(t: number): string {
  return new Date(t * 1000).toISOString().slice(0, 10);
}

/**
 * Formats many timestamps as ISO 8601 UTC with whole seconds (2026-03-14T09:26:53Z), caching the
 * date part per day so that 400k rows do not build 400k Date objects.
 */
export function isoTimeFormatter(): (t: number) => string {
  const days = new Map<number, string>();
  return (t: number): string => {
    const day = Math.floor(t / DAY_S);
    let prefix = days.get(day);
    if (prefix === undefined) {
      prefix = isoDate(day * DAY_S) + 'T';
      days.set(day, prefix);
    }
    const s = t - day * DAY_S;
    const h = Math.floor(s / 3600);
    const m = Math.floor((s % 3600) / 60);
    return prefix + pad2(h) + ':' + pad2(m) + ':' + pad2(s % 60) + 'Z';
  };
}
