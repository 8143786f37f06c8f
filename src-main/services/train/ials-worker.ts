import { parentPort, workerData } from 'node:worker_threads';
import { computeGramBlock, halfProblem } from '../../core/models/ials-fit.ts';
import { solveRows, solveScratchLength } from '../../core/models/ials-solve.ts';
import { fromShared, type PoolReply, type PoolTask, type SharedIals } from './ials-shared.ts';

/**
 * One iALS solver thread: it holds views on the shared factors and confidence matrices and, per task,
 * computes Gram blocks or solves a contiguous range of rows in place (ials-threads.ts coordinates).
 */
const state = fromShared(workerData as SharedIals);
const scratch = new Float64Array(solveScratchLength(state.k));
const port = parentPort!;

port.on('message', (t: PoolTask) => {
  const reply: PoolReply = { id: t.id };
  try {
    if (t.op === 'gram') {
      for (let b = t.from; b < t.to; b++) computeGramBlock(state, t.side, b);
      reply.value = 0;
    } else {
      reply.value = solveRows(halfProblem(state, t.side), t.from, t.to, scratch, t.observed);
    }
  } catch (e) {
    reply.error = { name: (e as Error).name, message: (e as Error).message };
  }
  port.postMessage(reply);
});
port.postMessage({ id: -1, value: 0 } satisfies PoolReply); // ready
