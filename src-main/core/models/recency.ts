import { InputError } from '../errors.ts';
import { checkHalfLife } from '../matrix/values.ts';

/**
 * A model's recency weighting (matrix/values.ts "Recency"): the half-life in days of the entries it learns from
 * (fit side) and of the customer's row it scores from (profile side); null = that side is not decayed. Both are
 * separate because they answer different questions: the fit side, whether old co-occurrences still describe
 * which items go together; the profile side, whether a customer's old items still say what they want next.
 */
export interface Recency {
  fitHalfLifeDays: number | null;
  profileHalfLifeDays: number | null;
}

export const NO_RECENCY: Recency = { fitHalfLifeDays: null, profileHalfLifeDays: null };

/** The two half-lives of a model's parameters, checked (≤ 0, NaN or ∞ is refused naming the field). */
export function recencyOf(params: { fitHalfLifeDays?: number | null; profileHalfLifeDays?: number | null }, model: string): Recency {
  return {
    fitHalfLifeDays: checkHalfLife(params.fitHalfLifeDays, `${model} fitHalfLifeDays`),
    profileHalfLifeDays: checkHalfLife(params.profileHalfLifeDays, `${model} profileHalfLifeDays`),
  };
}

/** The model file's section for the half-lives: [fit, profile], NaN for off. */
export function recencySection(r: Recency): Float64Array {
  return Float64Array.of(r.fitHalfLifeDays ?? Number.NaN, r.profileHalfLifeDays ?? Number.NaN);
}

export function recencyFromSection(s: Float64Array): Recency {
  if (s.length !== 2) throw new InputError(`not a valid model file: the recency section has ${s.length} values, expected 2`);
  const side = (v: number): number | null => (Number.isNaN(v) ? null : v > 0 && Number.isFinite(v) ? v : bad(v));
  const bad = (v: number): never => {
    throw new InputError(`not a valid model file: half-life ${v}`);
  };
  return { fitHalfLifeDays: side(s[0]!), profileHalfLifeDays: side(s[1]!) };
}

/** "fit 180 d, profile 90 d" / "off": for notes and listings. */
export function describeRecency(r: Recency): string {
  if (r.fitHalfLifeDays === null && r.profileHalfLifeDays === null) return 'recency off';
  const one = (h: number | null) => (h === null ? 'off' : `${h} d`);
  return `recency half-life fit ${one(r.fitHalfLifeDays)}, profile ${one(r.profileHalfLifeDays)}`;
}
