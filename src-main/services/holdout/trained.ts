/**
 * The workspace's current trained models as rankers over the whole catalogue, plus the validated blend
 * (the hybrid) per customer, for everything that ranks per customer (the holdout evaluation, the per-customer export). Loaded
 * once per call from the model store; a model trained on another catalogue size is left out with a note.
 */
import { describeBlend, type BlendSpec } from '../../core/eval/validated-blend.ts';
import { customerItemSets } from '../../core/matrix/by-customer.ts';
import { buildInteractionMatrix } from '../../core/matrix/build.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import { loadContent } from '../../core/models/content.ts';
import { loadEase } from '../../core/models/ease.ts';
import { loadIals } from '../../core/models/ials.ts';
import { loadItemKnn } from '../../core/models/itemknn.ts';
import { fitPopularity, loadPopularity, PopularityModel, RECENT_POPULARITY } from '../../core/models/popularity.ts';
import type { ModelKind, Scorer } from '../../core/models/scorer.ts';
import { BlendScorer } from '../../core/scoring/blend-scorer.ts';
import type { Dataset } from '../../core/types.ts';
import { BlendRepo } from '../../store/blends.ts';
import { ModelRepo } from '../../store/models.ts';
import type { Db } from '../../store/workspace.ts';

const LOADERS: Record<Exclude<ModelKind, 'random'>, (b: Uint8Array) => Scorer> = {
  content: loadContent,
  itemknn: loadItemKnn,
  ials: loadIals,
  ease: loadEase,
  popularity: loadPopularity,
};

/** Order of the rows of every table: the learned models, then the popularity baseline. */
export const RANKED_KINDS = ['content', 'itemknn', 'ials', 'ease', 'popularity'] as const;

export interface TrainedModels {
  /** The interaction matrix (kind weights, no decay) the history-based models read rows from. */
  matrix: Csr;
  scorers: Map<string, Scorer>;
  /** The validated blend over the loaded models, per customer; null when nothing could be loaded. */
  blend: BlendScorer | null;
  /** What the blend is and why, as stored by training (or the fallback used when none is stored). */
  blendInfo: BlendSpec & { reason: string; validated: boolean };
  /** What the hybrid is, in words ("0.65 itemknn + 0.35 popularity (ranks per customer)", "is ease"). */
  weightsFrom: string;
  /** The instant freshness and trend are measured at: the latest signal time (deterministic, never the clock). */
  date: number;
  notes: string[];
}

/**
 * The validated blend stored by the latest training (store/blends.ts). A workspace trained before blends
 * were stored has none: the hybrid is then the first trained of item-kNN, EASE, iALS, content, popularity,
 * unvalidated, with content for cold items, and a note asks for a retrain.
 */
export function storedBlend(db: Db, available: ReadonlySet<string>): { spec: BlendSpec & { reason: string; validated: boolean }; note: string | null } {
  const stored = new BlendRepo(db).current();
  if (stored) return { spec: stored.blend, note: null };
  const model = (['itemknn', 'ease', 'ials', 'content', 'popularity'] as const).find((m) => available.has(m)) ?? 'itemknn';
  const coldContent = available.has('content') && model !== 'content';
  return {
    spec: { kind: 'single', model, normalisation: 'zscore', weights: { [model]: 1 }, coldContent, validated: false, reason: `no validated blend is stored: the hybrid is ${model} until the next training` },
    note: 'no validated blend is stored with these models: run train to learn one',
  };
}

/** Latest signal time, else latest item date, else 0: a reproducible "now" for freshness and trend. */
export function datasetDate(ds: Dataset): number {
  let t = -Infinity;
  const at = ds.signals.at;
  for (let k = 0; k < ds.signals.length; k++) if (at[k]! > t) t = at[k]!;
  if (t === -Infinity) for (const it of ds.items) if (it.addedAt !== null && it.addedAt > t) t = it.addedAt;
  return t === -Infinity ? 0 : t;
}

export function loadTrainedModels(db: Db, ds: Dataset): TrainedModels {
  const repo = new ModelRepo(db);
  const notes: string[] = [];
  const scorers = new Map<string, Scorer>();
  const n = ds.items.length;
  for (const kind of RANKED_KINDS) {
    const stored = repo.loadCurrent(kind);
    if (!stored) continue;
    const model = LOADERS[kind](stored.bytes);
    if (model.itemCount !== n) {
      notes.push(`${kind} was trained on ${model.itemCount} items, the catalogue has ${n}: left out until retrained`);
      continue;
    }
    scorers.set(kind, model);
  }
  const matrix = buildInteractionMatrix(ds);
  const date = datasetDate(ds);
  const { spec, note } = storedBlend(db, new Set(scorers.keys()));
  if (note) notes.push(note);
  let blend: BlendScorer | null = null;
  if (scorers.size > 0) {
    blend = new BlendScorer(spec, scorers, columnCounts(matrix));
    if (blend.missing.length) notes.push(`the validated blend's ${blend.missing.join(', ')} is no longer trained: left out, the other weights rescaled (retrain)`);
  } else notes.push('no model is trained: the hybrid is left out (run train first)');
  // The "popularity" row stays the all-time count of customers, the baseline every table (and the quality
  // reference's popularity) is read against; a trained recent popularity, which the blend above serves, is a
  // row of its own.
  const pop = scorers.get('popularity');
  if (pop instanceof PopularityModel && pop.fitHalfLifeDays !== null) {
    scorers.set('popularity', fitPopularity(matrix).model);
    scorers.set(RECENT_POPULARITY, pop);
    notes.push(`popularity in the hybrid counts recent customers (half-life ${pop.fitHalfLifeDays} d, row ${RECENT_POPULARITY}); the popularity row is all-time counts`);
  }
  return { matrix, scorers, blend, blendInfo: spec, weightsFrom: `${describeBlend(spec)}${spec.validated ? '' : ', not validated'}`, date, notes };
}

/** The validated blend over the current models, for audiences' relevance (the curation world); null without models. */
export function blendOf(db: Db, ds: Dataset): { scorer: BlendScorer; history: Csr } | null {
  const t = loadTrainedModels(db, ds);
  return t.blend ? { scorer: t.blend, history: t.matrix } : null;
}

/** Customers per item (stored entries per column). */
export function columnCounts(m: Csr): Int32Array {
  const out = new Int32Array(m.cols);
  const end = m.indptr[m.rows]!;
  for (let p = 0; p < end; p++) out[m.indices[p]!]!++;
  return out;
}

/**
 * Every (customer, item) pair the workspace holds, whatever the signal's kind or value, as a binary CSR:
 * what a customer "already has". A low rating still means the customer knows the item, so it is excluded
 * from their list even though it carries no positive weight in the interaction matrix.
 */
export function ownedMatrix(ds: Dataset): Csr {
  return customerItemSets(ds.signals, ds.customerIds.length, ds.items.length);
}

