import { parentPort, workerData } from 'node:worker_threads';
import { claimGramBlocks, claimSolveChunks } from '../../core/models/ials-fit.ts';
import { solveScratchLength } from '../../core/models/ials-solve.ts';
import { fromShared, type PoolReply, type PoolTask, type SharedIals } from './ials-shared.ts';

/**
 * One iALS solver thread: it holds views on the shared factors and confidence matrices and, per task,
 * claims Gram blocks or chunks of rows from the shared counter and computes or solves them in place
 * until none is left (ials-threads.ts coordinates), replying with how many it took.
 */
const state = fromShared(workerData as SharedIals);
const scratch = new Float64Array(solveScratchLength(state.k));
const port = parentPort!;

port.on('message', (t: PoolTask) => {
  const reply: PoolReply = { id: t.id };
  try {
    reply.value = t.op === 'gram' ? claimGramBlocks(state, t.side) : claimSolveChunks(state, t.side, t.observed, scratch);
  } catch (e) {
    reply.error = { name: (e as Error).name, message: (e as Error).message };
  }
  port.postMessage(reply);
});
port.postMessage({ id: -1, value: 0 } satisfies PoolReply); // ready
