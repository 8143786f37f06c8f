import fs from 'node:fs';
import { fileURLToPath } from 'node:url';
import { BugError, InputError, type Where } from '../core/errors.ts';
import type { IdMaps, SignalBatch } from '../store/catalogue-writes.ts';
import type { SignalReadOptions, SignalReadResult } from './signal-read.ts';
import { siblingModule, spawnWorker } from './spawn-worker.ts';

/**
 * Signal import as a two-stage pipeline: a worker thread parses, checks and resolves rows into typed-array
 * batches (signal-worker.ts) while this thread only runs the INSERTs, so on two free cores reading and
 * writing overlap. Same batches, same order, same rejects as `readSignals` in this thread: the worker runs
 * that very function. Customers created on the fly get their ids in the worker, in file order, from the
 * `nextCustomerId` sent at start, and are inserted by `emit` before the rows that use them.
 */

/** Batches the worker may run ahead of the writes (two in flight while one is written: double buffering). */
export const AHEAD = 3;

/** What the worker starts with: the options and the id maps as plain arrays (cheap to clone). */
export interface SignalThreadData {
  options: SignalReadOptions;
  items: { keys: string[]; ids: number[] };
  customers: { keys: string[]; ids: number[] };
  nextCustomerId: number;
  /** Int32 count of batches posted and not yet written. */
  unwritten: SharedArrayBuffer;
}

export type SignalThreadMessage =
  | { type: 'batch'; batch: SignalBatch }
  | { type: 'done'; result: SignalReadResult }
  | { type: 'error'; error: { name: string; message: string; where: Where | undefined } };

/**
 * The worker's module: beside this one, .ts in source (tsx, vitest), .js in a build (the bundler must emit
 * it under that name, as the train workers are: shell/electron/vite.electron.config.ts WORKERS).
 */
export function signalWorkerUrl(): URL {
  return siblingModule(import.meta.url, 'signal-worker');
}

/** Whether the parsing thread can start here (a build that lacks the worker's file cannot). */
export function signalWorkerAvailable(): boolean {
  const url = signalWorkerUrl();
  return url.protocol !== 'file:' || fs.existsSync(fileURLToPath(url));
}

/**
 * `readSignals` with the parsing in a worker thread. `emit` runs here, once per batch, in file order; if
 * it throws, the worker is stopped and the promise rejects with that error. `ids.nextCustomerId` and
 * `ids.customers` are not advanced here: `emit` (the writer) records the customers each batch creates.
 */
export function readSignalsInThread(o: SignalReadOptions, ids: IdMaps, emit: (b: SignalBatch) => void): Promise<SignalReadResult> {
  const unwritten = new Int32Array(new SharedArrayBuffer(4));
  const data: SignalThreadData = {
    options: o,
    items: ids.items.entries(),
    customers: ids.customers.entries(),
    nextCustomerId: ids.nextCustomerId,
    unwritten: unwritten.buffer as SharedArrayBuffer,
  };
  const worker = spawnWorker(signalWorkerUrl(), { workerData: data });
  return new Promise<SignalReadResult>((resolve, reject) => {
    let settled = false;
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      void worker.terminate();
      fn();
    };
    worker.on('message', (m: SignalThreadMessage) => {
      if (settled) return;
      if (m.type === 'batch') {
        try {
          emit(m.batch);
        } catch (e) {
          finish(() => reject(e as Error));
          return;
        }
        Atomics.sub(unwritten, 0, 1);
        Atomics.notify(unwritten, 0);
      } else if (m.type === 'done') finish(() => resolve(m.result));
      else if (m.error.name === 'InputError') finish(() => reject(new InputError(m.error.message, m.error.where)));
      else finish(() => reject(new BugError(`signal parsing thread failed: ${m.error.name}: ${m.error.message}`)));
    });
    worker.on('error', (e) => finish(() => reject(new BugError(`signal parsing thread failed: ${e.message}`))));
    worker.on('exit', (code) => finish(() => reject(new BugError(`signal parsing thread exited early (code ${code})`))));
  });
}
