import { BugError, CancelledError, InputError, ModelFitError } from '../../core/errors.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import type { EaseParams } from '../../core/models/ease.ts';
import type { FitReport } from '../../core/models/scorer.ts';
import type { EaseWorkerData, EaseWorkerMessage } from './ease-worker.ts';
import { spawnWorker } from './spawn.ts';

const ERRORS: Record<string, new (message: string) => Error> = { InputError, ModelFitError, CancelledError };

export interface EaseInThread {
  /** The serialized model, its report and the EASE thread's own CPU time (-1 where unknown). */
  done: Promise<{ bytes: Uint8Array; report: FitReport; cpuMs: number }>;
  /** Stops the thread (a training that failed elsewhere or was cancelled no longer wants it). */
  stop(): void;
}

/**
 * Fits EASE in a thread of its own, so that its dense inverse (single-threaded, seconds at a few
 * thousand items) runs while the training thread fits the other models: on two cores the inverse
 * overlaps the cheap models and shares the cores with iALS, whose threads claim work dynamically and
 * so lose nothing but the CPU EASE takes. The matrix is copied to the thread (small next to the inverse).
 */
export function fitEaseInThread(matrix: Csr, params: EaseParams): EaseInThread {
  const url = new URL(import.meta.url.endsWith('.ts') ? './ease-worker.ts' : './ease-worker.js', import.meta.url);
  const worker = spawnWorker(url, { workerData: { matrix, params } satisfies EaseWorkerData });
  let settled = false;
  const done = new Promise<{ bytes: Uint8Array; report: FitReport; cpuMs: number }>((resolve, reject) => {
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      void worker.terminate();
      fn();
    };
    worker.on('message', (m: EaseWorkerMessage) => {
      if (m.type === 'done') finish(() => resolve({ bytes: m.bytes, report: m.report, cpuMs: m.cpuMs }));
      else {
        const Known = ERRORS[m.error.name];
        finish(() => reject(Known ? new Known(m.error.message) : new BugError(`EASE failed: ${m.error.name}: ${m.error.message}`)));
      }
    });
    worker.on('error', (e) => finish(() => reject(new BugError(`EASE thread failed: ${e.message}`))));
    worker.on('exit', (code) => finish(() => reject(new BugError(`EASE thread exited early (code ${code})`))));
  });
  done.catch(() => undefined); // observed by the caller when it awaits; never an unhandled rejection
  return {
    done,
    stop: () => {
      if (!settled) {
        settled = true;
        void worker.terminate();
      }
    },
  };
}
