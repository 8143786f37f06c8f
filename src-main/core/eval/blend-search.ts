import type { BlendWeights } from '../curation/types.ts';
import { COMPONENTS, weightsFromArray } from '../scoring/components.ts';
import type { CustomerHybrid } from '../scoring/customer-mode.ts';
import type { EvalResult, RankingEvaluator } from './evaluator.ts';

export interface BlendSearchOptions {
  /** Values tried for each weight. Default [0, 0.25, 0.5, 1, 2]. */
  grid?: readonly number[];
  /** Passes over the six weights. Default 2. */
  rounds?: number;
  /** Starting point. Default: the best of all-equal weights and each component alone. */
  start?: BlendWeights;
}

export interface BlendTrial {
  weights: BlendWeights;
  ndcg: number;
}

export interface BlendSearchResult {
  weights: BlendWeights;
  /** The chosen weights' result on the search window. */
  result: EvalResult;
  trials: BlendTrial[];
  elapsedMs: number;
}

/**
 * Chooses the hybrid's blend weights on the validation window by coordinate search. The start is
 * `options.start`, or else the best on validation of all-equal weights and of each component alone —
 * so the chosen blend is never worse on validation than the best single component. Each pass tries every grid value for one weight with the others held, keeps the best NDCG@K
 * (a change must improve by more than 1e-9, so ties keep the current value), and moves to the next
 * weight. Coordinate ascent on a small grid is a standard cheap substitute for a full grid (6 weights ×
 * 5 values would be 15,625 blends; this is at most 6 × 5 × rounds), at the price of possibly stopping
 * at a local optimum (common practice, no source). Weights are scale-free (they are renormalised), so
 * the grid's absolute values do not matter, only their ratios.
 *
 * The personal components of the evaluator's customers are computed once (`CustomerHybrid.precompute`);
 * each trial then only re-blends and re-ranks. Weight vectors that leave nothing to blend are skipped.
 */
export function searchBlendWeights(
  evaluator: RankingEvaluator,
  hybrid: CustomerHybrid,
  options: BlendSearchOptions = {},
): BlendSearchResult {
  const t0 = performance.now();
  const grid = options.grid ?? [0, 0.25, 0.5, 1, 2];
  const rounds = options.rounds ?? 2;
  hybrid.precompute(evaluator.customers);
  const seen = new Map<string, EvalResult | null>();
  const trials: BlendTrial[] = [];
  const score = (w: number[]): EvalResult | null => {
    const key = w.join(',');
    if (seen.has(key)) return seen.get(key)!;
    const weights = weightsFromArray(w);
    let eff: Float64Array;
    try {
      eff = hybrid.effective(weights);
    } catch {
      seen.set(key, null); // all available weights zero
      return null;
    }
    const r = evaluator.evaluateFill('hybrid', (_u, c, out) => hybrid.blendCached(c, eff, out));
    seen.set(key, r);
    trials.push({ weights, ndcg: r.ndcg });
    return r;
  };
  const starts: number[][] = options.start
    ? [COMPONENTS.map((c) => options.start![c])]
    : [COMPONENTS.map(() => 1), ...COMPONENTS.map((_, j) => COMPONENTS.map((_c, i) => (i === j ? 1 : 0)))];
  let current: number[] = [];
  let best: EvalResult | null = null;
  for (const s of starts) {
    const r = score(s);
    if (r && (!best || r.ndcg > best.ndcg + 1e-9)) {
      best = r;
      current = s.slice();
    }
  }
  if (!best) throw new RangeError('the starting blend weights leave nothing to blend');
  for (let round = 0; round < rounds; round++) {
    let moved = false;
    for (let j = 0; j < current.length; j++) {
      for (const v of grid) {
        if (v === current[j]) continue;
        const trial = current.slice();
        trial[j] = v;
        const r = score(trial);
        if (r && r.ndcg > best.ndcg + 1e-9) {
          best = r;
          current[j] = v;
          moved = true;
        }
      }
    }
    if (!moved) break;
  }
  return { weights: weightsFromArray(current), result: best, trials, elapsedMs: performance.now() - t0 };
}
