import fs from 'node:fs';
import { parentPort, workerData } from 'node:worker_threads';
import type { Csr } from '../../core/matrix/csr.ts';
import { fitEase, type EaseParams } from '../../core/models/ease.ts';
import type { FitReport } from '../../core/models/scorer.ts';
import { easeSolver } from './ease-solver.ts';

/**
 * The EASE thread of a training run (ease-thread.ts starts it): it fits EASE on the interaction
 * matrix it was given while the training thread goes on with the other models, and posts back the
 * serialized model, its report and the CPU time this thread used.
 */
export interface EaseWorkerData {
  matrix: Csr;
  params: EaseParams;
  /** Threads for the inverse (ease-inverse-threads.ts); 1 or absent: this thread alone. */
  threads?: number;
}

export type EaseWorkerMessage =
  | { type: 'done'; bytes: Uint8Array; report: FitReport; cpuMs: number }
  | { type: 'error'; error: { name: string; message: string } };

/**
 * CPU milliseconds of this thread alone: utime + stime of /proc/thread-self/stat (fields 14 and 15,
 * clock ticks of 10 ms: proc(5)); process.cpuUsage() would count every thread. Off Linux, -1.
 */
function threadCpuMs(): number {
  try {
    const stat = fs.readFileSync('/proc/thread-self/stat', 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(fields[11]) + Number(fields[12])) * 10;
  } catch {
    return -1;
  }
}

const port = parentPort!;
const data = workerData as EaseWorkerData;
try {
  const before = threadCpuMs();
  const threads = data.threads ?? 1;
  const { model, report } = fitEase(data.matrix, data.params, {}, easeSolver(threads));
  const bytes = model.serialize();
  const after = threadCpuMs();
  const cpuMs = before < 0 || after < 0 ? -1 : after - before;
  port.postMessage({ type: 'done', bytes, report, cpuMs } satisfies EaseWorkerMessage, [bytes.buffer as ArrayBuffer]);
} catch (e) {
  const err = e instanceof Error ? e : new Error(String(e));
  port.postMessage({ type: 'error', error: { name: err.name, message: err.message } } satisfies EaseWorkerMessage);
}
