import { plural } from '../../core/util/plural.ts';
import { CancelledError } from '../../core/errors.ts';
import type { ValidatedBlend } from '../../core/eval/validated-blend.ts';
import type { ModelKind } from '../../core/models/scorer.ts';
import { BlendRepo } from '../../store/blends.ts';
import { scrubIfPending } from '../../store/erasure.ts';
import type { JobBody, JobProgress } from '../jobs.ts';
import { trainingSizes } from '../../store/stats.ts';
import { trainingOutlook } from './outlook.ts';
import type { Db } from '../../store/workspace.ts';
import { waitingLine, type WaitListener } from '../../store/write-lock.ts';
import { saveRun, STALE_NOTE } from './save-run.ts';
import { runWorkerTask, siblingModule } from './worker-task.ts';
import type { TrainOptions, TrainOutput, TrainProgress } from './train-models.ts';
import type { TrainWorkerData } from './train-worker.ts';

export interface TrainHooks {
  onProgress?: (p: TrainProgress) => void;
  /** Aborting terminates the training thread at once; nothing has been written, so nothing is undone. */
  signal?: AbortSignal;
  /** better-sqlite3 binding for another ABI (Electron), passed to the thread's own connection. */
  nativeBinding?: string;
  /** Told when saving has to wait for another process's write (default: the connection's listener). */
  onWait?: WaitListener;
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
  /** The data changed while training: the models were saved all the same and read as stale. */
  stale: boolean;
  /** The validated blend stored with the models. */
  blend?: ValidatedBlend;
}

/**
 * Trains off-thread, then stores every model in one transaction (all become current, or none). If a
 * customer was erased after the thread read the data, nothing is stored (ErasedSinceReadError): the
 * models were fitted on the erased person's signals, and iALS would hold their factor row again.
 */
export async function trainAndSave(
  db: Db,
  file: string,
  options: TrainOptions = {},
  hooks: TrainHooks & { keepHistory?: number } = {},
): Promise<TrainSummary> {
  let out: TrainOutput;
  try {
    out = await trainAll(file, options, hooks);
  } finally {
    // The thread's reads are over: an erasure made while it was reading can now empty the log.
    scrubIfPending(db);
  }
  if (hooks.signal?.aborted) throw new CancelledError('training cancelled');
  // The models and the blend learned for them become current together, or nothing changes.
  const { ids, stale } = await saveRun(db, out.records, out.fingerprint, out.erasureGeneration, {
    ...(hooks.keepHistory !== undefined && { keepHistory: hooks.keepHistory }),
    ...(hooks.signal && { signal: hooks.signal }),
    ...(hooks.onWait && { onWait: hooks.onWait }),
    ...(out.blend && { alsoStore: (saved: number[]) => void new BlendRepo(db).save(out.blend!, out.fingerprint, saved) }),
  });
  return {
    ids,
    models: out.records.map((r) => r.kind),
    fingerprint: out.fingerprint,
    elapsedMs: out.elapsedMs,
    notes: out.notes,
    stale,
    ...(out.blend && { blend: out.blend }),
  };
}

/**
 * Says up front what a long training will cost and what is quicker (outlook.ts), as the job's notice; a run
 * predicted short says nothing. `tuneBudget`: plain fits a search before it may spend (0: none).
 */
export function announceOutlook(db: Db, options: TrainOptions, tuneBudget: number, report: (p: JobProgress) => void): void {
  const ials = options.params?.ials;
  const { notice } = trainingOutlook(trainingSizes(db), {
    ...(options.models && { models: options.models }),
    tuneBudget,
    ...(ials?.factors !== undefined && { factors: ials.factors }),
    ...(ials?.iterations !== undefined && { iterations: ials.iterations }),
  });
  if (notice) report({ stage: 'starting', fraction: 0, notice });
}

/**
 * Training as a body for the app's JobRegistry (services/jobs.ts):
 * `ctx.jobs.start('train', trainJob(ctx.db, ctx.file, options))`.
 */
export function trainJob(db: Db, file: string, options: TrainOptions = {}, hooks: Omit<TrainHooks, 'signal' | 'onProgress'> = {}): JobBody {
  return async (report, signal) => {
    const onWait = (holder: string) => report({ stage: waitingLine(holder), fraction: 1 });
    announceOutlook(db, options, 0, report);
    const s = await trainAndSave(db, file, options, { ...hooks, onProgress: report, signal, onWait });
    const notes = s.notes.length ? ` (${plural(s.notes.length, 'note')})` : '';
    const hybrid = s.blend ? `; hybrid: ${s.blend.reason}` : '';
    return `trained ${plural(s.models.length, 'model')} in ${(s.elapsedMs / 1000).toFixed(1)} s${notes}${hybrid}${s.stale ? `; ${STALE_NOTE}` : ''}`;
  };
}
