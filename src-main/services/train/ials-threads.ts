import os from 'node:os';
import type { Worker } from 'node:worker_threads';
import { BugError } from '../../core/errors.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import {
  claimGramBlocks,
  claimSolveChunks,
  GRAM_BLOCKS,
  ialsSchedule,
  prepareIals,
  sumGramBlocks,
  sumPartials,
  type IalsState,
  type IalsWork,
} from '../../core/models/ials-fit.ts';
import { fitIals, ialsReport, IalsModel } from '../../core/models/ials.ts';
import { ialsParams, type IalsParams } from '../../core/models/ials-params.ts';
import { solveScratchLength } from '../../core/models/ials-solve.ts';
import type { FitOptions, FitReport } from '../../core/models/scorer.ts';
import { toShared, type PoolReply, type PoolTask } from './ials-shared.ts';
import { spawnWorker } from './spawn.ts';
import { siblingModule } from './worker-task.ts';

export interface ThreadedFitOptions extends FitOptions {
  /** Threads that solve rows, this one included (default: the machine's cores, at most 8). */
  threads?: number;
}

export const defaultThreads = (): number => Math.max(1, Math.min(GRAM_BLOCKS, os.availableParallelism()));

/**
 * iALS with each half-iteration spread over threads: the factors and confidence matrices live in
 * SharedArrayBuffers, and this thread and every worker claim chunks of rows (ials-fit.ts,
 * SOLVE_CHUNKS) from a shared counter until none is left; the schedule waits for all before the next
 * half-iteration. Claiming instead of fixed ranges keeps both cores busy when one thread is slowed
 * (other processes on the machine, heavier rows than estimated). Rows are independent given the other
 * side, Grams are summed over fixed blocks in a fixed order, and the observed loss over fixed chunks
 * in chunk order, so the factors and losses are bit-identical to `fitIals` with the same seed.
 */
export async function fitIalsThreaded(
  m: Csr,
  given: Partial<IalsParams> = {},
  opts: ThreadedFitOptions = {},
): Promise<{ model: IalsModel; report: FitReport }> {
  const params = ialsParams(given);
  const threads = Math.max(1, Math.min(opts.threads ?? defaultThreads(), GRAM_BLOCKS));
  if (threads === 1) return fitIals(m, params, opts);
  const started = performance.now();
  const state = prepareIals(m, params, (n) => new SharedArrayBuffer(n));
  const pool = await SolverPool.start(state, threads - 1);
  try {
    const scratch = new Float64Array(solveScratchLength(params.factors));
    const taken = new Float64Array(threads); // row chunks solved per thread, this one first
    const schedule = ialsSchedule(state, opts);
    let step = schedule.next();
    while (!step.done) step = schedule.next(await runShared(state, pool, step.value, scratch, taken));
    // Copies out of shared memory: the model keeps ordinary buffers after the workers are gone.
    const model = new IalsModel(params, state.x.slice(), state.y.slice());
    const total = taken.reduce((a, b) => a + b, 0);
    const shares = Array.from(taken, (t) => `${Math.round((100 * t) / total)}%`).join(' / ');
    const notes = [`solved on ${threads} threads (shares of the row chunks: ${shares})`];
    return { model, report: ialsReport(performance.now() - started, step.value, notes) };
  } finally {
    await pool.close();
  }
}

/** One unit of the schedule on every thread: each claims blocks or chunks until none is left. */
async function runShared(s: IalsState, pool: SolverPool, work: IalsWork, scratch: Float64Array, taken: Float64Array): Promise<number> {
  Atomics.store(s.counter, 0, 0);
  const task = { op: work.op, side: work.side, observed: work.op === 'solve' && work.observed };
  const pending = pool.workers.map((_, w) => pool.run(w, task));
  const mine = work.op === 'gram' ? claimGramBlocks(s, work.side) : claimSolveChunks(s, work.side, task.observed, scratch);
  const theirs = await Promise.all(pending);
  if (work.op === 'gram') {
    sumGramBlocks(s, work.side);
    return 0;
  }
  taken[0]! += mine;
  theirs.forEach((n, w) => (taken[w + 1]! += n));
  return task.observed ? sumPartials(s) : 0;
}

/** Worker threads holding the shared state; one task in flight per worker. */
class SolverPool {
  readonly workers: Worker[];
  readonly #waiting = new Map<number, { resolve: (v: number) => void; reject: (e: Error) => void }>();
  #next = 0;
  #failure: Error | null = null;

  private constructor(workers: Worker[]) {
    this.workers = workers;
  }

  get size(): number {
    return this.workers.length;
  }

  static async start(state: IalsState, count: number): Promise<SolverPool> {
    const url = siblingModule(import.meta.url, 'ials-worker');
    const shared = toShared(state);
    const workers = Array.from({ length: count }, () => spawnWorker(url, { workerData: shared }));
    const pool = new SolverPool(workers);
    const ready = workers.map(
      (w) =>
        new Promise<void>((resolve, reject) => {
          const onReady = (r: PoolReply) => {
            if (r.id !== -1) return;
            w.off('message', onReady);
            resolve();
          };
          w.on('message', onReady);
          w.once('error', reject);
        }),
    );
    for (const w of workers) {
      w.on('message', (r: PoolReply) => pool.#settle(r));
      w.on('error', (e) => pool.#fail(e));
      w.on('exit', (code) => {
        if (code !== 0) pool.#fail(new BugError(`iALS worker exited with code ${code}`));
      });
    }
    try {
      await Promise.all(ready);
    } catch (e) {
      await pool.close();
      throw e;
    }
    return pool;
  }

  run(w: number, task: Omit<PoolTask, 'id'>): Promise<number> {
    if (this.#failure) return Promise.reject(this.#failure);
    const id = this.#next++;
    return new Promise<number>((resolve, reject) => {
      this.#waiting.set(id, { resolve, reject });
      this.workers[w]!.postMessage({ ...task, id } satisfies PoolTask);
    });
  }

  #settle(r: PoolReply): void {
    const waiter = this.#waiting.get(r.id);
    if (!waiter) return;
    this.#waiting.delete(r.id);
    if (r.error) waiter.reject(new BugError(`iALS worker failed: ${r.error.name}: ${r.error.message}`));
    else waiter.resolve(r.value ?? 0);
  }

  #fail(e: Error): void {
    this.#failure ??= e;
    for (const w of this.#waiting.values()) w.reject(e);
    this.#waiting.clear();
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.terminate()));
  }
}
