import { workerData } from 'node:worker_threads';
import { helperStarted, runInverse, sharedSchedule, SpdWorkspace, TILE } from '../../core/linalg/spd-f32.ts';
import type { InverseHelperData } from './ease-inverse-threads.ts';

/**
 * A helper thread of EASE's inverse (ease-inverse-threads.ts starts it): it claims tiles of the shared
 * workspace until the last phase is done. A failure here (or in another thread) marks the shared
 * schedule failed, so no thread waits forever; the starting thread reports the error.
 */
const data = workerData as InverseHelperData;
const ws = new SpdWorkspace(data.layout, data.memory, data.thread);
const slots = new Int32Array(data.slots);
helperStarted(slots);
try {
  runInverse(ws, sharedSchedule(slots, data.layout.size / TILE, data.layout.threads, data.thread));
} catch {
  // runInverse has already marked the schedule failed; the starting thread raises its own error.
}
