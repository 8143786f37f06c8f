import { BugError, CancelledError, InputError, ModelFitError, NotFoundError } from '../../core/errors.ts';
import type { EvaluateOptions, WorkspaceEvaluation } from '../evaluate.ts';
import { spawnWorker } from '../train/spawn.ts';
import type { OfflineProgress, OfflineTask, OfflineWorkerData, OfflineWorkerMessage } from './offline-worker.ts';
import type { TuneOptions, TuneResult } from './tune.ts';

export interface OfflineHooks {
  onProgress?: (p: OfflineProgress) => void;
  /** Aborting terminates the thread at once; it has written nothing. */
  signal?: AbortSignal;
  nativeBinding?: string;
}

const ERRORS: Record<string, new (message: string) => Error> = { InputError, ModelFitError, NotFoundError, CancelledError };

function runOffline(file: string, job: OfflineTask, hooks: OfflineHooks): Promise<unknown> {
  const { signal } = hooks;
  if (signal?.aborted) return Promise.reject(new CancelledError('cancelled'));
  return new Promise((resolve, reject) => {
    const data: OfflineWorkerData = { file, job, ...(hooks.nativeBinding !== undefined && { nativeBinding: hooks.nativeBinding }) };
    const url = new URL(import.meta.url.endsWith('.ts') ? './offline-worker.ts' : './offline-worker.js', import.meta.url);
    const worker = spawnWorker(url, { workerData: data });
    let settled = false;
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      signal?.removeEventListener('abort', onAbort);
      void worker.terminate();
      fn();
    };
    const onAbort = () => finish(() => reject(new CancelledError('cancelled')));
    signal?.addEventListener('abort', onAbort, { once: true });
    worker.on('message', (m: OfflineWorkerMessage) => {
      if (m.type === 'progress') {
        if (!settled) hooks.onProgress?.(m.progress);
      } else if (m.type === 'done') finish(() => resolve(m.result));
      else {
        const Known = ERRORS[m.error.name];
        finish(() => reject(Known ? new Known(m.error.message) : new BugError(`${job.task} failed: ${m.error.name}: ${m.error.message}`)));
      }
    });
    worker.on('error', (e) => finish(() => reject(new BugError(`${job.task} thread failed: ${e.message}`))));
    worker.on('exit', (code) => finish(() => reject(new BugError(`${job.task} thread exited early (code ${code})`))));
  });
}

/** tuneDataset (tune.ts) on the workspace file, in its own thread. */
export function tuneInThread(file: string, options: Omit<TuneOptions, 'signal' | 'onProgress'>, hooks: OfflineHooks = {}): Promise<TuneResult> {
  return runOffline(file, { task: 'tune', options }, hooks) as Promise<TuneResult>;
}

/** evaluateWorkspace (services/evaluate.ts) on the workspace file, in its own thread. */
export function evaluateInThread(file: string, options: Omit<EvaluateOptions, 'signal'>, hooks: OfflineHooks = {}): Promise<WorkspaceEvaluation> {
  return runOffline(file, { task: 'evaluate', options }, hooks) as Promise<WorkspaceEvaluation>;
}
