/**
 * The register-blocked inner loops of the iALS solver (ials-solve.ts). Each loop is arranged so that
 * one loaded value feeds several multiply-adds (register blocking, Golub & Van Loan, Matrix
 * Computations, §1.5): the dense product with YᵀY serves GROUP rows per pass over YᵀY, the sparse sums
 * over a row's observed entries take four entries per pass over the vector, and the Gram adds four
 * rows per pass over FᵀF. Measured with process.cpuUsage on the model benchmark's large set (k = 64,
 * one thread): the sparse sums, most of the work, went from about 1.0 to 1.7–2.1 GFLOP per CPU-second
 * (they wait on memory: each row's factor rows are scattered over tens of MB), the Gram from 1.0 to
 * 2.7; the dense product runs near 4.7 either way (the blocking spares re-reading YᵀY from L2).
 *
 * Determinism: every output is a function of its own row's data only, summed in an order fixed by
 * that row (never by which rows share its group or its thread), so a fit split over threads is
 * bit-identical to one on a single thread.
 */

/** Rows solved together in lockstep by ials-solve.ts; the dense product reads YᵀY once for all of them. */
export const GROUP = 4;

/**
 * out_v = (G + λI)·v_v for the GROUP vectors stored at vOff + v·k of `vs` (G is k × k row-major),
 * written to oOff + v·k of `out`. Four rows of G by four vectors per pass, as kernel.ts's dot4x4:
 * 8 loads feed 16 multiply-adds, and G (32 KB at k = 64, more than L1 holds beside a row's factors)
 * is read once per group instead of once per row. Each output sums g = 0..k−1 in order in one
 * accumulator, whatever the blocking.
 */
export function gramTimesGroup(g: Float64Array, lambda: number, vs: Float64Array, vOff: number, out: Float64Array, oOff: number, k: number): void {
  const v0 = vOff;
  const v1 = v0 + k;
  const v2 = v1 + k;
  const v3 = v2 + k;
  const o1 = oOff + k;
  const o2 = o1 + k;
  const o3 = o2 + k;
  let f = 0;
  for (; f + 3 < k; f += 4) {
    const ra = f * k;
    const rb = ra + k;
    const rc = rb + k;
    const rd = rc + k;
    let a0 = 0, a1 = 0, a2 = 0, a3 = 0;
    let b0 = 0, b1 = 0, b2 = 0, b3 = 0;
    let c0 = 0, c1 = 0, c2 = 0, c3 = 0;
    let d0 = 0, d1 = 0, d2 = 0, d3 = 0;
    for (let c = 0; c < k; c++) {
      const x0 = vs[v0 + c]!;
      const x1 = vs[v1 + c]!;
      const x2 = vs[v2 + c]!;
      const x3 = vs[v3 + c]!;
      const ga = g[ra + c]!;
      const gb = g[rb + c]!;
      const gc = g[rc + c]!;
      const gd = g[rd + c]!;
      a0 += ga * x0; a1 += ga * x1; a2 += ga * x2; a3 += ga * x3;
      b0 += gb * x0; b1 += gb * x1; b2 += gb * x2; b3 += gb * x3;
      c0 += gc * x0; c1 += gc * x1; c2 += gc * x2; c3 += gc * x3;
      d0 += gd * x0; d1 += gd * x1; d2 += gd * x2; d3 += gd * x3;
    }
    out[oOff + f] = a0 + lambda * vs[v0 + f]!;
    out[o1 + f] = a1 + lambda * vs[v1 + f]!;
    out[o2 + f] = a2 + lambda * vs[v2 + f]!;
    out[o3 + f] = a3 + lambda * vs[v3 + f]!;
    out[oOff + f + 1] = b0 + lambda * vs[v0 + f + 1]!;
    out[o1 + f + 1] = b1 + lambda * vs[v1 + f + 1]!;
    out[o2 + f + 1] = b2 + lambda * vs[v2 + f + 1]!;
    out[o3 + f + 1] = b3 + lambda * vs[v3 + f + 1]!;
    out[oOff + f + 2] = c0 + lambda * vs[v0 + f + 2]!;
    out[o1 + f + 2] = c1 + lambda * vs[v1 + f + 2]!;
    out[o2 + f + 2] = c2 + lambda * vs[v2 + f + 2]!;
    out[o3 + f + 2] = c3 + lambda * vs[v3 + f + 2]!;
    out[oOff + f + 3] = d0 + lambda * vs[v0 + f + 3]!;
    out[o1 + f + 3] = d1 + lambda * vs[v1 + f + 3]!;
    out[o2 + f + 3] = d2 + lambda * vs[v2 + f + 3]!;
    out[o3 + f + 3] = d3 + lambda * vs[v3 + f + 3]!;
  }
  for (; f < k; f++) {
    const ra = f * k;
    let a0 = 0, a1 = 0, a2 = 0, a3 = 0;
    for (let c = 0; c < k; c++) {
      const ga = g[ra + c]!;
      a0 += ga * vs[v0 + c]!; a1 += ga * vs[v1 + c]!; a2 += ga * vs[v2 + c]!; a3 += ga * vs[v3 + c]!;
    }
    out[oOff + f] = a0 + lambda * vs[v0 + f]!;
    out[o1 + f] = a1 + lambda * vs[v1 + f]!;
    out[o2 + f] = a2 + lambda * vs[v2 + f]!;
    out[o3 + f] = a3 + lambda * vs[v3 + f]!;
  }
}

/**
 * The observed entries' part of a CG product, for entries q in [p0, p1) of a CSR row:
 *   out += Σ_q w_q · y_{j_q},   w_q = base·c_q + sign·(c_q − 1)·(y_{j_q} · v),
 * with y_j row j of the float32 `fixed` factors and v at vOff of `vs`. With base 0, sign +1 this is
 * Yᵀ(C_u − I)Y·v (the product A·p); with base 1, sign −1 it is YᵀC_u p_u − Yᵀ(C_u − I)Y·x (the
 * residual's sparse part). Four entries per pass: their four dots share each load of v, and the
 * update of `out` adds all four in one read-modify-write.
 */
export function addObservedTerms(
  fixed: Float32Array,
  indices: Int32Array,
  conf: Float32Array,
  p0: number,
  p1: number,
  vs: Float64Array,
  vOff: number,
  out: Float64Array,
  oOff: number,
  k: number,
  base: number,
  sign: number,
): void {
  let q = p0;
  for (; q + 3 < p1; q += 4) {
    const j0 = indices[q]! * k;
    const j1 = indices[q + 1]! * k;
    const j2 = indices[q + 2]! * k;
    const j3 = indices[q + 3]! * k;
    // two accumulators per dot (even and odd f) halve the add-latency chains
    let d0 = 0, d1 = 0, d2 = 0, d3 = 0;
    let e0 = 0, e1 = 0, e2 = 0, e3 = 0;
    let f = 0;
    for (; f + 1 < k; f += 2) {
      const x = vs[vOff + f]!;
      const y = vs[vOff + f + 1]!;
      d0 += fixed[j0 + f]! * x;
      d1 += fixed[j1 + f]! * x;
      d2 += fixed[j2 + f]! * x;
      d3 += fixed[j3 + f]! * x;
      e0 += fixed[j0 + f + 1]! * y;
      e1 += fixed[j1 + f + 1]! * y;
      e2 += fixed[j2 + f + 1]! * y;
      e3 += fixed[j3 + f + 1]! * y;
    }
    if (f < k) {
      const x = vs[vOff + f]!;
      d0 += fixed[j0 + f]! * x;
      d1 += fixed[j1 + f]! * x;
      d2 += fixed[j2 + f]! * x;
      d3 += fixed[j3 + f]! * x;
    }
    d0 += e0;
    d1 += e1;
    d2 += e2;
    d3 += e3;
    const c0 = conf[q]!;
    const c1 = conf[q + 1]!;
    const c2 = conf[q + 2]!;
    const c3 = conf[q + 3]!;
    const w0 = base * c0 + sign * (c0 - 1) * d0;
    const w1 = base * c1 + sign * (c1 - 1) * d1;
    const w2 = base * c2 + sign * (c2 - 1) * d2;
    const w3 = base * c3 + sign * (c3 - 1) * d3;
    for (f = 0; f < k; f++) {
      out[oOff + f] = out[oOff + f]! + (w0 * fixed[j0 + f]! + w1 * fixed[j1 + f]! + w2 * fixed[j2 + f]! + w3 * fixed[j3 + f]!);
    }
  }
  for (; q < p1; q++) {
    const j = indices[q]! * k;
    let d = 0;
    for (let f = 0; f < k; f++) d += fixed[j + f]! * vs[vOff + f]!;
    const c = conf[q]!;
    const w = base * c + sign * (c - 1) * d;
    for (let f = 0; f < k; f++) out[oOff + f] = out[oOff + f]! + w * fixed[j + f]!;
  }
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
 * `mirrorGram` fills the lower one), four rows per pass over `out` (one read-modify-write of out
 * serves four rank-1 updates). Rows are grouped from `start`, so a fixed range always adds the same
 * numbers in the same order: ials-fit.ts sums fixed blocks to keep threaded fits identical.
 */
export function addGramRows(factors: Float32Array, k: number, start: number, end: number, out: Float64Array): void {
  let u = start;
  for (; u + 3 < end; u += 4) {
    const b0 = u * k;
    const b1 = b0 + k;
    const b2 = b1 + k;
    const b3 = b2 + k;
    for (let f = 0; f < k; f++) {
      const a0 = factors[b0 + f]!;
      const a1 = factors[b1 + f]!;
      const a2 = factors[b2 + f]!;
      const a3 = factors[b3 + f]!;
      const row = f * k;
      for (let g = f; g < k; g++) {
        out[row + g] = out[row + g]! + (a0 * factors[b0 + g]! + a1 * factors[b1 + g]! + a2 * factors[b2 + g]! + a3 * factors[b3 + g]!);
      }
    }
  }
  for (; u < end; u++) {
    const base = u * k;
    for (let f = 0; f < k; f++) {
      const a = factors[base + f]!;
      const row = f * k;
      for (let g = f; g < k; g++) out[row + g] = out[row + g]! + a * factors[base + g]!;
    }
  }
}

/** Copies the upper triangle of a k × k matrix onto the lower one. */
export function mirrorGram(g: Float64Array, k: number): void {
  for (let f = 0; f < k; f++) for (let h = f + 1; h < k; h++) g[h * k + f] = g[f * k + h]!;
}
