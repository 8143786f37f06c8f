import { CancelledError, InputError, ModelFitError } from '../errors.ts';
import type { Csr } from '../matrix/csr.ts';
import { transpose } from '../matrix/csr.ts';
import { seededRng } from '../rng.ts';
import { confidence, type IalsParams } from './ials-params.ts';
import { addGramRows, mirrorGram } from './ials-kernels.ts';
import { balancedRanges, solveRows, type ConfRows, type HalfProblem } from './ials-solve.ts';
import type { FitOptions } from './scorer.ts';

export type IalsSide = 'customers' | 'items';

/**
 * Everything one fit reads and writes, as typed arrays over buffers from `alloc`: plain ArrayBuffers
 * for a single-thread fit, SharedArrayBuffers when worker threads solve ranges of rows.
 */
export interface IalsState {
  params: IalsParams;
  k: number;
  customers: number;
  items: number;
  /** Customer factors, customers × k row-major. */
  x: Float32Array;
  /** Item factors, items × k row-major. */
  y: Float32Array;
  byCustomer: ConfRows;
  byItem: ConfRows;
  gramX: Float64Array;
  gramY: Float64Array;
  /** GRAM_BLOCKS partial Grams (k × k each), summed in block order. */
  gramParts: Float64Array;
  /** SOLVE_CHUNKS + 1 boundaries per side: the units of work threads claim in a half-iteration. */
  chunks: Record<IalsSide, Int32Array>;
  /** The next unclaimed chunk or Gram block (one Int32; reset before each unit of the schedule). */
  counter: Int32Array;
  /** Each chunk's observed loss part, summed in chunk order whoever solved it. */
  partials: Float64Array;
}

export type Alloc = (byteLength: number) => ArrayBufferLike;

/**
 * Grams are summed over this many fixed row blocks, whoever computes them, so one thread and several
 * threads add the same numbers in the same order and produce identical factors.
 */
export const GRAM_BLOCKS = 8;

/**
 * Each half-iteration's rows are cut into this many chunks of about equal estimated work, claimed one
 * at a time from a shared counter by whichever thread is free (dynamic scheduling: a thread slowed by
 * other work on a shared machine simply claims fewer, and a chunk of heavier rows than estimated
 * delays only itself). 256 keeps the claims (one atomic add each) negligible and the tail, at most one
 * chunk per thread, short (common practice, no source).
 */
export const SOLVE_CHUNKS = 256;

const plainAlloc: Alloc = (n) => new ArrayBuffer(n);

/**
 * Builds the confidence matrices (only entries with r > 0 are kept: p = 1 there, everything else is an
 * unobserved 0 with confidence 1) and seeds the factors with N(0, 0.01²) values (small random values are
 * common practice, no source; only their seed matters for reproducibility).
 */
export function prepareIals(m: Csr, params: IalsParams, alloc: Alloc = plainAlloc): IalsState {
  const k = params.factors;
  const byCustomer = confidenceRows(m, params, alloc);
  const t = transpose({ rows: m.rows, cols: m.cols, ...byCustomerAsCsr(byCustomer) });
  const byItem: ConfRows = {
    rows: t.rows,
    indptr: copyInto(new Int32Array(alloc(t.indptr.byteLength)), t.indptr),
    indices: copyInto(new Int32Array(alloc(t.indices.byteLength)), t.indices),
    conf: copyInto(new Float32Array(alloc(t.data.byteLength)), t.data),
  };
  const x = new Float32Array(alloc(4 * m.rows * k));
  const y = new Float32Array(alloc(4 * m.cols * k));
  const rng = seededRng(params.seed);
  for (let q = 0; q < x.length; q++) x[q] = 0.01 * rng.normal();
  for (let q = 0; q < y.length; q++) y[q] = 0.01 * rng.normal();
  return {
    params,
    k,
    customers: m.rows,
    items: m.cols,
    x,
    y,
    byCustomer,
    byItem,
    gramX: new Float64Array(alloc(8 * k * k)),
    gramY: new Float64Array(alloc(8 * k * k)),
    gramParts: new Float64Array(alloc(8 * GRAM_BLOCKS * k * k)),
    chunks: {
      customers: copyInto(new Int32Array(alloc(4 * (SOLVE_CHUNKS + 1))), balancedRanges(byCustomer.indptr, m.rows, k, SOLVE_CHUNKS)),
      items: copyInto(new Int32Array(alloc(4 * (SOLVE_CHUNKS + 1))), balancedRanges(byItem.indptr, m.cols, k, SOLVE_CHUNKS)),
    },
    counter: new Int32Array(alloc(4)),
    partials: new Float64Array(alloc(8 * SOLVE_CHUNKS)),
  };
}

function confidenceRows(m: Csr, params: IalsParams, alloc: Alloc): ConfRows {
  let kept = 0;
  const total = m.indptr[m.rows]!;
  for (let q = 0; q < total; q++) {
    const v = m.data[q]!;
    if (!Number.isFinite(v)) {
      const u = upperBound(m.indptr, q) - 1;
      throw new InputError(`interaction matrix has a non-finite value (${v}) at customer ${u}, item ${m.indices[q]}`);
    }
    if (v > 0) kept++;
  }
  const indptr = new Int32Array(alloc(4 * (m.rows + 1)));
  const indices = new Int32Array(alloc(4 * kept));
  const conf = new Float32Array(alloc(4 * kept));
  let w = 0;
  for (let u = 0; u < m.rows; u++) {
    for (let q = m.indptr[u]!, end = m.indptr[u + 1]!; q < end; q++) {
      const v = m.data[q]!;
      if (v > 0) {
        indices[w] = m.indices[q]!;
        conf[w++] = confidence(params, v);
      }
    }
    indptr[u + 1] = w;
  }
  return { rows: m.rows, indptr, indices, conf };
}

const byCustomerAsCsr = (c: ConfRows) => ({ indptr: c.indptr, indices: c.indices, data: c.conf });

function copyInto<T extends Int32Array | Float32Array>(to: T, from: ArrayLike<number>): T {
  to.set(from);
  return to;
}

/** The first index whose boundary exceeds q (rows are found from an entry position). */
function upperBound(indptr: Int32Array, q: number): number {
  let lo = 0;
  let hi = indptr.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (indptr[mid]! <= q) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The half-iteration that solves `side` with the other side held (its Gram must be current). */
export function halfProblem(s: IalsState, side: IalsSide): HalfProblem {
  const customers = side === 'customers';
  return {
    k: s.k,
    lambda: s.params.regularization,
    cgSteps: s.params.cgSteps,
    rows: customers ? s.byCustomer : s.byItem,
    target: customers ? s.x : s.y,
    fixed: customers ? s.y : s.x,
    gram: customers ? s.gramY : s.gramX,
  };
}

/** Rows [start, end) of Gram block b of a side with n rows. */
export function gramBlock(n: number, b: number): [number, number] {
  return [Math.floor((n * b) / GRAM_BLOCKS), Math.floor((n * (b + 1)) / GRAM_BLOCKS)];
}

/** Computes partial Gram block b of a side into its slot of `gramParts`. */
export function computeGramBlock(s: IalsState, side: IalsSide, b: number): void {
  const kk = s.k * s.k;
  const part = s.gramParts.subarray(b * kk, (b + 1) * kk);
  part.fill(0);
  const n = side === 'customers' ? s.customers : s.items;
  const [start, end] = gramBlock(n, b);
  addGramRows(side === 'customers' ? s.x : s.y, s.k, start, end, part);
}

/**
 * Claims Gram blocks of `side` from the shared counter until none is left, computing each; returns
 * how many this thread computed. Any split of the blocks gives the same sum (`sumGramBlocks`).
 */
export function claimGramBlocks(s: IalsState, side: IalsSide): number {
  let done = 0;
  for (let b = Atomics.add(s.counter, 0, 1); b < GRAM_BLOCKS; b = Atomics.add(s.counter, 0, 1)) {
    computeGramBlock(s, side, b);
    done++;
  }
  return done;
}

/**
 * Claims chunks of `side`'s rows from the shared counter until none is left and solves each, storing
 * its observed loss part (when `observed`) in `partials`; returns how many chunks this thread solved.
 */
export function claimSolveChunks(s: IalsState, side: IalsSide, observed: boolean, scratch: Float64Array): number {
  const h = halfProblem(s, side);
  const cuts = s.chunks[side];
  let done = 0;
  for (let c = Atomics.add(s.counter, 0, 1); c < SOLVE_CHUNKS; c = Atomics.add(s.counter, 0, 1)) {
    s.partials[c] = solveRows(h, cuts[c]!, cuts[c + 1]!, scratch, observed);
    done++;
  }
  return done;
}

/** The observed loss part of the last solve: the chunks' parts in chunk order (the same for any thread count). */
export function sumPartials(s: IalsState): number {
  let sum = 0;
  for (let c = 0; c < SOLVE_CHUNKS; c++) sum += s.partials[c]!;
  return sum;
}

/** Sums the partial blocks in block order into the side's Gram (FᵀF, k × k). */
export function sumGramBlocks(s: IalsState, side: IalsSide): void {
  const kk = s.k * s.k;
  const g = side === 'customers' ? s.gramX : s.gramY;
  g.fill(0);
  for (let b = 0; b < GRAM_BLOCKS; b++) {
    const off = b * kk;
    for (let q = 0; q < kk; q++) g[q] = g[q]! + s.gramParts[off + q]!;
  }
  mirrorGram(g, s.k);
}

/**
 * The loss of Hu et al. (2008), eq. (3): Σ_{u,i} c_ui (p_ui − x_uᵀy_i)² + λ(Σ‖x_u‖² + Σ‖y_i‖²), without a
 * dense loop: off the observed entries c = 1 and p = 0, so the sum over all pairs is
 * Σ_{all} (x_uᵀy_i)² + Σ_{observed} [c(1 − s)² − s²], and Σ_{all} (x_uᵀy_i)² = ⟨XᵀX, YᵀY⟩_F
 * (trace(XᵀX·YᵀY) with both symmetric). The regulariser is trace(XᵀX) + trace(YᵀY).
 */
export function ialsLoss(observed: number, gramX: Float64Array, gramY: Float64Array, k: number, lambda: number): number {
  let all = 0;
  for (let q = 0; q < k * k; q++) all += gramX[q]! * gramY[q]!;
  let norms = 0;
  for (let f = 0; f < k; f++) norms += gramX[f * k + f]! + gramY[f * k + f]!;
  return observed + all + lambda * norms;
}

/** One unit of work a runner performs for the schedule; `solve` yields back the observed loss part. */
export type IalsWork = { op: 'gram'; side: IalsSide } | { op: 'solve'; side: IalsSide; observed: boolean };

/**
 * The alternating schedule, written once for the single-thread and the worker-thread runners: the
 * runner performs each yielded unit and passes back the observed part of the loss after a solve.
 * Per iteration: solve customers (YᵀY current), XᵀX, solve items (summing the observed loss part),
 * YᵀY (needed by the loss and by the next iteration). Returns the loss after each iteration.
 */
export function* ialsSchedule(s: IalsState, opts: FitOptions): Generator<IalsWork, number[], number> {
  const { iterations, regularization } = s.params;
  const losses: number[] = [];
  const started = performance.now();
  if (opts.signal?.aborted) throw new CancelledError();
  yield { op: 'gram', side: 'items' };
  for (let it = 0; it < iterations; it++) {
    yield { op: 'solve', side: 'customers', observed: false };
    yield { op: 'gram', side: 'customers' };
    const observed = yield { op: 'solve', side: 'items', observed: true };
    yield { op: 'gram', side: 'items' };
    const loss = ialsLoss(observed, s.gramX, s.gramY, s.k, regularization);
    if (!Number.isFinite(loss)) {
      throw new ModelFitError(
        `iALS diverged at iteration ${it + 1}: loss is ${loss} (factors hold NaN or infinite values); ` +
          'lower alpha or raise regularization',
      );
    }
    losses.push(loss);
    opts.onIteration?.({ iteration: it + 1, iterations, elapsedMs: performance.now() - started, loss });
    // Iteration boundary: a cancel takes effect here, and after the last one too (the caller no longer
    // wants the result).
    if (opts.signal?.aborted) throw new CancelledError();
  }
  return losses;
}
