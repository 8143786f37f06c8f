import { spdInverseF32 } from '../../core/linalg/spd-f32.ts';
import type { EaseSolveHooks } from '../../core/models/ease-weights.ts';
import { invertInThreads } from './ease-inverse-threads.ts';

/** Below this many items the inverse takes well under a second and a helper thread's start-up would not pay. */
export const THREADED_MIN_ITEMS = 2000;

/**
 * The inverse hook `fitEase` takes: on `threads` threads from THREADED_MIN_ITEMS items on (ease-inverse-threads.ts,
 * bit-identical to one thread), else this thread alone. It blocks in Atomics.wait, so callers run in a worker
 * thread: training's EASE thread, and the validated blend's refit inside the training thread.
 */
export function easeSolver(threads: number): Pick<EaseSolveHooks, 'invert'> {
  if (threads <= 1) return {};
  return { invert: (m, writeLower) => (m >= THREADED_MIN_ITEMS ? invertInThreads(m, writeLower, threads) : spdInverseF32(m, writeLower)) };
}
