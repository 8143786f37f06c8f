import { InputError } from '../errors.ts';
import type { Csr } from './csr.ts';

/**
 * How a signal's value enters a model, after kind weights and time decay (DESIGN.md "Methods").
 *
 * The interaction matrix (build.ts) first sums every signal of one (customer, item) pair into one entry:
 * repeated rows of a pair add up, each weighed by its kind and decayed by its age. The transform is then
 * applied to that sum, once per entry:
 *   - presence: 1 for every entry > 0 (the customer touched the item; how often does not count);
 *   - log: log(1 + v), so the 300,000th play adds almost nothing while the first few still count;
 *   - linear: v itself (the matrix as built).
 * Without a transform a single very active customer dominates cosines and Gram matrices (one row of
 * 300,000 plays outweighs thousands of rows of one), which is why item-kNN and EASE default to presence.
 * Cosine over binary vectors is Sarwar et al. (2001)'s setting; Steck (2019) fits EASE on a binary matrix.
 *
 * Recency (optional, per model and per side): with a half-life h in days, an entry's value is
 *   value = transform(sum of the pair's weighted signals) × 2^(−age / h),
 * age = days between the pair's latest signal and the matrix's reference time (build.ts `ageDays`; untimed
 * signals are age 0). This is the exponential time weight of Ding & Li (2005), "Time weight collaborative
 * filtering", CIKM, with the half-life parametrisation of radioactive decay (weight ½ after h days). A model
 * applies it on the fit side (the entries it learns from) and on the profile side (the customer's row it
 * scores from) with separate half-lives, each off by default: a shop's tastes drift, and the customer's recent
 * items say more about what they want next than old ones (Hu et al. 2020, SIGIR, time-decayed customer vectors).
 */
export const VALUE_TRANSFORMS = ['presence', 'log', 'linear'] as const;
export type ValueTransform = (typeof VALUE_TRANSFORMS)[number];

/** The code a model file stores for its transform (index in VALUE_TRANSFORMS). */
export function transformCode(t: ValueTransform): number {
  return VALUE_TRANSFORMS.indexOf(t);
}

export function transformFromCode(code: number): ValueTransform {
  const t = VALUE_TRANSFORMS[code];
  if (t === undefined) throw new InputError(`unknown value transform code ${code}`);
  return t;
}

/** Refuses anything but the three names, naming the parameter. */
export function checkTransform(t: unknown, field = 'values'): ValueTransform {
  if (!(VALUE_TRANSFORMS as readonly unknown[]).includes(t)) {
    throw new InputError(`${field} must be presence, log or linear, got ${String(t)}`, { column: field });
  }
  return t as ValueTransform;
}

/** One value through the transform; entries <= 0 (or NaN) carry no evidence and map to 0. */
export function transformValue(t: ValueTransform, v: number): number {
  if (!(v > 0)) return 0;
  return t === 'presence' ? 1 : t === 'log' ? Math.log1p(v) : v;
}

/** A half-life in days, or null for no decay; anything else (≤ 0, NaN, ±∞, not a number) is refused naming `field`. */
export function checkHalfLife(h: unknown, field: string): number | null {
  if (h === undefined || h === null) return null;
  if (typeof h !== 'number' || !Number.isFinite(h) || !(h > 0)) {
    throw new InputError(`${field} must be a number of days > 0 (or left out for no decay), got ${String(h)}`, { column: field });
  }
  return h;
}

/** 2^(−age / h): the weight of an entry `age` days old under half-life h (1 without decay or without an age). */
export function recencyWeight(ageDays: number, halfLifeDays: number | null): number {
  return halfLifeDays === null ? 1 : Math.pow(2, -ageDays / halfLifeDays);
}

/** Entry p of `m` through the transform, decayed by its age when `halfLifeDays` is set and `m` carries ages. */
export function decayedValue(m: Csr, p: number, t: ValueTransform, halfLifeDays: number | null): number {
  const v = transformValue(t, m.data[p]!);
  return halfLifeDays === null || !m.ageDays ? v : v * Math.pow(2, -m.ageDays[p]! / halfLifeDays);
}

/**
 * The matrix with every entry transformed (and decayed by its age when `halfLifeDays` is set and `m` carries
 * ages); shares `indptr`, `indices` and `ageDays` with `m` (nothing is copied but the values). `linear`
 * without decay returns `m` itself.
 */
export function transformMatrix(m: Csr, t: ValueTransform, halfLifeDays: number | null = null): Csr {
  const decay = halfLifeDays !== null && m.ageDays !== undefined;
  if (t === 'linear' && !decay) return m;
  const data = new Float32Array(m.data.length);
  if (decay) for (let p = 0; p < data.length; p++) data[p] = decayedValue(m, p, t, halfLifeDays);
  else for (let p = 0; p < data.length; p++) data[p] = transformValue(t, m.data[p]!);
  return { rows: m.rows, cols: m.cols, indptr: m.indptr, indices: m.indices, data, ...(m.ageDays && { ageDays: m.ageDays }) };
}
