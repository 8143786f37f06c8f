import { BugError, CancelledError, InputError, ModelFitError, NotFoundError } from '../../core/errors.ts';
import { spawnWorker } from './spawn.ts';

/** What every task thread posts: progress, then one `done` (with its own fields) or one `error`. */
export type TaskMessage<P, D extends object> =
  | { type: 'progress'; progress: P }
  | ({ type: 'done' } & D)
  | { type: 'error'; error: { name: string; message: string } };

/** Errors that keep their kind across the thread boundary (the api maps them to codes). */
const KNOWN: Record<string, new (message: string) => Error> = { InputError, ModelFitError, NotFoundError, CancelledError };

export interface WorkerTask<T> {
  done: Promise<T>;
  /** Ends the thread now; `done` rejects with CancelledError unless it has already settled. */
  stop(): void;
}

/**
 * Runs one task in a thread of its own: progress is forwarded, the result picked from the `done` message,
 * errors re-raised with their kind, and an abort (or `stop`) terminates the thread at once. Task threads
 * write nothing, so a stopped task leaves nothing to undo. `label` names the task in messages.
 */
export function runWorkerTask<P, D extends object, T>(
  url: URL,
  workerData: unknown,
  label: string,
  hooks: { onProgress?: ((p: P) => void) | undefined; signal?: AbortSignal | undefined; result: (m: D) => T },
): WorkerTask<T> {
  const { signal } = hooks;
  let stop = () => {};
  const done = new Promise<T>((resolve, reject) => {
    if (signal?.aborted) {
      reject(new CancelledError(`${label} cancelled`));
      return;
    }
    const worker = spawnWorker(url, { workerData });
    let settled = false;
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      signal?.removeEventListener('abort', onAbort);
      void worker.terminate();
      fn();
    };
    const onAbort = () => finish(() => reject(new CancelledError(`${label} cancelled`)));
    stop = onAbort;
    signal?.addEventListener('abort', onAbort, { once: true });
    worker.on('message', (m: TaskMessage<P, D>) => {
      if (m.type === 'progress') {
        if (!settled) hooks.onProgress?.(m.progress);
      } else if (m.type === 'done') finish(() => resolve(hooks.result(m as D)));
      else {
        const Known = KNOWN[m.error.name];
        finish(() => reject(Known ? new Known(m.error.message) : new BugError(`${label} failed: ${m.error.name}: ${m.error.message}`)));
      }
    });
    worker.on('error', (e) => finish(() => reject(new BugError(`${label} thread failed: ${e.message}`))));
    worker.on('exit', (code) => finish(() => reject(new BugError(`${label} thread exited early (code ${code})`))));
  });
  return { done, stop: () => stop() };
}

export { siblingModule } from '../../ingest/spawn-worker.ts';
