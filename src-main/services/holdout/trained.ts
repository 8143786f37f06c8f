/**
 * The workspace's current trained models as rankers over the whole catalogue, plus the hybrid in customer
 * mode, for everything that ranks per customer (the holdout evaluation, the per-customer export). Loaded
 * once per call from the model store; a model trained on another catalogue size is left out with a note.
 */
import type { BlendWeights } from '../../core/curation/types.ts';
import { DEFAULT_WEIGHTS } from '../../core/editing/brief-schema.ts';
import { customerItemSets } from '../../core/matrix/by-customer.ts';
import { buildInteractionMatrix } from '../../core/matrix/build.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import { loadContent } from '../../core/models/content.ts';
import { loadEase } from '../../core/models/ease.ts';
import { loadIals } from '../../core/models/ials.ts';
import { loadItemKnn } from '../../core/models/itemknn.ts';
import { loadPopularity, trendRatios } from '../../core/models/popularity.ts';
import type { ModelKind, Scorer } from '../../core/models/scorer.ts';
import { CustomerHybrid, HybridScorer } from '../../core/scoring/index.ts';
import type { Dataset } from '../../core/types.ts';
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
  /** The hybrid over the loaded models, per customer; null when nothing could be loaded. */
  hybrid: CustomerHybrid | null;
  /** The same hybrid's shop-wide part (normalisation, item data, freshness). */
  hybridScorer: HybridScorer | null;
  weights: BlendWeights;
  /** Where the blend weights came from, in words. */
  weightsFrom: string;
  /** The instant freshness and trend are measured at: the latest signal time (deterministic, never the clock). */
  date: number;
  notes: string[];
}

/**
 * The hybrid's blend weights: those chosen by the latest offline evaluation (stored with the models; its
 * search covers all six weights), else the brief defaults with the content weight found by tuning, else
 * the brief defaults.
 */
export function storedBlendWeights(db: Db): { weights: BlendWeights; from: string } {
  const repo = new ModelRepo(db);
  for (const m of repo.list()) {
    if (!m.current) continue;
    const ev = m.evaluation as { offline?: { weights?: BlendWeights } } | null;
    if (ev?.offline?.weights) return { weights: { ...ev.offline.weights }, from: 'weights chosen by the latest evaluation' };
  }
  const content = repo.list().find((m) => m.current && m.kind === 'content');
  const tuned = (content?.evaluation as { tuning?: { hybridContentWeight?: number } } | null)?.tuning?.hybridContentWeight;
  if (tuned !== undefined) return { weights: { ...DEFAULT_WEIGHTS, content: tuned }, from: `default weights, content weight ${tuned} from tuning` };
  return { weights: { ...DEFAULT_WEIGHTS }, from: 'default weights' };
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
  const { weights, from } = storedBlendWeights(db);
  const content = scorers.get('content') ?? null;
  const collaborative = scorers.get('itemknn') ?? scorers.get('ease') ?? scorers.get('ials') ?? null;
  const affinity = scorers.get('ials') ?? collaborative;
  let hybrid: CustomerHybrid | null = null;
  let h: HybridScorer | null = null;
  if (content || collaborative) {
    h = new HybridScorer(
      { content, collaborative, affinity },
      {
        customersPerItem: columnCounts(matrix),
        trend: ds.signals.length > 0 ? Float32Array.from(trendRatios(ds, { now: date })) : null,
        addedAt: Float64Array.from(ds.items, (it) => it.addedAt ?? Number.NaN),
      },
    );
    hybrid = new CustomerHybrid(h, matrix, date);
  } else notes.push('no content or collaborative model is trained: the hybrid is left out (run train first)');
  return { matrix, scorers, hybrid, hybridScorer: h, weights, weightsFrom: from, date, notes };
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

