import { parentPort, workerData } from 'node:worker_threads';
import { openWorkspace } from '../../store/workspace.ts';
import { trainModels, type TrainOptions } from './train-models.ts';

/**
 * The training thread: it opens its own read-only connection (better-sqlite3 docs/threads.md: a
 * connection belongs to one thread), trains, and posts progress and the serialized models back.
 * It never writes; the caller stores the result in one transaction.
 */
export interface TrainWorkerData {
  file: string;
  options: TrainOptions;
  nativeBinding?: string;
}

export type TrainWorkerMessage =
  | { type: 'progress'; progress: Parameters<Parameters<typeof trainModels>[2]>[0] }
  | { type: 'done'; output: Awaited<ReturnType<typeof trainModels>> }
  | { type: 'error'; error: { name: string; message: string } };

const port = parentPort!;
const data = workerData as TrainWorkerData;

async function main(): Promise<void> {
  const db = openWorkspace(data.file, {
    readonly: true,
    ...(data.nativeBinding !== undefined ? { nativeBinding: data.nativeBinding } : {}),
  });
  try {
    const output = await trainModels(db, data.options, (progress) => port.postMessage({ type: 'progress', progress } satisfies TrainWorkerMessage));
    port.postMessage({ type: 'done', output } satisfies TrainWorkerMessage);
  } finally {
    db.close();
  }
}

main().catch((e: unknown) => {
  const err = e instanceof Error ? e : new Error(String(e));
  port.postMessage({ type: 'error', error: { name: err.name, message: err.message } } satisfies TrainWorkerMessage);
});
