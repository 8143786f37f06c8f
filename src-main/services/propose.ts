import { catalogueNames, checkBriefNames } from '../core/curation/brief-names.ts';
import { buildCandidatePool, type EditorialState } from '../core/curation/candidates.ts';
import type { Brief } from '../core/curation/types.ts';
import { InputError } from '../core/errors.ts';
import { buildInteractionMatrix } from '../core/matrix/build.ts';
import { fitContent, loadContent } from '../core/models/content.ts';
import { loadEase } from '../core/models/ease.ts';
import { loadIals } from '../core/models/ials.ts';
import { fitItemKnn, loadItemKnn } from '../core/models/itemknn.ts';
import type { ModelKind, Scorer } from '../core/models/scorer.ts';
import {
  audienceAffinityInto,
  HybridScorer,
  resolveAudience,
  audienceWindowNote,
  missingGroupName,
  type Component,
  type HybridModels,
  type ScoredItem,
} from '../core/scoring/index.ts';
import type { Dataset } from '../core/types.ts';
import { ModelRepo } from '../store/models.ts';
import type { Db } from '../store/workspace.ts';
import { loadWorld, trendFor, type ModelSource } from './curation/world.ts';
import { anchorRelevanceOf } from './curation/shelf-fill.ts';
import { reasonFacts } from './curation/slot-reasons.ts';
import { mainReason, type Reason } from '../core/curation/reasons.ts';
import { blendOf, ownedMatrix } from './holdout/trained.ts';
import { idleDialWords } from '../core/curation/idle-dials.ts';
import { idleDials, timeCoverageOf } from './curation/time-coverage.ts';

export interface LoadedModels {
  models: HybridModels;
  /** What was loaded, fitted in memory, or skipped, in words for the editor. */
  notes: string[];
}

const LOADERS: Partial<Record<ModelKind, (b: Uint8Array) => Scorer>> = {
  content: loadContent,
  itemknn: loadItemKnn,
  ease: loadEase,
  ials: loadIals,
};

const modelCache = new WeakMap<Db, { key: string; loaded: LoadedModels }>();

/**
 * The hybrid's models from the workspace's current trained models (store/models.ts): content; item-kNN
 * for collaborative similarity (else EASE, else iALS); iALS for audience affinity (else the collaborative
 * model). A stored model whose item count differs from the catalogue is skipped (retrain). When content
 * or item-kNN is missing it is fitted in memory on all signals (both take about a second on the demo
 * shop) and a note says so; iALS is never fitted here (tens of seconds: that is the training job's).
 * Cached per connection until the current models or the catalogue size change.
 */
export function loadCurrentModels(db: Db, ds: Dataset): LoadedModels {
  const repo = new ModelRepo(db);
  const current = repo.list().filter((m) => m.current);
  const key = `${ds.items.length}|${ds.signals.length}|${current.map((m) => `${m.kind}:${m.id}`).join(',')}`;
  const hit = modelCache.get(db);
  if (hit && hit.key === key) return hit.loaded;
  const notes: string[] = [];
  const n = ds.items.length;
  const got = new Map<ModelKind, Scorer>();
  for (const kind of ['content', 'itemknn', 'ease', 'ials'] as const) {
    const stored = repo.loadCurrent(kind);
    if (!stored) continue;
    const model = LOADERS[kind]!(stored.bytes);
    if (model.itemCount !== n) {
      notes.push(`${kind} model was trained on ${model.itemCount} items, the catalogue has ${n}: skipped until retrained`);
      continue;
    }
    got.set(kind, model);
  }
  if (!got.has('content') && n > 0) {
    got.set('content', fitContent(ds.items).model);
    notes.push('no trained content model: fitted in memory for this proposal');
  }
  if (!got.has('itemknn') && !got.has('ease') && !got.has('ials') && ds.signals.length > 0) {
    got.set('itemknn', fitItemKnn(buildInteractionMatrix(ds)).model);
    notes.push('no trained collaborative model: item-kNN fitted in memory for this proposal');
  }
  const collaborative = got.get('itemknn') ?? got.get('ease') ?? got.get('ials') ?? null;
  const affinity = got.get('ials') ?? collaborative;
  if (!got.has('ials') && affinity) notes.push(`no trained iALS model: audience affinity uses ${affinity.kind}, sampled`);
  const loaded = { models: { content: got.get('content') ?? null, collaborative, affinity }, notes };
  modelCache.set(db, { key, loaded });
  return loaded;
}

/** The same models as a curation-world source (services/curation/world.ts). */
export const storedModelSource: ModelSource = (db, ds) => ({ models: loadCurrentModels(db, ds).models, blend: () => blendOf(db, ds) });

export interface ProposeOptions {
  /** Unix ms of the edition date. */
  editionDate: number;
  /** Candidates returned, best first. Default 50. */
  n?: number;
  /** Boost (> 1) / sink (< 1) factors by workspace item id. */
  multipliers?: ReadonlyMap<number, number>;
  /** Bans, resting items, pins (dense indices); default none. */
  state?: EditorialState;
  /** Audience sampling for non-iALS affinity. */
  sampleAudience?: number;
  seed?: number;
}

export interface ProposedEvidence {
  itemId: number;
  title: string;
  similarity: number;
}

export interface ProposedItem {
  itemId: number;
  externalId: string;
  title: string;
  promoted: boolean;
  score: number;
  blended: number;
  multiplier: number;
  /** Percentile within the pool, 0..100 (what editors see). */
  percentile: number;
  /** Place by score in the pool, 1 = best, ties sharing the best place (scoring/rank.ts). */
  rank: number;
  /** The main reason it is proposed, from the data (core/curation/reasons.ts). */
  reason: Reason | null;
  coldStart: boolean;
  contributions: Record<Component, number>;
  raw: Record<Component, number>;
  evidence: { content: ProposedEvidence[]; collaborative: ProposedEvidence[] };
}

export interface Proposal {
  items: ProposedItem[];
  poolSize: number;
  excluded: Record<string, number>;
  /** Weights actually used (renormalised over the available components). */
  weights: Record<Component, number>;
  available: Record<Component, boolean>;
  audience: { customers: number; used: number; exact: boolean };
  scoreMs: number;
  notes: string[];
}

/**
 * A shelf's ranked pool with explanations (DESIGN.md "Data flow": candidates → component scores →
 * normalise within the pool → blend with weights and boosts). The fill (pins, MMR, rules) is the
 * curation service's; this is what it fills from, and what the editor browses.
 */
export function propose(db: Db, brief: Brief, options: ProposeOptions): Proposal {
  const { editionDate } = options;
  if (!Number.isFinite(editionDate)) throw new InputError(`editionDate must be a time, got ${editionDate}`, { column: 'editionDate' });
  const n = options.n ?? 50;
  if (!Number.isInteger(n) || n < 1) throw new InputError(`n must be a whole number >= 1, got ${n}`, { column: 'n' });
  const world = loadWorld(db, storedModelSource);
  const { ds, ctx } = world;
  checkBriefNames(catalogueNames(ds.items), brief);
  const loaded = loadCurrentModels(db, ds);
  const notes = [...loaded.notes];

  const anchors = Int32Array.from(brief.anchors, (id) => {
    const i = ctx.indexOfId.get(id);
    if (i === undefined) throw new InputError(`anchor item ${id} is not in the catalogue`, { column: 'anchors' });
    return i;
  });
  const state: EditorialState = options.state ?? {
    bans: new Set(),
    banRules: [],
    resting: new Set(),
    usedInEdition: new Set(),
    pins: new Map(),
  };
  const pool = buildCandidatePool(ctx, brief, state, editionDate);
  const addedAt = Float64Array.from(ds.items, (it) => it.addedAt ?? Number.NaN);
  // The same trend as a shelf of an edition on this date (curation/world.ts trendFor).
  const trend = trendFor(world, editionDate) ?? world.hybrid.data.trend;
  // Normalised as a shelf's pool is (curation/world.ts: min–max).
  const hybrid = new HybridScorer(loaded.models, { customersPerItem: world.customersPerItem, trend, addedAt }, { normalisation: world.hybrid.normalisation });

  const audience = resolveAudience(ds, brief.audience, editionDate, world.groups, world.groupNames);
  // A one-off list has no shelf to carry the message: a named group no longer found is refused outright.
  const missing = missingGroupName(brief.audience, world.groupNames);
  if (missing) throw new InputError(missing);
  const windowNote = audienceWindowNote(brief.audience, ds);
  if (windowNote) notes.push(windowNote);
  let affinity: Float32Array | null = null;
  let report = { customersUsed: 0, exact: true };
  if (world.blend && audience.length > 0) {
    // The audience's relevance is the validated blend's, as on a shelf (curation/shelf-fill.ts).
    affinity = new Float32Array(ds.items.length);
    const used = world.blend.scorer.audienceInto(audience, world.blend.history, ownedMatrix(ds), affinity, {
      ...(options.sampleAudience !== undefined && { sample: options.sampleAudience }),
      seed: options.seed ?? 0,
    });
    report = { customersUsed: used, exact: used === audience.length };
  } else if (loaded.models.affinity && audience.length > 0) {
    affinity = new Float32Array(ds.items.length);
    report = audienceAffinityInto(loaded.models.affinity, buildInteractionMatrix(ds), audience, affinity, {
      ...(options.sampleAudience !== undefined && { sample: options.sampleAudience }),
      seed: options.seed ?? 0,
    });
  } else if (audience.length === 0) notes.push('the audience has no customers: audience affinity left out');

  const multipliers = new Map<number, number>();
  for (const [id, f] of options.multipliers ?? []) {
    const i = ctx.indexOfId.get(id);
    if (i === undefined) throw new InputError(`boost/sink item ${id} is not in the catalogue`, { column: 'multipliers' });
    multipliers.set(i, f);
  }
  const t0 = performance.now();
  // Anchors draw on the validated blend as a shelf's do (curation/shelf-fill.ts anchorRelevanceOf).
  const anchorRelevance = anchorRelevanceOf(world, anchors);
  const scores = hybrid.scorePool({ pool: pool.items, anchors, weights: brief.weights, editionDate, audienceAffinity: affinity, anchorRelevance, multipliers });
  const scoreMs = performance.now() - t0;
  // A dial given weight with nothing to read (no times, no dates added) is left out of the blend: say so.
  notes.push(...idleDialWords(idleDials(timeCoverageOf(world)).filter((d) => brief.weights[d] > 0)));
  const ev = (e: { item: number; similarity: number }): ProposedEvidence => ({
    itemId: ds.items[e.item]!.id,
    title: ds.items[e.item]!.title,
    similarity: e.similarity,
  });
  const facts = reasonFacts(world, brief, editionDate, affinity ? audience : null);
  const ranks = scores.ranks();
  const order = scores.order();
  const items = Array.from(order.subarray(0, n), (p): ProposedItem => {
    const s: ScoredItem = scores.explain(p);
    const it = ds.items[s.index]!;
    return {
      itemId: it.id,
      externalId: it.externalId,
      title: it.title,
      promoted: it.promoted,
      score: s.score,
      blended: s.blended,
      multiplier: s.multiplier,
      percentile: Math.round(s.percentile * 1000) / 10,
      rank: ranks[p]!,
      reason: mainReason({ ...s, contentStandsIn: scores.available.content }, facts),
      coldStart: s.coldStart,
      contributions: s.contributions,
      raw: s.raw,
      evidence: { content: s.evidence.content.map(ev), collaborative: s.evidence.collaborative.map(ev) },
    };
  });
  return {
    items,
    poolSize: pool.items.length,
    excluded: pool.excluded,
    weights: scores.weights,
    available: scores.available,
    audience: { customers: audience.length, used: report.customersUsed, exact: report.exact },
    scoreMs,
    notes,
  };
}
