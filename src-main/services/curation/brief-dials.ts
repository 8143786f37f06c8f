/**
 * A new brief's dials, set for that brief (issue 10 item 4: "a new brief starts from dials that cost at most 5%
 * of validated relevance"). Popularity, trend and freshness are editorial dials; what they cost depends on the
 * audience and anchors (popularity costs nothing for everyone and a lot for a niche audience), so one fixed
 * default either gives up relevance somewhere or gives editors less of their dials than the brief could carry.
 * Starting from the product's editorial dials (EDITORIAL_DIALS: what editors set before the price of choices
 * was measured), the three dials are scaled down together, step by step, until the shelf they would rank costs
 * at most the limit; the relevance weights are left as they are. On the demo shop this keeps the editorial
 * dials whole where they are free and shrinks them for audiences whose taste differs from the crowd's.
 *
 * The dials' cost is measured as the meter's price of choices is (core/curation/choice-cost.ts), on the brief's
 * own pool with no editorial state: the `size` best of the pool by the brief's weights against the `size` most
 * relevant items of the same pool. Filters and rules are the editor's choices, not the dials': measuring against
 * the pool keeps a narrow brief from driving its dials to zero for a price they do not cause.
 */
import { buildCandidatePool, type EditorialState } from '../../core/curation/candidates.ts';
import { bestRelevanceSums, choiceCost } from '../../core/curation/choice-cost.ts';
import type { BlendWeights, Brief } from '../../core/curation/types.ts';
import { anchorRelevanceOf, audienceAffinityOf, validatedRelevance } from './shelf-fill.ts';
import type { IdleDial } from '../../core/curation/idle-dials.ts';
import { idleDials, timeCoverageOf } from './time-coverage.ts';
import { trendFor, type CurationWorld } from './world.ts';

/**
 * The product's editorial dials, the start of every brief's search: popularity, trend and freshness as the
 * product set them before the price of choices could be measured (on the demo shop they cost up to 46% of
 * validated relevance for some audiences and nothing for others; test/integration/default-dials.test.ts).
 */
export const EDITORIAL_DIALS = { popularity: 0.15, trend: 0.05, freshness: 0.05 } as const;

/** The most of validated relevance a brief's computed dials may cost (issue 10 item 4). */
export const DIAL_COST_LIMIT = 0.05;

/**
 * Scales of the product's dials tried, largest first: about √2 apart, so the chosen dials are within a factor
 * of √2 of the largest that keeps the limit (common practice, no source); 0 always keeps it on the pool
 * measured here except for ties.
 */
export const DIAL_SCALES = [1, 0.7, 0.5, 0.35, 0.25, 0.18, 0.125, 0.09, 0.0625, 0.044, 0.031, 0.022, 0.016, 0.011, 0] as const;

const NO_STATE: EditorialState = { bans: new Set(), banRules: [], resting: new Set(), usedInEdition: new Set(), pins: new Map() };

/** What the brief's dials cost at `editionDate` (0..1), NaN when no model can say what is relevant. */
export function dialCost(world: CurationWorld, brief: Brief, editionDate: number): number {
  const v = validatedRelevance(world, brief, editionDate);
  if (!v) return NaN;
  const { ctx } = world;
  const pool = buildCandidatePool(ctx, brief, NO_STATE, editionDate).items;
  if (pool.length === 0) return NaN;
  const anchors = Int32Array.from(brief.anchors.map((id) => ctx.indexOfId.get(id) ?? -1).filter((i) => i >= 0));
  const trend = trendFor(world, editionDate);
  const s = world.hybrid.scorePool({
    pool,
    anchors,
    weights: brief.weights,
    editionDate,
    audienceAffinity: audienceAffinityOf(world, brief, editionDate),
    anchorRelevance: anchorRelevanceOf(world, anchors),
    ...(trend !== undefined && { trend }),
  });
  const top = Int32Array.from(s.order().subarray(0, brief.size), (p) => s.pool[p]!);
  const inPool = new Float64Array(ctx.n).fill(NaN);
  for (const i of pool) inPool[i] = v.relevance[i]!;
  return choiceCost(top, inPool, bestRelevanceSums(inPool, brief.size));
}

/** The product's dials scaled by `scale`, over the brief's relevance weights; `idle` dials (nothing to read) at 0. */
export function scaledDials(brief: Brief, scale: number, idle: readonly IdleDial[] = []): BlendWeights {
  const d = EDITORIAL_DIALS;
  const round = (x: number, dial?: IdleDial) => (dial && idle.includes(dial) ? 0 : Math.round(x * 1e4) / 1e4);
  return { ...brief.weights, popularity: round(d.popularity * scale), trend: round(d.trend * scale, 'trend'), freshness: round(d.freshness * scale, 'freshness') };
}

/**
 * The brief with dials set for it: the largest scale of the product's dials whose cost is within `limit`
 * (the smallest tried when none is), marked `autoDials` with the cost found. Without a trained model nothing
 * can be measured: the brief's weights (the schema's safe defaults, DEFAULT_WEIGHTS) are kept, marked with cost
 * null, and the dials are set at the next change of the brief once there is a model.
 */
export function fitDials(world: CurationWorld, brief: Brief, editionDate: number, limit = DIAL_COST_LIMIT): Brief {
  let last: { weights: BlendWeights; cost: number } | null = null;
  // A dial with nothing to read (trend without timed signals, freshness without dates added) is held at 0 and
  // said so, rather than shown at a value that moves nothing.
  const idle = idleDials(timeCoverageOf(world));
  const said = idle.length ? { idle } : {};
  for (const scale of DIAL_SCALES) {
    const weights = scaledDials(brief, scale, idle);
    const cost = dialCost(world, { ...brief, weights }, editionDate);
    // Nothing to measure with (no trained model, an empty pool): the brief keeps the schema's defaults.
    if (Number.isNaN(cost)) return { ...brief, autoDials: { limit, cost: null, ...said } };
    last = { weights, cost };
    if (cost <= limit) break;
  }
  const chosen = last!;
  return { ...brief, weights: chosen.weights, autoDials: { limit, cost: Math.round(chosen.cost * 1e4) / 1e4, ...said } };
}

const sameWeights = (a: BlendWeights, b: BlendWeights) => (Object.keys(a) as (keyof BlendWeights)[]).every((k) => a[k] === b[k]);

/**
 * The dials of a brief the editor sent (`given`, parsed; `gaveWeights` says whether the request carried any),
 * against the shelf's stored brief (`stored`, absent for a new shelf):
 * - weights the editor chose (a new brief with weights, or weights other than the stored ones) are theirs:
 *   kept as sent, never recomputed (no `autoDials`);
 * - a new brief without weights gets dials set for it;
 * - a brief whose dials were set for it keeps them unless its audience or anchors changed, which sets them
 *   again for the new audience.
 */
export function dialsFor(world: CurationWorld, given: Brief, gaveWeights: boolean, stored: Brief | undefined, editionDate: number): Brief {
  const { autoDials: _ignored, ...rest } = given;
  const brief: Brief = rest;
  if (!stored) return gaveWeights ? brief : fitDials(world, brief, editionDate);
  if (!stored.autoDials) return brief;
  if (gaveWeights && !sameWeights(given.weights, stored.weights)) return brief;
  const changed = JSON.stringify(given.audience) !== JSON.stringify(stored.audience) || JSON.stringify(given.anchors) !== JSON.stringify(stored.anchors);
  // Set again also when the dials were set before any model was trained (nothing was measured then).
  if (changed || stored.autoDials.cost === null) return fitDials(world, { ...brief, weights: stored.weights }, editionDate, stored.autoDials.limit);
  return { ...brief, weights: stored.weights, autoDials: stored.autoDials };
}
