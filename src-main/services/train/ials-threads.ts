import os from 'node:os';
import type { Worker } from 'node:worker_threads';
import { BugError } from '../../core/errors.ts';
import type { Csr } from '../../core/matrix/csr.ts';
import {
  computeGramBlock,
  GRAM_BLOCKS,
  halfProblem,
  ialsSchedule,
  prepareIals,
  sumGramBlocks,
  type IalsSide,
  type IalsState,
  type IalsWork,
} from '../../core/models/ials-fit.ts';
import { fitIals, ialsReport, IalsModel } from '../../core/models/ials.ts';
import { ialsParams, type IalsParams } from '../../core/models/ials-params.ts';
import { balancedRanges, solveRows, solveScratchLength } from '../../core/models/ials-solve.ts';
import type { FitOptions, FitReport } from '../../core/models/scorer.ts';
import { toShared, type PoolReply, type PoolTask } from './ials-shared.ts';
import { spawnWorker } from './spawn.ts';

export interface ThreadedFitOptions extends FitOptions {
  /** Threads that solve rows, this one included (default: the machine's cores, at most 8). */
  threads?: number;
}

export const defaultThreads = (): number => Math.max(1, Math.min(GRAM_BLOCKS, os.availableParallelism()));

/**
 * iALS with each half-iteration spread over threads: the factors and confidence matrices live in
 * SharedArrayBuffers, this thread solves the first range of rows and each worker one further
 * contiguous range (split by estimated work), and the schedule waits for all ranges before the next
 * half-iteration. Rows are independent given the other side, and Grams are summed over fixed blocks in
 * a fixed order, so the factors are bit-identical to `fitIals` with the same seed.
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
    const k = params.factors;
    const ranges: Record<IalsSide, Int32Array> = {
      customers: balancedRanges(state.byCustomer.indptr, state.customers, k, threads),
      items: balancedRanges(state.byItem.indptr, state.items, k, threads),
    };
    const scratch = new Float64Array(solveScratchLength(k));
    const schedule = ialsSchedule(state, opts);
    let step = schedule.next();
    while (!step.done) step = schedule.next(await runSpread(state, pool, ranges, step.value, scratch));
    // Copies out of shared memory: the model keeps ordinary buffers after the workers are gone.
    const model = new IalsModel(params, state.x.slice(), state.y.slice());
    return { model, report: ialsReport(performance.now() - started, step.value, [`solved on ${threads} threads`]) };
  } finally {
    await pool.close();
  }
}

async function runSpread(
  s: IalsState,
  pool: SolverPool,
  ranges: Record<IalsSide, Int32Array>,
  work: IalsWork,
  scratch: Float64Array,
): Promise<number> {
  const parts = pool.size + 1;
  if (work.op === 'gram') {
    const cut = (b: number) => Math.floor((GRAM_BLOCKS * b) / parts);
    const pending = pool.workers.map((_, w) =>
      pool.run(w, { op: 'gram', side: work.side, from: cut(w + 1), to: cut(w + 2), observed: false }),
    );
    for (let b = 0; b < cut(1); b++) computeGramBlock(s, work.side, b);
    await Promise.all(pending);
    sumGramBlocks(s, work.side);
    return 0;
  }
  const r = ranges[work.side];
  const pending = pool.workers.map((_, w) =>
    pool.run(w, { op: 'solve', side: work.side, from: r[w + 1]!, to: r[w + 2]!, observed: work.observed }),
  );
  let observed = solveRows(halfProblem(s, work.side), r[0]!, r[1]!, scratch, work.observed);
  for (const v of await Promise.all(pending)) observed += v; // in range order
  return observed;
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
    const url = new URL(import.meta.url.endsWith('.ts') ? './ials-worker.ts' : './ials-worker.js', import.meta.url);
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
