import { DAY_MS } from '../types.ts';

/**
 * Freshness of an item at the edition date: exponential decay of its age,
 *
 *   freshness = 2^(−ageDays / halfLifeDays) = exp(−ln 2 · ageDays / halfLifeDays) ∈ (0, 1]
 *
 * so an item added on the edition date scores 1 and one added a half-life earlier 0.5. The default
 * half-life of 30 days matches the meter's "younger than 30 days" reading: a month-old item is half as
 * fresh as a new one (a weekly publication's rhythm; common practice, no source). Items added after the
 * edition date count as age 0; items with no known date get 0 — we do not promote as new what we cannot
 * date.
 */
export const DEFAULT_FRESHNESS_HALF_LIFE_DAYS = 30;

export function freshnessInto(
  addedAt: Float64Array,
  editionDate: number,
  halfLifeDays: number,
  out: Float32Array,
): void {
  if (!(halfLifeDays > 0)) throw new RangeError(`freshness half-life must be > 0 days, got ${halfLifeDays}`);
  const rate = 1 / (halfLifeDays * DAY_MS);
  for (let i = 0; i < addedAt.length; i++) {
    const t = addedAt[i]!;
    out[i] = t === t ? Math.pow(2, -Math.max(0, editionDate - t) * rate) : 0;
  }
}
