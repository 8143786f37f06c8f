import type { Csr } from '../../core/matrix/csr.ts';
import type { EaseParams } from '../../core/models/ease.ts';
import type { FitReport } from '../../core/models/scorer.ts';
import type { EaseWorkerData } from './ease-worker.ts';
import { runWorkerTask, siblingModule } from './worker-task.ts';

export interface EaseInThread {
  /** The serialized model, its report and the EASE thread's own CPU time (-1 where unknown). */
  done: Promise<{ bytes: Uint8Array; report: FitReport; cpuMs: number }>;
  /** Stops the thread (a training that failed elsewhere or was cancelled no longer wants it). */
  stop(): void;
}

/**
 * Fits EASE in a thread of its own, so that its dense inverse (seconds at a few thousand items, minutes
 * at 20,000; from 2,000 items on `threads` threads sharing the matrix, ease-inverse-threads.ts, whose CPU
 * the reported cpuMs leaves out) runs while the training thread fits the other models: on two cores the inverse
 * overlaps the cheap models and shares the cores with iALS, whose threads claim work dynamically and
 * so lose nothing but the CPU EASE takes. The matrix is copied to the thread (small next to the inverse).
 */
export function fitEaseInThread(matrix: Csr, params: EaseParams, threads = 1): EaseInThread {
  type Done = { bytes: Uint8Array; report: FitReport; cpuMs: number };
  const task = runWorkerTask(siblingModule(import.meta.url, 'ease-worker'), { matrix, params, threads } satisfies EaseWorkerData, 'EASE', {
    result: (m: Done): Done => ({ bytes: m.bytes, report: m.report, cpuMs: m.cpuMs }),
  });
  task.done.catch(() => undefined); // observed by the caller when it awaits; never an unhandled rejection
  return task;
}
