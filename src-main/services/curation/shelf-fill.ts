/**
 * Fills one shelf and reads its meter (DESIGN.md "Data flow": candidates → component scores → blend with
 * weights and boosts → fill with pins under rules → meter). A locked shelf keeps its slots; only its meter
 * is read again.
 */
import type { EditorialState } from '../../core/curation/candidates.ts';
import { bestRelevanceSums, universeMask } from '../../core/curation/choice-cost.ts';
import { fillShelf } from '../../core/curation/fill.ts';
import { stableFill, type ListChanges } from '../../core/curation/stable-fill.ts';
import { meterShelf, type MeterInputs } from '../../core/curation/meter.ts';
import type { Brief, RuleViolation, ShelfMeter } from '../../core/curation/types.ts';
import type { ShelfEdits } from '../../core/editing/index.ts';
import { itemsOn } from '../../core/editing/snapshot.ts';
import { buildInteractionMatrix } from '../../core/matrix/build.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import { IalsModel } from '../../core/models/ials.ts';
import { anchorRelevanceInto, audienceAffinityInto, missingGroupName, resolveAudience, type PoolScores } from '../../core/scoring/index.ts';
import { InputError } from '../../core/errors.ts';
import { dateMs, type Edition } from '../../store/editions.ts';
import type { Shelf, SlotRow } from '../../store/shelves.ts';
import type { Db } from '../../store/workspace.ts';
import { scoredPool, type RankedCandidate } from './pool-cache.ts';
import { explainItem, explainSlots, reasonFacts, type SlotExplanation } from './slot-reasons.ts';
import { curationRepos } from './repos.ts';
import { trendFor, type CurationWorld } from './world.ts';
import { ownedMatrix } from '../holdout/trained.ts';

export interface FilledShelf {
  slots: SlotRow[];
  /** Dense item per slot (-1 = empty), and the meter's inputs: what a what-if needs. */
  dense: Int32Array;
  inputs: MeterInputs;
  /** Pool items (dense), best first by boosted score, with their percentiles and ranks (shared: do not change). */
  ranked: () => readonly RankedCandidate[];
  meter: ShelfMeter;
  /** Per slot: its rank in the pool and the main reason it was proposed (slot-reasons.ts). */
  explanations: SlotExplanation[];
  /** The same for any dense item (a what-if candidate): null reason and rank outside the pool. */
  explain: (i: number) => SlotExplanation;
  violations: RuleViolation[];
  /** Candidates in the pool, and why the others were left out. */
  poolSize: number;
  excluded: Record<string, number>;
  /** A stable fill's changes against the list it kept, and the predicted relevance it gave up. */
  changes?: ListChanges;
  relevanceGivenUp?: number;
}

/**
 * How to fill: 'read' the stored slots, start 'full' over (Refill), or keep the current list and change
 * only what the editor or a rule forces (stable-fill.ts).
 */
export type FillMode =
  | 'read'
  | 'full'
  | { current: Int32Array; rescored?: { item: number; direction: 'up' | 'down' }; repair: boolean; measureGivenUp?: boolean };

type AudienceReadings = Pick<MeterInputs, 'audienceCategories' | 'ownedShare'> & { audience: Int32Array };

/**
 * The audience's category mix (its signals per category) and, per item, the share of the audience who
 * already have it. Walks only the audience's own signals; remembered per audience and date in the world.
 */
export function audienceReadings(world: CurationWorld, brief: Brief, editionDate: number): AudienceReadings {
  const key = `audience:${JSON.stringify(brief.audience)}@${editionDate}`;
  const hit = world.memo.get(key) as AudienceReadings | undefined;
  if (hit) return hit;
  const { ds, ctx } = world;
  const audience = resolveAudience(ds, brief.audience, editionDate, world.groups, world.groupNames);
  const cats = new Float64Array(ctx.facets.category.values.length);
  const owners = new Int32Array(ctx.n);
  const last = new Int32Array(ctx.n).fill(-1);
  const { ptr, signal } = world.byCustomer;
  const item = ds.signals.item;
  for (const u of audience) {
    for (let p = ptr[u]!, end = ptr[u + 1]!; p < end; p++) {
      const i = item[signal[p]!]!;
      cats[ctx.category[i]!]! += 1;
      if (last[i] !== u) {
        last[i] = u;
        owners[i]!++;
      }
    }
  }
  const ownedShare = Float64Array.from(owners, (c) => (audience.length === 0 ? 0 : c / audience.length));
  const out = { audience, audienceCategories: cats, ownedShare };
  world.memo.set(key, out);
  return out;
}

/**
 * The audience's predicted preference for every item (scoring/audience.ts): with iALS the exact mean over
 * the audience, (mean_u x_u)ᵀy_i, one pass over the item factors; with another model a seeded sample of
 * the audience (seed 0, as propose.ts uses by default). null when no model can say it or the audience is
 * empty (the hybrid then drops the component and renormalises the weights). Remembered per audience and
 * date in the world, as the audience itself is.
 */
export function audienceAffinityOf(world: CurationWorld, brief: Brief, editionDate: number): Float32Array | null {
  const model = world.hybrid.models.affinity;
  if (!model && !world.blend) return null;
  const key = `affinity:${JSON.stringify(brief.audience)}@${editionDate}`;
  if (world.memo.has(key)) return world.memo.get(key) as Float32Array | null;
  const { audience } = audienceReadings(world, brief, editionDate);
  let out: Float32Array | null = null;
  if (audience.length > 0 && world.blend) {
    // The validated blend, averaged over the audience (seeded sample), each member's own items at their lowest.
    out = new Float32Array(world.ctx.n);
    world.blend.scorer.audienceInto(audience, world.blend.history, ownedOf(world), out, { seed: 0 });
  } else if (audience.length > 0 && model) {
    out = new Float32Array(world.ctx.n);
    // iALS reads only its own factors; the histories are built only for a model that reads them.
    const history = model instanceof IalsModel ? NO_HISTORY : historyOf(world);
    audienceAffinityInto(model, history, audience, out, { seed: 0 });
  }
  world.memo.set(key, out);
  return out;
}

/**
 * The validated blend's relevance of every item to the brief's anchors, treated as one new customer's
 * history (core/scoring/anchor-relevance.ts says why). null without anchors or without a blend (the hybrid
 * then falls back to the collaborative model's similarity rows). Remembered per anchor set in the world.
 */
export function anchorRelevanceOf(world: CurationWorld, anchors: Int32Array): Float32Array | null {
  if (anchors.length === 0) return null;
  const key = `anchors:${Array.from(anchors).sort((a, b) => a - b).join(',')}`;
  if (world.memo.has(key)) return world.memo.get(key) as Float32Array | null;
  const blend = world.blend;
  let out: Float32Array | null = null;
  if (blend) {
    out = new Float32Array(world.ctx.n);
    anchorRelevanceInto(blend.scorer, anchors, blend.history.rows, out);
  }
  world.memo.set(key, out);
  return out;
}

/** What each customer already has (any signal), built once per world. */
function ownedOf(world: CurationWorld): Csr {
  let o = world.memo.get('owned') as Csr | undefined;
  if (!o) world.memo.set('owned', (o = ownedMatrix(world.ds)));
  return o;
}

/**
 * The validated relevance of every item any shelf could show at the date (NaN elsewhere), for this brief's
 * audience and anchors: the hybrid's relevance components only (anchor similarity by content, the validated
 * blend's relevance to the anchors as a pseudo-history, and the validated blend for the audience), with the brief's relevance weights and
 * none of its dials, normalised over that universe as the world's hybrid normalises a pool (min–max: 0 = the
 * least relevant item, 1 = the most). `best` prefixes the most relevant items'
 * sums: the price of the editor's choices is measured against them (core/curation/choice-cost.ts).
 * null when no model can say anything about relevance.
 */
export function validatedRelevance(world: CurationWorld, brief: Brief, editionDate: number): { relevance: Float64Array; best: Float64Array } | null {
  const w = brief.weights;
  const own = { content: w.content, collaborative: w.collaborative, audience: w.audience };
  const rel = own.content + own.collaborative + own.audience > 0 ? own : { content: 1, collaborative: 1, audience: 1 };
  const key = `relevance:${JSON.stringify([brief.anchors, brief.audience, rel, brief.size])}@${editionDate}`;
  if (world.memo.has(key)) return world.memo.get(key) as ReturnType<typeof validatedRelevance>;
  const { ctx } = world;
  const mask = universeMask(ctx, editionDate);
  const items: number[] = [];
  for (let i = 0; i < ctx.n; i++) if (mask[i]) items.push(i);
  const anchors = Int32Array.from(brief.anchors.map((id) => ctx.indexOfId.get(id) ?? -1).filter((i) => i >= 0));
  const audienceAffinity = audienceAffinityOf(world, brief, editionDate);
  let out: { relevance: Float64Array; best: Float64Array } | null = null;
  const relevanceOnly = { ...rel, popularity: 0, trend: 0, freshness: 0 };
  const anchorRelevance = anchorRelevanceOf(world, anchors);
  const usable = (anchors.length > 0 && (world.hybrid.models.content || world.hybrid.models.collaborative || anchorRelevance)) || audienceAffinity;
  if (items.length > 0 && usable) {
    let s: PoolScores;
    try {
      s = world.hybrid.scorePool({ pool: Int32Array.from(items), anchors, weights: relevanceOnly, editionDate, audienceAffinity, anchorRelevance });
    } catch (e) {
      // The brief weighs only relevance components this shelf cannot have (e.g. audience with an empty audience).
      if (!(e instanceof InputError)) throw e;
      world.memo.set(key, null);
      return null;
    }
    const relevance = new Float64Array(ctx.n).fill(NaN);
    for (let p = 0; p < s.n; p++) relevance[s.pool[p]!] = s.blended[p]!;
    out = { relevance, best: bestRelevanceSums(relevance, brief.size) };
  }
  world.memo.set(key, out);
  return out;
}

const NO_HISTORY: Csr = { rows: 0, cols: 0, indptr: new Int32Array(1), indices: new Int32Array(0), data: new Float32Array(0) };

/** The interaction matrix, built once per world and only when a non-iALS model needs customers' histories. */
function historyOf(world: CurationWorld): Csr {
  let h = world.memo.get('history') as Csr | undefined;
  if (!h) world.memo.set('history', (h = buildInteractionMatrix(world.ds)));
  return h;
}

/**
 * What a shelf's fill reads from the store, read once before the pure chain (pool, scores, fill, meter) runs:
 * the bans that reach it, the items of the last `restPeriod` published editions (row ids), and its slots as
 * stored (what mode 'read' meters, and the list a stable fill keeps).
 */
export interface ShelfReads {
  bans: { items: ReadonlySet<number>; rules: EditorialState['banRules'] };
  resting: readonly number[];
  stored: SlotRow[];
}

export function readShelf(db: Db, shelf: Shelf, edition: Edition): ShelfReads {
  const repos = curationRepos(db);
  return {
    bans: repos.editorial.activeBans(shelf.id, edition.id),
    resting: [...itemsOn(repos.editions.lastPublished(edition.date, shelf.brief.rules.restPeriod))],
    stored: repos.shelves.slots(shelf.id),
  };
}

/**
 * The fill's editorial state in dense indices: this shelf's edits, the bans that reach it, the rest
 * period, and `usedInEdition` (dense items the caller says other shelves of the edition already hold).
 */
export function editorialState(
  world: CurationWorld,
  shelf: Shelf,
  reads: ShelfReads,
  edits: ShelfEdits,
  usedInEdition: ReadonlySet<number>,
): EditorialState {
  const { ctx } = world;
  const dense = (id: number) => ctx.indexOfId.get(id);
  const banSet = new Set<number>();
  for (const id of reads.bans.items) {
    const i = dense(id);
    if (i !== undefined) banSet.add(i);
  }
  const resting = new Set<number>();
  for (const id of reads.resting) {
    const i = dense(id);
    if (i !== undefined) resting.add(i);
  }
  const pins = new Map<number, number>();
  for (const [slot, id] of Object.entries(edits.pins)) {
    const i = dense(id);
    if (i !== undefined && Number(slot) < shelf.size) pins.set(Number(slot), i);
  }
  return { bans: banSet, banRules: reads.bans.rules, resting, usedInEdition, pins };
}

/** Dense items of a frozen (locked) shelf, one per slot (-1 = empty or no longer in the catalogue). */
export function frozenDense(world: CurationWorld, shelf: Shelf, edits: ShelfEdits): Int32Array {
  const out = new Int32Array(shelf.size).fill(-1);
  (edits.frozen ?? []).forEach((id, s) => {
    if (s < shelf.size && id >= 0) out[s] = world.ctx.indexOfId.get(id) ?? -1;
  });
  return out;
}

/**
 * Fills and meters the shelf; the caller stores `slots` inside its transaction. A locked shelf keeps its
 * frozen items (scored afresh). In mode 'read' (or `false`) the stored slots and violations are metered, and
 * nothing is filled. It reads nothing from the store itself: `reads` (readShelf) holds all of that.
 */
export function fillAndMeter(
  world: CurationWorld,
  shelf: Shelf,
  edition: Edition,
  reads: ShelfReads,
  edits: ShelfEdits,
  mode: FillMode | boolean = 'full',
  usedInEdition: ReadonlySet<number> = new Set(),
): FilledShelf {
  const how: FillMode = mode === true ? 'full' : mode === false ? 'read' : mode;
  const { ctx, hybrid } = world;
  const brief = shelf.brief;
  const editionDate = dateMs(edition.date);
  const state = editorialState(world, shelf, reads, edits, usedInEdition);
  const multipliers = new Map<number, number>();
  for (const [id, f] of Object.entries(edits.boosts)) {
    const i = ctx.indexOfId.get(Number(id));
    if (i !== undefined) multipliers.set(i, f);
  }
  const scored = scoredPool(world, brief, state, editionDate, multipliers, (pool) => {
    const anchors = Int32Array.from(brief.anchors.map((id) => ctx.indexOfId.get(id) ?? -1).filter((i) => i >= 0));
    const audienceAffinity = audienceAffinityOf(world, brief, editionDate);
    const trend = trendFor(world, editionDate);
    const anchorRelevance = anchorRelevanceOf(world, anchors);
    return hybrid.scorePool({ pool: pool.items, anchors, weights: brief.weights, editionDate, audienceAffinity, anchorRelevance, multipliers, ...(trend !== undefined && { trend }) });
  });
  const { pool, scores, posOf, relevance } = scored;

  let dense: Int32Array;
  let violations: RuleViolation[];
  let stored: SlotRow[] | null = null;
  let changes: ListChanges | undefined;
  let givenUpAgainst: Int32Array | undefined;
  const pinnedDense = new Set(state.pins.values());
  if (how === 'read') {
    // The shelf as stored, with the scores it was filled with.
    stored = reads.stored;
    dense = new Int32Array(shelf.size).fill(-1);
    for (const s of stored) if (s.slot < shelf.size && s.itemId !== null) dense[s.slot] = ctx.indexOfId.get(s.itemId) ?? -1;
    violations = shelf.violations;
  } else if (edits.locked) {
    dense = frozenDense(world, shelf, edits);
    violations = [];
  } else if (how === 'full') {
    const r = fillShelf({ ctx, brief, candidates: scored.candidates, state, editionDate });
    dense = r.slots;
    violations = r.violations;
  } else {
    const input = { ctx, brief, candidates: scored.candidates, state, editionDate };
    const r = stableFill({ ...input, current: how.current, repair: how.repair, ...(how.rescored && { rescored: how.rescored }) });
    dense = r.slots;
    violations = r.violations;
    changes = r.changes;
    // A full fill as well, only where the editor will read what the kept list gives up (the acted shelf).
    if (how.measureGivenUp ?? true) givenUpAgainst = fillShelf(input).slots;
  }
  // A brief aimed at a named group that the last training no longer has reaches no one; the shelf says so
  // in words rather than quietly serving whichever group now holds the old number.
  const missing = how === 'read' || edits.locked ? null : missingGroupName(brief.audience, world.groupNames);
  if (missing) violations = [{ rule: 'audience', reason: missing }, ...violations];
  const readings = audienceReadings(world, brief, editionDate);
  // The meter's relevance is the validated one (the same for any dials), so the price of the dials shows.
  const validated = validatedRelevance(world, brief, editionDate);
  const inputs: MeterInputs = {
    editionDate,
    relevance: validated ? validated.relevance : relevance,
    ...(validated && { bestRelevance: validated.best }),
    audienceCategories: readings.audienceCategories,
    ownedShare: readings.ownedShare,
  };
  const meter = meterShelf(ctx, dense, inputs);
  // The relevance kept lists give up: the meter's predicted relevance of a full fill minus this list's.
  const relevanceGivenUp = givenUpAgainst && meterShelf(ctx, givenUpAgainst, inputs).predictedRelevance - meter.predictedRelevance;
  const slots: SlotRow[] = stored ?? Array.from(dense, (i, slot) => {
    if (i < 0) return { slot, itemId: null, pinned: false, score: null, percentile: null, contributions: {} };
    const p = posOf[i]!;
    const x = p < 0 ? undefined : scores.explain(p);
    return {
      slot,
      itemId: ctx.itemIds[i]!,
      pinned: pinnedDense.has(i) && state.pins.get(slot) === i,
      score: x ? x.score : null,
      percentile: x ? x.percentile : null,
      contributions: x ? { ...x.contributions } : {},
    };
  });
  const withAudience = audienceAffinityOf(world, brief, editionDate) === null ? null : readings.audience;
  const facts = reasonFacts(world, brief, editionDate, withAudience);
  const explanations = explainSlots(facts, scores, posOf, dense);
  return {
    slots,
    dense,
    inputs,
    ranked: scored.ranked,
    meter,
    explanations,
    explain: (i) => explainItem(facts, scores, posOf, i),
    violations,
    poolSize: pool.items.length,
    excluded: { ...pool.excluded },
    ...(changes && { changes }),
    ...(relevanceGivenUp !== undefined && { relevanceGivenUp }),
  };
}
