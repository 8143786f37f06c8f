/**
 * Each slot's rank in its pool and the main reason it was proposed (core/curation/reasons.ts), from the
 * world's data: the trend's windows as the shelf measured them, the audience's holdings, the anchors the
 * scorer found. The pieces that walk the data (the windows, the holdings) are made once per world and
 * date or audience; an item's audience evidence (one similarity row of the collaborative model) once per
 * audience and item.
 */
import { audienceHoldings, heldLeadingTo, mainReason, type AudienceHeld, type AudienceHoldings, type Reason, type ReasonFacts } from '../../core/curation/reasons.ts';
import type { Brief } from '../../core/curation/types.ts';
import { trendWindows, type TrendWindows } from '../../core/models/popularity.ts';
import type { PoolScores } from '../../core/scoring/index.ts';
import { trendEnd, type CurationWorld } from './world.ts';

export interface SlotExplanation {
  /** Place by score among the pool's candidates, 1 = best (scoring/rank.ts); null outside the pool. */
  rank: number | null;
  reason: Reason | null;
}

/** Audience evidence kept per world (a few bytes each; an item's row costs a model similarity pass). */
const HELD_KEPT = 20_000;

function trendOf(world: CurationWorld, editionDate: number): TrendWindows | null {
  if (world.ds.signals.length === 0) return null;
  const end = trendEnd(world, editionDate);
  const key = `trendWindows@${end ?? 'end'}`;
  let t = world.memo.get(key) as TrendWindows | undefined;
  if (!t) world.memo.set(key, (t = trendWindows(world.ds, end === undefined ? {} : { now: end })));
  return t;
}

function audienceOf(world: CurationWorld, brief: Brief, editionDate: number, audience: Int32Array | null): ReasonFacts['audience'] {
  if (audience === null) return null;
  const model = world.hybrid.models.collaborative ?? world.hybrid.models.affinity;
  const aud = `${JSON.stringify(brief.audience)}@${editionDate}`;
  const hk = `audienceHoldings:${aud}`;
  let h = world.memo.get(hk) as AudienceHoldings | undefined;
  if (!h) world.memo.set(hk, (h = audienceHoldings(audience, world.byCustomer, world.ds.signals, world.ctx.n)));
  const holdings = h;
  let held = world.memo.get('audienceHeld') as Map<string, AudienceHeld[]> | undefined;
  if (!held) world.memo.set('audienceHeld', (held = new Map()));
  const cache = held;
  let row: Float32Array | undefined;
  return {
    size: holdings.size,
    heldFor(i: number): AudienceHeld[] {
      if (!model) return [];
      const key = `${aud}#${i}`;
      const hit = cache.get(key);
      if (hit) return hit;
      row ??= new Float32Array(world.ctx.n);
      model.similarityInto(i, row);
      const out = heldLeadingTo(holdings, row, i, world.ds.items);
      if (cache.size >= HELD_KEPT) cache.delete(cache.keys().next().value!);
      cache.set(key, out);
      return out;
    },
  };
}

/**
 * The facts a shelf's reasons are drawn from, for this brief at this date. `audience`: the brief's audience
 * (dense customers) when its score had an audience part, else null — only then does a reason say "people
 * in this audience".
 */
export function reasonFacts(world: CurationWorld, brief: Brief, editionDate: number, audience: Int32Array | null): ReasonFacts {
  return {
    items: world.ds.items,
    editionDate,
    customersPerItem: world.customersPerItem,
    customerCount: world.ds.customerIds.length,
    trend: trendOf(world, editionDate),
    audience: audienceOf(world, brief, editionDate, audience),
  };
}

/** Rank and main reason of dense item i (`posOf`: pool position per dense item, -1 outside the pool). */
export function explainItem(facts: ReasonFacts, scores: PoolScores, posOf: Int32Array, i: number): SlotExplanation {
  const p = i < 0 ? -1 : posOf[i]!;
  if (p < 0) return { rank: null, reason: null };
  return { rank: scores.ranks()[p]!, reason: mainReason({ ...scores.explain(p), contentStandsIn: scores.available.content }, facts) };
}

/** Rank and main reason per slot (`dense`: dense item per slot, -1 empty). */
export function explainSlots(facts: ReasonFacts, scores: PoolScores, posOf: Int32Array, dense: Int32Array): SlotExplanation[] {
  return Array.from(dense, (i) => explainItem(facts, scores, posOf, i));
}
