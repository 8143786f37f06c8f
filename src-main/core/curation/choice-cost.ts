/**
 * The price of the editor's choices (issue 10 item 4; DESIGN.md "Two kinds of score"): the share of
 * predicted relevance the brief's dials (popularity, trend, freshness, boosts) and rules (filters, quotas,
 * bans, rest periods, pins, variety) give up against the best unconstrained list of the same size for the
 * same audience:
 *
 *   cost = 1 − Σ_{filled slots} rel(i) / Σ_{top f items of the universe by rel} rel(i),   f = filled slots
 *
 * where rel is the validated relevance (the validated blend for the audience, and for an anchor shelf the
 * blend's relevance to the anchors as a pseudo-history with content similarity, normalised to [0, 1] over the
 * universe) and the universe is every item that could be shown
 * at the edition date (in stock, already added). 0 means the shelf is the most relevant list there is;
 * 0.12 reads "these choices cost 12% of predicted relevance". NaN when nothing is relevant (no model).
 */
import type { CurationContext } from './context.ts';
import { idleDialWords } from './idle-dials.ts';
import type { AutoDials, BlendWeights } from './types.ts';

/** The items any shelf could show at `editionDate`: in stock and added by then (the pool's own first two tests). */
export function universeMask(ctx: CurationContext, editionDate: number): Uint8Array {
  const out = new Uint8Array(ctx.n);
  for (let i = 0; i < ctx.n; i++) out[i] = ctx.available[i] === 1 && !((ctx.addedAt[i] as number) > editionDate) ? 1 : 0;
  return out;
}

/**
 * best[f] = the largest relevance sum f items of the universe can reach (f = 0..maxN), i.e. prefix sums of
 * the universe's relevance sorted best first. Items outside the universe (NaN relevance) never count.
 */
export function bestRelevanceSums(relevance: Float64Array, maxN: number): Float64Array {
  const vals: number[] = [];
  for (const r of relevance) if (!Number.isNaN(r)) vals.push(r);
  vals.sort((a, b) => b - a);
  const best = new Float64Array(maxN + 1);
  for (let f = 1; f <= maxN; f++) best[f] = (best[f - 1] as number) + (f - 1 < vals.length ? (vals[f - 1] as number) : 0);
  return best;
}

/** The price of a relevance sum over `filled` slots; NaN when the best list has no relevance to lose. */
export function costOf(relSum: number, filled: number, best: Float64Array): number {
  if (filled === 0) return NaN;
  const top = best[Math.min(filled, best.length - 1)] as number;
  return top > 0 ? Math.max(0, 1 - relSum / top) : NaN;
}

/** The price of the shelf `slots` (-1 = empty, skipped): items outside the universe bring no relevance. */
export function choiceCost(slots: Int32Array, relevance: Float64Array, best: Float64Array): number {
  let sum = 0;
  let filled = 0;
  for (const i of slots) {
    if (i < 0) continue;
    filled++;
    const r = relevance[i] as number;
    if (!Number.isNaN(r)) sum += r;
  }
  return costOf(sum, filled, best);
}

/** "These choices cost 12% of predicted relevance", the meter's line in words. */
export function describeChoiceCost(cost: number): string {
  if (Number.isNaN(cost)) return 'No trained model: the price of these choices in relevance cannot be shown.';
  const pct = Math.round(cost * 100);
  if (pct === 0) return 'These choices cost nothing in predicted relevance: no list for this audience is more relevant.';
  return `These choices cost ${pct}% of predicted relevance against the most relevant list for this audience.`;
}

/**
 * The meter's line about dials the service set for the brief (services/curation/brief-dials.ts); null when the
 * dials are the editor's.
 */
export function describeAutoDials(a: AutoDials | undefined, w: BlendWeights): string | null {
  if (!a) return null;
  const dials = `popularity ${w.popularity}, trend ${w.trend}, freshness ${w.freshness}`;
  const limit = `${Math.round(a.limit * 100)}%`;
  const idle = a.idle?.length ? ` ${idleDialWords(a.idle).join(' ')}` : '';
  if (a.cost === null) return `The dials (${dials}) are the product's safe defaults: with no trained model they could not be set for this brief yet.${idle}`;
  if (a.cost <= a.limit) return `The dials (${dials}) were set for this brief so they cost at most ${limit} of predicted relevance.${idle}`;
  return `The dials (${dials}) were set as low as they go for this brief; they still cost ${Math.round(a.cost * 100)}%, above ${limit}.${idle}`;
}
