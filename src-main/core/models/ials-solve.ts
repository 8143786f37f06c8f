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

/** Scratch length `solveRows` needs (x, r, p, Ap). */
export const solveScratchLength = (k: number): number => 4 * k;

/** Below this squared residual norm CG stops (the system is solved to float precision). */
const RESIDUAL_FLOOR = 1e-20;

/**
 * Solves rows [start, end) in place. With `wantObserved`, returns Σ over the observed entries of those
 * rows of c·(1 − s)² − s², s = x_u·y_i computed from the stored (float32) solution: the observed part of
 * the loss (see `ialsLoss`); otherwise returns 0.
 */
export function solveRows(
  h: HalfProblem,
  start: number,
  end: number,
  scratch: Float64Array,
  wantObserved: boolean,
): number {
  const { k, lambda, cgSteps, target, fixed, gram } = h;
  const { indptr, indices, conf } = h.rows;
  const x = scratch.subarray(0, k);
  const r = scratch.subarray(k, 2 * k);
  const p = scratch.subarray(2 * k, 3 * k);
  const ap = scratch.subarray(3 * k, 4 * k);
  let observed = 0;
  for (let u = start; u < end; u++) {
    const base = u * k;
    const p0 = indptr[u]!;
    const p1 = indptr[u + 1]!;
    for (let f = 0; f < k; f++) x[f] = target[base + f]!;

    // r = b − A x = Σ_i c_i y_i − (YᵀY + λI) x − Σ_i (c_i − 1)(y_i·x) y_i
    gramTimes(gram, lambda, x, r, k);
    for (let f = 0; f < k; f++) r[f] = -r[f]!;
    for (let q = p0; q < p1; q++) {
      const j = indices[q]! * k;
      const c = conf[q]!;
      const d = dotFx(fixed, j, x, k);
      const w = c - (c - 1) * d;
      for (let f = 0; f < k; f++) r[f] = r[f]! + w * fixed[j + f]!;
    }
    let rs = 0;
    for (let f = 0; f < k; f++) {
      const v = r[f]!;
      p[f] = v;
      rs += v * v;
    }

    for (let step = 0; step < cgSteps && rs > RESIDUAL_FLOOR; step++) {
      // Ap = (YᵀY + λI) p + Σ_i (c_i − 1)(y_i·p) y_i
      gramTimes(gram, lambda, p, ap, k);
      for (let q = p0; q < p1; q++) {
        const j = indices[q]! * k;
        const w = (conf[q]! - 1) * dotFx(fixed, j, p, k);
        for (let f = 0; f < k; f++) ap[f] = ap[f]! + w * fixed[j + f]!;
      }
      let pAp = 0;
      for (let f = 0; f < k; f++) pAp += p[f]! * ap[f]!;
      if (!(pAp > 0)) break; // A is positive definite; 0 or NaN means p vanished in rounding
      const a = rs / pAp;
      let rsNew = 0;
      for (let f = 0; f < k; f++) {
        x[f] = x[f]! + a * p[f]!;
        const v = r[f]! - a * ap[f]!;
        r[f] = v;
        rsNew += v * v;
      }
      const beta = rsNew / rs;
      for (let f = 0; f < k; f++) p[f] = r[f]! + beta * p[f]!;
      rs = rsNew;
    }
    for (let f = 0; f < k; f++) target[base + f] = x[f]!;

    if (wantObserved) {
      for (let q = p0; q < p1; q++) {
        const s = dotFF(fixed, indices[q]! * k, target, base, k);
        const e = 1 - s;
        observed += conf[q]! * e * e - s * s;
      }
    }
  }
  return observed;
}

/** out = (G + λI) v for a k × k row-major G. */
function gramTimes(g: Float64Array, lambda: number, v: Float64Array, out: Float64Array, k: number): void {
  for (let f = 0; f < k; f++) {
    const row = f * k;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let g2 = 0;
    for (; g2 + 3 < k; g2 += 4) {
      s0 += g[row + g2]! * v[g2]!;
      s1 += g[row + g2 + 1]! * v[g2 + 1]!;
      s2 += g[row + g2 + 2]! * v[g2 + 2]!;
      s3 += g[row + g2 + 3]! * v[g2 + 3]!;
    }
    for (; g2 < k; g2++) s0 += g[row + g2]! * v[g2]!;
    out[f] = s0 + s1 + s2 + s3 + lambda * v[f]!;
  }
}

/** Row `off` of a float32 factor matrix dotted with a float64 vector, four accumulators. */
function dotFx(a: Float32Array, off: number, v: Float64Array, k: number): number {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let f = 0;
  for (; f + 3 < k; f += 4) {
    s0 += a[off + f]! * v[f]!;
    s1 += a[off + f + 1]! * v[f + 1]!;
    s2 += a[off + f + 2]! * v[f + 2]!;
    s3 += a[off + f + 3]! * v[f + 3]!;
  }
  for (; f < k; f++) s0 += a[off + f]! * v[f]!;
  return s0 + s1 + s2 + s3;
}

/** Dot product of two float32 factor rows. */
export function dotFF(a: Float32Array, aOff: number, b: Float32Array, bOff: number, k: number): number {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let f = 0;
  for (; f + 3 < k; f += 4) {
    s0 += a[aOff + f]! * b[bOff + f]!;
    s1 += a[aOff + f + 1]! * b[bOff + f + 1]!;
    s2 += a[aOff + f + 2]! * b[bOff + f + 2]!;
    s3 += a[aOff + f + 3]! * b[bOff + f + 3]!;
  }
  for (; f < k; f++) s0 += a[aOff + f]! * b[bOff + f]!;
  return s0 + s1 + s2 + s3;
}

/**
 * Adds FᵀF over rows [start, end) of an n × k row-major F into `out` (k × k, upper triangle only;
 * `mirrorGram` fills the lower one). Summing fixed blocks in a fixed order keeps the result identical
 * however many threads computed the blocks.
 */
export function addGramRows(factors: Float32Array, k: number, start: number, end: number, out: Float64Array): void {
  for (let u = start; u < end; u++) {
    const base = u * k;
    for (let f = 0; f < k; f++) {
      const a = factors[base + f]!;
      if (a === 0) continue;
      const row = f * k;
      for (let g = f; g < k; g++) out[row + g] = out[row + g]! + a * factors[base + g]!;
    }
  }
}

/** Copies the upper triangle of a k × k matrix onto the lower one. */
export function mirrorGram(g: Float64Array, k: number): void {
  for (let f = 0; f < k; f++) for (let h = f + 1; h < k; h++) g[h * k + f] = g[f * k + h]!;
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
