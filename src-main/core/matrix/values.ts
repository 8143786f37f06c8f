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

/**
 * The matrix with every entry transformed; shares `indptr` and `indices` with `m` (nothing is copied but
 * the values). `linear` returns `m` itself.
 */
export function transformMatrix(m: Csr, t: ValueTransform): Csr {
  if (t === 'linear') return m;
  const data = new Float32Array(m.data.length);
  for (let p = 0; p < data.length; p++) data[p] = transformValue(t, m.data[p]!);
  return { rows: m.rows, cols: m.cols, indptr: m.indptr, indices: m.indices, data };
}
