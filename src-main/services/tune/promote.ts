/**
 * The second rung of successive halving (Jamieson & Talwalkar 2016; Li et al. 2018, Hyperband): the settings a
 * search judged at low fidelity (iALS trials of a few sweeps) are ranked by that score, the best ⌈n/η⌉ are fitted
 * again at full fidelity (the training's sweeps), and the choice is made among those by their full-fidelity score
 * alone. Why: a low-fidelity score ranks settings well enough to discard most of them, but not to choose between
 * the best few (on Online Retail three sweeps favour weak regularisation at large factor counts, which the
 * training's fifteen sweeps do not).
 *
 * Budget: promotions run in rank order while their predicted cost fits what is left; one that does not fit is
 * skipped (a cheaper one below it may still fit). Nothing reads the clock, so the same inputs promote the same
 * settings on any machine. With nothing affordable, nothing is promoted and the caller keeps its low-fidelity pick.
 */
import { CancelledError, InputError } from '../../core/errors.ts';
import type { Point } from './search.ts';

/** Successive halving's reduction factor: the top third goes on (η = 3, Li et al. 2018's default). */
export const PROMOTE_ETA = 3;

export interface Screened {
  point: Point;
  /** The low-fidelity score (NaN counts as the worst). */
  score: number;
}

export interface Promotion {
  point: Point;
  screenScore: number;
  /** The full-fidelity score. */
  score: number;
  cost: number;
}

export interface PromoteResult {
  /** The best promoted setting by its full-fidelity score (ties keep the better-screened one); null when none was affordable. */
  best: Promotion | null;
  promoted: Promotion[];
  /** How many of the top ⌈n/η⌉ were wanted, and how many of them did not fit the budget. */
  wanted: number;
  skipped: number;
  spent: number;
}

export interface PromoteOptions {
  /** The screened settings in evaluation order (repeats of a point count once, with its first score). */
  screened: readonly Screened[];
  budget: number;
  /** Predicted cost of a full-fidelity fit of the point. */
  cost: (p: Point) => number;
  /** The full-fidelity score of the point. */
  evaluate: (p: Point) => Promise<number> | number;
  eta?: number;
  signal?: AbortSignal;
  /** Before each fit: its number among the promotions and what was spent before it. */
  onTrial?: (p: { point: Point; trial: number; spent: number }) => void;
}

const key = (p: Point) => JSON.stringify(Object.keys(p).sort().map((k) => [k, p[k]]));
const rankable = (s: number) => (Number.isNaN(s) ? -Infinity : s);

/** The screened settings best first; ties keep evaluation order (the search's own tie rule). */
export function rankScreened(screened: readonly Screened[]): Screened[] {
  const seen = new Set<string>();
  const distinct = screened.filter((s) => {
    const k = key(s.point);
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
  return distinct
    .map((s, i) => ({ s, i }))
    .sort((a, b) => rankable(b.s.score) - rankable(a.s.score) || a.i - b.i)
    .map((x) => x.s);
}

export async function promoteTop(o: PromoteOptions): Promise<PromoteResult> {
  const eta = o.eta ?? PROMOTE_ETA;
  if (!(eta > 1) || !Number.isFinite(eta)) throw new InputError(`eta must be a finite number > 1, got ${eta}`);
  if (!(o.budget >= 0) || !Number.isFinite(o.budget)) throw new InputError(`the promotion budget must be a finite number >= 0, got ${o.budget}`);
  const ranked = rankScreened(o.screened);
  const wanted = Math.ceil(ranked.length / eta);
  const promoted: Promotion[] = [];
  let spent = 0;
  let skipped = 0;
  for (const s of ranked.slice(0, wanted)) {
    const cost = o.cost(s.point);
    if (spent + cost > o.budget + 1e-9) {
      skipped++;
      continue;
    }
    if (o.signal?.aborted) throw new CancelledError('tuning cancelled');
    o.onTrial?.({ point: s.point, trial: promoted.length + 1, spent });
    const score = await o.evaluate(s.point);
    spent += cost;
    promoted.push({ point: { ...s.point }, screenScore: s.score, score, cost });
  }
  let best: Promotion | null = null;
  // Same choice rule as the search (search.ts): a later one must be higher by more than 1e-9.
  for (const p of promoted) if (!best || rankable(p.score) > rankable(best.score) + 1e-9) best = p;
  return { best, promoted, wanted, skipped, spent };
}
