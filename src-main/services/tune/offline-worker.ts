import { parentPort, workerData } from 'node:worker_threads';
import { loadDataset } from '../../store/dataset.ts';
import { openWorkspace } from '../../store/workspace.ts';
import { evaluateWorkspace, type EvaluateOptions, type WorkspaceEvaluation } from '../evaluate.ts';
import { defaultThreads } from '../train/ials-threads.ts';
import { tuneDataset, type TuneOptions, type TuneResult } from './tune.ts';

/**
 * The thread tuning and offline evaluation run in, so the app's main thread (and its IPC) stays responsive
 * while a grid of ~20 fits or an evaluation runs. It opens its own read-only connection (better-sqlite3
 * docs/threads.md), computes, and posts progress and the result back; it never writes.
 */
export type OfflineTask =
  | { task: 'tune'; options: Omit<TuneOptions, 'signal' | 'onProgress'> }
  | { task: 'evaluate'; options: Omit<EvaluateOptions, 'signal'> };

export interface OfflineWorkerData {
  file: string;
  job: OfflineTask;
  nativeBinding?: string;
}

export type OfflineProgress = { model: string; trial: number; trials: number; fraction: number };

export type OfflineWorkerMessage =
  | { type: 'progress'; progress: OfflineProgress }
  | { type: 'done'; result: TuneResult | WorkspaceEvaluation }
  | { type: 'error'; error: { name: string; message: string } };

const port = parentPort!;
const data = workerData as OfflineWorkerData;

async function main(): Promise<void> {
  const db = openWorkspace(data.file, { readonly: true, ...(data.nativeBinding !== undefined && { nativeBinding: data.nativeBinding }) });
  try {
    const job = data.job;
    const result =
      job.task === 'tune'
        ? await tuneDataset(loadDataset(db), { ...job.options, onProgress: (progress) => port.postMessage({ type: 'progress', progress } satisfies OfflineWorkerMessage) })
        : evaluateWorkspace(db, { threads: defaultThreads(), ...job.options }); // EASE's inverse may block here: a worker thread
    port.postMessage({ type: 'done', result } satisfies OfflineWorkerMessage);
  } finally {
    db.close();
  }
}

main().catch((e: unknown) => {
  const err = e instanceof Error ? e : new Error(String(e));
  port.postMessage({ type: 'error', error: { name: err.name, message: err.message } } satisfies OfflineWorkerMessage);
});
