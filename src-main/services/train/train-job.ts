import { plural } from '../../core/util/plural.ts';
import { CancelledError } from '../../core/errors.ts';
import type { ValidatedBlend } from '../../core/eval/validated-blend.ts';
import type { ModelKind } from '../../core/models/scorer.ts';
import { BlendRepo } from '../../store/blends.ts';
import { ModelRepo } from '../../store/models.ts';
import type { JobBody } from '../jobs.ts';
import type { Db } from '../../store/workspace.ts';
import { runWorkerTask, siblingModule } from './worker-task.ts';
import type { TrainOptions, TrainOutput, TrainProgress } from './train-models.ts';
import type { TrainWorkerData } from './train-worker.ts';

export interface TrainHooks {
  onProgress?: (p: TrainProgress) => void;
  /** Aborting terminates the training thread at once; nothing has been written, so nothing is undone. */
  signal?: AbortSignal;
  /** better-sqlite3 binding for another ABI (Electron), passed to the thread's own connection. */
  nativeBinding?: string;
}


/**
 * Trains every model of a workspace in a worker thread, off the caller's thread, and returns the
 * serialized models with their reports. The thread opens the file read-only and writes nothing.
 */
export function trainAll(file: string, options: TrainOptions = {}, hooks: TrainHooks = {}): Promise<TrainOutput> {
  const data: TrainWorkerData = { file, options, ...(hooks.nativeBinding ? { nativeBinding: hooks.nativeBinding } : {}) };
  return runWorkerTask(siblingModule(import.meta.url, 'train-worker'), data, 'training', {
    onProgress: hooks.onProgress,
    signal: hooks.signal,
    result: (m: { output: TrainOutput }) => m.output,
  }).done;
}

export interface TrainSummary {
  /** Row ids of the stored models, in training order. */
  ids: number[];
  models: ModelKind[];
  fingerprint: string;
  elapsedMs: number;
  notes: string[];
  /** The validated blend stored with the models. */
  blend?: ValidatedBlend;
}

/** Trains off-thread, then stores every model in one transaction (all become current, or none). */
export async function trainAndSave(
  db: Db,
  file: string,
  options: TrainOptions = {},
  hooks: TrainHooks & { keepHistory?: number } = {},
): Promise<TrainSummary> {
  const out = await trainAll(file, options, hooks);
  if (hooks.signal?.aborted) throw new CancelledError('training cancelled');
  // The models and the blend learned for them become current together, or nothing changes.
  const ids = db.transaction(() => {
    const saved = new ModelRepo(db, hooks.keepHistory ?? 1).saveAll(out.records);
    if (out.blend) new BlendRepo(db).save(out.blend, out.fingerprint, saved);
    return saved;
  })();
  return { ids, models: out.records.map((r) => r.kind), fingerprint: out.fingerprint, elapsedMs: out.elapsedMs, notes: out.notes, ...(out.blend && { blend: out.blend }) };
}

/**
 * Training as a body for the app's JobRegistry (services/jobs.ts):
 * `ctx.jobs.start('train', trainJob(ctx.db, ctx.file, options))`.
 */
export function trainJob(db: Db, file: string, options: TrainOptions = {}, hooks: Omit<TrainHooks, 'signal' | 'onProgress'> = {}): JobBody {
  return async (report, signal) => {
    const s = await trainAndSave(db, file, options, { ...hooks, onProgress: report, signal });
    const notes = s.notes.length ? ` (${s.notes.length} notes)` : '';
    const hybrid = s.blend ? `; hybrid: ${s.blend.reason}` : '';
    return `trained ${plural(s.models.length, 'model')} in ${(s.elapsedMs / 1000).toFixed(1)} s${notes}${hybrid}`;
  };
}
