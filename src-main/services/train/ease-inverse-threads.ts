import type { Worker } from 'node:worker_threads';
import { BugError } from '../../core/errors.ts';
import { awaitHelpers, claimsPerThread, runInverse, scheduleSlots, sharedSchedule, spdLayout, spdMemory, SpdWorkspace, TILE } from '../../core/linalg/spd-f32.ts';
import { spawnWorker } from './spawn.ts';
import { siblingModule } from './worker-task.ts';

/** A thread that has not started in this long is taken as failed (tsx start-up takes about a second). */
const HELPER_START_LIMIT_MS = 60_000;

/** What a helper thread of the inverse receives (ease-inverse-worker.ts). */
export interface InverseHelperData {
  memory: WebAssembly.Memory;
  layout: ReturnType<typeof spdLayout>;
  slots: SharedArrayBuffer;
  thread: number;
}

/**
 * EASE's float32 inverse (core/linalg/spd-f32.ts) on `threads` threads sharing one WebAssembly memory:
 * this thread writes the Gram matrix, starts threads − 1 helpers, and then all of them claim tiles of
 * the same three phases (sharedSchedule). Synchronous for the caller: it blocks in Atomics.wait until
 * the last phase is done, so it belongs in a worker thread (the EASE thread of training), never the main
 * thread of a shell. Every thread computes each tile exactly as one thread would (same kernel, same
 * order of sums within a tile), so the result equals the single-thread one bit for bit.
 */
export function invertInThreads(
  m: number,
  writeLower: (ws: SpdWorkspace) => void,
  threads: number,
  hooks: { signal?: AbortSignal; onPhase?: (phase: number, phases: number) => void; onClaims?: (blocksPerThread: number[]) => void } = {},
): SpdWorkspace {
  const layout = spdLayout(m, threads);
  const memory = spdMemory(layout, true);
  const ws = new SpdWorkspace(layout, memory, 0);
  ws.reset();
  writeLower(ws);
  const blocks = layout.size / TILE;
  const slots = new SharedArrayBuffer(scheduleSlots(blocks, threads) * 4);
  const counters = new Int32Array(slots);
  const url = siblingModule(import.meta.url, 'ease-inverse-worker');
  const helpers: Worker[] = [];
  try {
    for (let t = 1; t < threads; t++) {
      helpers.push(spawnWorker(url, { workerData: { memory, layout, slots, thread: t } satisfies InverseHelperData }));
    }
    const schedule = sharedSchedule(counters, blocks, threads, 0);
    if (!awaitHelpers(counters, threads - 1, HELPER_START_LIMIT_MS)) {
      schedule.fail();
      throw new BugError(`EASE inverse: ${threads - 1} helper threads did not start within ${HELPER_START_LIMIT_MS / 1000} s`);
    }
    runInverse(ws, schedule, hooks);
    hooks.onClaims?.(claimsPerThread(counters, blocks, threads));
  } finally {
    for (const h of helpers) void h.terminate();
  }
  ws.mirrorLower();
  hooks.onPhase?.(3, 3);
  return ws;
}
