import type { BlendWeights } from '../curation/types.ts';
import { InputError } from '../errors.ts';

/** The hybrid's components, in the order their columns are stored; the names are BlendWeights' keys. */
export const COMPONENTS = ['content', 'collaborative', 'audience', 'popularity', 'trend', 'freshness'] as const;
export type Component = (typeof COMPONENTS)[number];
export const COMPONENT_COUNT = COMPONENTS.length;
export const C_CONTENT = 0;
export const C_COLLABORATIVE = 1;
export const C_AUDIENCE = 2;
export const C_POPULARITY = 3;
export const C_TREND = 4;
export const C_FRESHNESS = 5;

/**
 * Items held by fewer customers than this are "cold": their collaborative and audience values rest on a
 * handful of co-occurrences and are mostly noise, so content stands in for both (falling back to content
 * for new items is the usual remedy for the cold-start problem as framed by Schein, Popescul, Ungar &
 * Pennock 2002, "Methods and metrics for cold-start recommendations"; the threshold of 5 is common
 * practice, no source).
 */
export const DEFAULT_COLD_START_MIN_CUSTOMERS = 5;

/**
 * The weights as a Float64Array in COMPONENTS order, with unavailable components zeroed and the rest
 * scaled to sum to 1, so the blended score stays in [0, 1] and the contributions add up to it.
 * Negative or non-finite weights are the editor's input error; so is leaving nothing to blend.
 */
export function effectiveWeights(weights: BlendWeights, available: ArrayLike<boolean>): Float64Array {
  const w = new Float64Array(COMPONENT_COUNT);
  let total = 0;
  COMPONENTS.forEach((c, j) => {
    const v = weights[c];
    if (!Number.isFinite(v) || v < 0) throw new InputError(`blend weight '${c}' must be a finite number >= 0, got ${v}`);
    if (available[j]) {
      w[j] = v;
      total += v;
    }
  });
  if (!(total > 0)) {
    const usable = COMPONENTS.filter((_, j) => available[j]).join(', ') || 'none';
    throw new InputError(`the blend weights leave nothing to score with; components available here: ${usable}`);
  }
  for (let j = 0; j < COMPONENT_COUNT; j++) w[j]! /= total;
  return w;
}

export function weightsFromArray(a: ArrayLike<number>): BlendWeights {
  return {
    content: a[C_CONTENT]!,
    collaborative: a[C_COLLABORATIVE]!,
    audience: a[C_AUDIENCE]!,
    popularity: a[C_POPULARITY]!,
    trend: a[C_TREND]!,
    freshness: a[C_FRESHNESS]!,
  };
}
