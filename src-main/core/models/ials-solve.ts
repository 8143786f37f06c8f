/**
 * The hot loops of iALS, as pure functions over typed arrays so that worker threads can run them on
 * shared buffers, each over its own contiguous range of rows (rows are independent given the other
 * side's factors, so any split gives bit-identical results).
 *
 * Notation of Hu, Koren & Volinsky (2008): for a row u (a customer, or an item in the other half),
 *   x_u = (YᵀY + Yᵀ(C_u − I)Y + λI)⁻¹ Yᵀ C_u p_u                                    (eq. 4)
 * with p_ui = 1 on observed entries and 0 elsewhere, c_ui = 1 off the observed entries. YᵀY is shared
 * by every row (computed once per half-iteration); only the observed entries add to it.
 * The system is solved by a few conjugate-gradient steps warm-started from the current x_u, as in
 * Takács, Pilászy & Tikk (2011), "Applications of the conjugate gradient method for implicit feedback
 * collaborative filtering" (the product A·p is formed without building A; equation numbers from memory).
 */
import { addObservedTerms, dotFF, GROUP, gramTimesGroup } from './ials-kernels.ts';

/** One side's confidence matrix in CSR: rows are the vectors being solved, columns index `fixed`. */
export interface ConfRows {
  rows: number;
  indptr: Int32Array;
  indices: Int32Array;
  /** c_ui for observed entries (all > 0 preference); unobserved entries are not stored. */
  conf: Float32Array;
}

/** One half-iteration: solve every row of `target` with `fixed` held. */
export interface HalfProblem {
  k: number;
  lambda: number;
  cgSteps: number;
  rows: ConfRows;
  /** rows × k, row-major; read as the warm start and overwritten with the solution. */
  target: Float32Array;
  /** cols × k, row-major. */
  fixed: Float32Array;
  /** fixedᵀfixed, k × k row-major. */
  gram: Float64Array;
}

/** Scratch length `solveRows` needs: x, r, p and A·p for each of the GROUP rows, then their r·r. */
export const solveScratchLength = (k: number): number => 4 * GROUP * k + GROUP;

/** Below this squared residual norm CG stops (the system is solved to float precision). */
const RESIDUAL_FLOOR = 1e-20;

/**
 * Solves rows [start, end) in place. With `wantObserved`, returns Σ over the observed entries of those
 * rows of c·(1 − s)² − s², s = x_u·y_i computed from the stored (float32) solution: the observed part of
 * the loss (see `ialsLoss`); otherwise returns 0.
 * Rows go through CG in groups of GROUP, in lockstep, so that one pass over YᵀY serves the whole group
 * (ials-kernels.ts); each row still follows its own CG exactly (its own step sizes and stopping).
 */
export function solveRows(
  h: HalfProblem,
  start: number,
  end: number,
  scratch: Float64Array,
  wantObserved: boolean,
): number {
  const { k, target, fixed } = h;
  const { indptr, indices, conf } = h.rows;
  let observed = 0;
  for (let u0 = start; u0 < end; u0 += GROUP) {
    const n = Math.min(GROUP, end - u0);
    solveGroup(h, u0, n, scratch);
    if (!wantObserved) continue;
    for (let u = u0; u < u0 + n; u++) {
      const base = u * k;
      for (let q = indptr[u]!, p1 = indptr[u + 1]!; q < p1; q++) {
        const s = dotFF(fixed, indices[q]! * k, target, base, k);
        const e = 1 - s;
        observed += conf[q]! * e * e - s * s;
      }
    }
  }
  return observed;
}

/** CG for rows u0 .. u0+n−1 (n ≤ GROUP); the unused slots of the group hold zero vectors and stay idle. */
function solveGroup(h: HalfProblem, u0: number, n: number, scratch: Float64Array): void {
  const { k, lambda, cgSteps, target, fixed, gram } = h;
  const { indptr, indices, conf } = h.rows;
  const gk = GROUP * k;
  const X = 0;
  const R = gk;
  const P = 2 * gk;
  const AP = 3 * gk;
  const RS = 4 * gk; // r·r per row; 0 marks a row whose CG has stopped

  for (let v = 0; v < GROUP; v++) {
    const off = v * k;
    if (v < n) {
      const base = (u0 + v) * k;
      for (let f = 0; f < k; f++) scratch[X + off + f] = target[base + f]!;
    } else {
      for (let f = 0; f < k; f++) scratch[X + off + f] = 0;
    }
  }
  // r = b − A x = Σ_i c_i y_i − (YᵀY + λI) x − Σ_i (c_i − 1)(y_i·x) y_i
  gramTimesGroup(gram, lambda, scratch, X, scratch, R, k);
  for (let v = 0; v < GROUP; v++) {
    const off = v * k;
    for (let f = 0; f < k; f++) scratch[R + off + f] = -scratch[R + off + f]!;
    if (v < n) addObservedTerms(fixed, indices, conf, indptr[u0 + v]!, indptr[u0 + v + 1]!, scratch, X + off, scratch, R + off, k, 1, -1);
    let rs = 0;
    for (let f = 0; f < k; f++) {
      const r = scratch[R + off + f]!;
      scratch[P + off + f] = r;
      rs += r * r;
    }
    scratch[RS + v] = v < n && rs > RESIDUAL_FLOOR ? rs : 0;
  }

  for (let step = 0; step < cgSteps; step++) {
    let live = 0;
    for (let v = 0; v < n; v++) if (scratch[RS + v]! > 0) live++;
    if (live === 0) break;
    // Ap = (YᵀY + λI) p + Σ_i (c_i − 1)(y_i·p) y_i
    gramTimesGroup(gram, lambda, scratch, P, scratch, AP, k);
    for (let v = 0; v < n; v++) {
      const rs = scratch[RS + v]!;
      if (rs === 0) continue;
      const off = v * k;
      addObservedTerms(fixed, indices, conf, indptr[u0 + v]!, indptr[u0 + v + 1]!, scratch, P + off, scratch, AP + off, k, 0, 1);
      let pAp = 0;
      for (let f = 0; f < k; f++) pAp += scratch[P + off + f]! * scratch[AP + off + f]!;
      if (!(pAp > 0)) {
        scratch[RS + v] = 0; // A is positive definite; 0 or NaN means p vanished in rounding
        continue;
      }
      const a = rs / pAp;
      let rsNew = 0;
      for (let f = 0; f < k; f++) {
        scratch[X + off + f] = scratch[X + off + f]! + a * scratch[P + off + f]!;
        const r = scratch[R + off + f]! - a * scratch[AP + off + f]!;
        scratch[R + off + f] = r;
        rsNew += r * r;
      }
      const beta = rsNew / rs;
      for (let f = 0; f < k; f++) scratch[P + off + f] = scratch[R + off + f]! + beta * scratch[P + off + f]!;
      scratch[RS + v] = rsNew > RESIDUAL_FLOOR ? rsNew : 0;
    }
  }
  for (let v = 0; v < n; v++) {
    const base = (u0 + v) * k;
    const off = X + v * k;
    for (let f = 0; f < k; f++) target[base + f] = scratch[off + f]!;
  }
}

/**
 * Splits rows into `parts` contiguous ranges of about equal work, where a row costs
 * (cgSteps + 1)·(2k² + 4k·nnz_row) flops (the dense Gram product plus two passes over its entries).
 * Returns parts + 1 boundaries.
 */
export function balancedRanges(indptr: Int32Array, rows: number, k: number, parts: number): Int32Array {
  const out = new Int32Array(parts + 1);
  const rowCost = (u: number) => 2 * k * k + 4 * k * (indptr[u + 1]! - indptr[u]!);
  let total = 0;
  for (let u = 0; u < rows; u++) total += rowCost(u);
  let acc = 0;
  let part = 1;
  for (let u = 0; u < rows && part < parts; u++) {
    const before = acc;
    acc += rowCost(u);
    // cut before or after row u, whichever lands nearer the target share
    for (let target = (total * part) / parts; part < parts && acc >= target; target = (total * part) / parts) {
      const cut = target - before < acc - target ? Math.max(u, out[part - 1]!) : u + 1;
      out[part++] = cut;
    }
  }
  while (part <= parts) out[part++] = rows;
  return out;
}
