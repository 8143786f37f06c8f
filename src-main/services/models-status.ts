/**
 * What the models screen and `shelfwright evaluate` read: each current model with its status, and the
 * offline evaluation stored with the models. A model's evaluation record holds up to two parts:
 * `tuning` (train --tune, services/tune) and `offline` (the latest evaluation run, stored here).
 */
import { plural } from '../core/util/plural.ts';
import { CancelledError, InputError } from '../core/errors.ts';
import type { EaseParams } from '../core/models/ease.ts';
import type { ContentParams } from '../core/models/content.ts';
import type { PopularityParams } from '../core/models/popularity.ts';
import type { IalsParams } from '../core/models/ials-params.ts';
import type { ItemKnnParams } from '../core/models/itemknn.ts';
import { dataFingerprint, ModelRepo, modelStatus, type ModelStatus } from '../store/models.ts';
import type { Db } from '../store/workspace.ts';
import type { EvaluateOptions, WorkspaceEvaluation } from './evaluate.ts';
import type { JobBody } from './jobs.ts';
import { evaluateInThread } from './tune/offline-thread.ts';

export interface StoredOffline extends WorkspaceEvaluation {
  evaluatedAt: number;
  /** Data fingerprint at evaluation time. */
  fingerprint: string;
}

export interface ModelEvaluationRecord {
  offline?: StoredOffline;
  tuning?: unknown;
  /** The tuner's notes about this model from the tuning its settings came from (services/tune/train-tuned.ts). */
  tunerNotes?: string[];
}

export function listModels(db: Db): ModelStatus[] {
  return modelStatus(db);
}

/**
 * The latest stored offline evaluation, from the current models or the ones they replaced (the store keeps
 * the previous model of each kind), so a retrain does not wipe the figures off the screen: they stay, marked
 * as measuring the models before (`retrainedSince`). null when no stored model carries one.
 */
export function latestEvaluation(db: Db): (StoredOffline & { retrainedSince: boolean }) | null {
  const all = new ModelRepo(db).list();
  let best: StoredOffline | null = null;
  for (const m of all) {
    const off = (m.evaluation as ModelEvaluationRecord | null)?.offline;
    if (off && (!best || off.evaluatedAt > best.evaluatedAt)) best = off;
  }
  if (!best) return null;
  // evaluateAndStore runs after the models it measures were trained: any current model trained later is not in it.
  const retrainedSince = all.some((m) => m.current && m.trainedAt > best.evaluatedAt);
  return { ...best, retrainedSince };
}

/**
 * Evaluates with the stored models' parameters (so a tuned setting is what is measured) and stores the
 * result with every current model, keeping each model's tuning record. One transaction.
 */
export async function evaluateAndStore(
  db: Db,
  file: string,
  options: Omit<EvaluateOptions, 'params' | 'signal'> = {},
  signal?: AbortSignal,
): Promise<StoredOffline> {
  const current = modelStatus(db);
  if (current.length === 0) throw new InputError('no trained models: run train first');
  const params: NonNullable<EvaluateOptions['params']> = {};
  for (const m of current) {
    if (m.kind === 'itemknn') params.itemknn = m.params as ItemKnnParams;
    if (m.kind === 'ials') params.ials = m.params as Partial<IalsParams>;
    if (m.kind === 'ease') params.ease = m.params as EaseParams;
    if (m.kind === 'content') params.content = m.params as ContentParams;
    if (m.kind === 'popularity') params.popularity = m.params as PopularityParams;
  }
  const result = await evaluateInThread(file, { ...options, params }, signal ? { signal } : {});
  if (signal?.aborted) throw new CancelledError('evaluation cancelled');
  const stored: StoredOffline = { ...result, evaluatedAt: Date.now(), fingerprint: dataFingerprint(db) };
  const repo = new ModelRepo(db);
  db.transaction(() => {
    for (const m of current) {
      const prev = (m.evaluation as ModelEvaluationRecord | null) ?? {};
      repo.setEvaluation(m.id, { ...prev, offline: stored });
    }
  })();
  return stored;
}

/** The evaluation as a job body (services/jobs.ts); the work runs in its own thread (tune/offline-thread.ts). */
export function evaluateJob(db: Db, file: string, options: Omit<EvaluateOptions, 'params' | 'signal'> = {}): JobBody {
  return async (report, signal) => {
    report({ stage: 'evaluate', fraction: 0.05 });
    const r = await evaluateAndStore(db, file, options, signal);
    const best = r.test[0];
    return `evaluated ${plural(r.test.length, 'model')} at K=${r.k}${best ? `; best ${best.model} NDCG ${best.ndcg.toFixed(3)}` : ''}`;
  };
}
