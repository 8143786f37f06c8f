import type { EvaluateOptions, WorkspaceEvaluation } from '../evaluate.ts';
import { runWorkerTask, siblingModule } from '../train/worker-task.ts';
import type { OfflineProgress, OfflineTask, OfflineWorkerData } from './offline-worker.ts';
import type { TuneOptions, TuneResult } from './tune.ts';

export interface OfflineHooks {
  onProgress?: (p: OfflineProgress) => void;
  /** Aborting terminates the thread at once; it has written nothing. */
  signal?: AbortSignal;
  nativeBinding?: string;
}

function runOffline(file: string, job: OfflineTask, hooks: OfflineHooks): Promise<unknown> {
  const data: OfflineWorkerData = { file, job, ...(hooks.nativeBinding !== undefined && { nativeBinding: hooks.nativeBinding }) };
  return runWorkerTask(siblingModule(import.meta.url, 'offline-worker'), data, job.task, {
    onProgress: hooks.onProgress,
    signal: hooks.signal,
    result: (m: { result: unknown }) => m.result,
  }).done;
}

/** tuneDataset (tune.ts) on the workspace file, in its own thread. */
export function tuneInThread(file: string, options: Omit<TuneOptions, 'signal' | 'onProgress'>, hooks: OfflineHooks = {}): Promise<TuneResult> {
  return runOffline(file, { task: 'tune', options }, hooks) as Promise<TuneResult>;
}

/** evaluateWorkspace (services/evaluate.ts) on the workspace file, in its own thread. */
export function evaluateInThread(file: string, options: Omit<EvaluateOptions, 'signal'>, hooks: OfflineHooks = {}): Promise<WorkspaceEvaluation> {
  return runOffline(file, { task: 'evaluate', options }, hooks) as Promise<WorkspaceEvaluation>;
}
