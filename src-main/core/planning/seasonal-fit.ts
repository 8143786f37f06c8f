/**
 * The planner's seasonal fit from a workspace's signals (seasonal.ts for the method): a category index for
 * every category, each item's index shrunk towards its category's, and the forecast error of the method
 * beside seasonal naive on the last `heldOutWeeks` weeks, for categories and for items with at least one
 * signal a week on average (sparser item series are mostly zeros, where any scaled error says little).
 */
import { DAY_MS } from '../types.ts';
import { SEASONS, forecastError, seasonalIndex, seasonOf, weeklySeries, type ForecastError } from './seasonal.ts';

export interface SeasonalProfile {
  /** items × 52, mean about 1: > 1 where the item's demand peaks. */
  index: Float64Array;
  categoryIndex: Float64Array;
  weeksOfHistory: number;
  error: { categories: ForecastError; items: ForecastError } | null;
}

export interface SignalsIn {
  item: Int32Array;
  at: Float64Array;
  /** Category code of each item. */
  category: Int32Array;
  categories: number;
}

const FIT_MIN = 0.2;
const FIT_MAX = 5;

export function seasonalProfile(input: SignalsIn, heldOutWeeks = 12): SeasonalProfile {
  const nItems = input.category.length;
  let first = Infinity;
  let last = -Infinity;
  for (const t of input.at) {
    if (!Number.isFinite(t)) continue;
    if (t < first) first = t;
    if (t > last) last = t;
  }
  if (!Number.isFinite(first)) {
    return { index: new Float64Array(nItems * SEASONS).fill(1), categoryIndex: new Float64Array(input.categories * SEASONS).fill(1), weeksOfHistory: 0, error: null };
  }
  const origin = Math.floor(first / DAY_MS) * DAY_MS;
  const weeks = Math.floor((last - origin) / (7 * DAY_MS)) + 1;
  const identity = Int32Array.from({ length: nItems }, (_, i) => i);
  const items = weeklySeries(input.item, input.at, identity, nItems, origin, weeks);
  const cats = weeklySeries(input.item, input.at, input.category, input.categories, origin, weeks);
  const volume = new Float64Array(nItems);
  for (const i of input.item) volume[i]! += 1;
  const fitAll = (train: number) => {
    const categoryIndex = seasonalIndex(cats, train);
    const index = seasonalIndex(items, train, { prior: categoryIndex, priorOf: input.category, volume });
    return { categoryIndex, index };
  };
  const all = fitAll(weeks);
  let error: SeasonalProfile['error'] = null;
  // Held-out error needs a year before the held-out weeks (seasonal naive) plus the held-out weeks.
  if (weeks >= SEASONS + heldOutWeeks + 1) {
    const train = weeks - heldOutWeeks;
    const held = fitAll(train);
    const trainVolume = new Float64Array(nItems);
    for (let i = 0; i < nItems; i++) for (let w = 0; w < train; w++) trainVolume[i]! += items.y[i * weeks + w]!;
    const busy: number[] = [];
    for (let i = 0; i < nItems; i++) if (trainVolume[i]! >= train) busy.push(i);
    error = {
      categories: forecastError(cats, held.categoryIndex, identity.subarray(0, input.categories), heldOutWeeks),
      items: forecastError(items, held.index, busy, heldOutWeeks),
    };
  }
  return { index: all.index, categoryIndex: all.categoryIndex, weeksOfHistory: weeks, error };
}

/** The item's seasonal fit in the week starting at t: its index for that week of year, kept in [0.2, 5]. */
export function fitAt(profile: SeasonalProfile, item: number, t: number): number {
  const v = profile.index[item * SEASONS + seasonOf(t + 3 * DAY_MS)]!;
  return Math.min(FIT_MAX, Math.max(FIT_MIN, v));
}
