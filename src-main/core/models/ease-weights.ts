import { transpose, type Csr } from '../matrix/csr.ts';
import { spdInverseF32, type SpdWorkspace } from '../linalg/spd-f32.ts';
import { ModelFitError } from '../errors.ts';

/**
 * EASE's weights B (Steck 2019, eq. 8) for the `kept` items, as a dense float32 m × m row-major array:
 *   G = XᵀX + λI,  P = G⁻¹,  B_ij = −P_ij / P_jj (i ≠ j),  B_jj = 0.
 * G is formed from the sparse structure (item by item over the customers who have it, summed in float64,
 * stored once in float32), inverted in place in float32 (linalg/spd-f32.ts), and B is written over P in
 * the same memory: one m × m float32 matrix in all (1.6 GB at 20,000 items). The returned array is a view
 * of that WebAssembly memory (which it keeps alive).
 */
export interface EaseSolveHooks {
  signal?: AbortSignal;
  onPhase?: (phase: number, phases: number) => void;
  /** Runs the inverse on a prepared workspace instead of the single-thread default (threads). */
  invert?: (m: number, writeLower: (ws: SpdWorkspace) => void) => SpdWorkspace;
}

export function easeWeights(x: Csr, kept: Int32Array, lambda: number, hooks: EaseSolveHooks = {}): Float32Array {
  const m = kept.length;
  const local = new Int32Array(x.cols).fill(-1);
  for (let r = 0; r < m; r++) local[kept[r]!] = r;
  const writeGram = (ws: SpdWorkspace) => writeGramLower(x, kept, local, lambda, ws);
  const ws = hooks.invert
    ? hooks.invert(m, writeGram)
    : spdInverseF32(m, writeGram, { ...(hooks.signal && { signal: hooks.signal }), ...(hooks.onPhase && { onPhase: hooks.onPhase }) });
  return weightsOverInverse(ws, m);
}

/** The lower triangle of XᵀX + λI over the kept items, row a from the customers who have item a. */
export function writeGramLower(x: Csr, kept: Int32Array, local: Int32Array, lambda: number, ws: SpdWorkspace): void {
  const xt = transpose(x);
  const m = kept.length;
  const row = new Float64Array(m);
  const f = ws.f32;
  for (let a = 0; a < m; a++) {
    const item = kept[a]!;
    for (let p = xt.indptr[item]!, pe = xt.indptr[item + 1]!; p < pe; p++) {
      const u = xt.indices[p]!;
      const va = xt.data[p]!;
      for (let q = x.indptr[u]!, qe = x.indptr[u + 1]!; q < qe; q++) {
        const c = local[x.indices[q]!]!;
        if (c >= 0 && c <= a) row[c]! += va * x.data[q]!;
      }
    }
    row[a]! += lambda;
    const base = ws.at(a, 0);
    for (let c = 0; c <= a; c++) {
      f[base + c] = row[c]!;
      row[c] = 0;
    }
  }
}

/** Overwrites P (all of the leading m × m block, row stride ws.N) with B, packed at row stride m. */
function weightsOverInverse(ws: SpdWorkspace, m: number): Float32Array {
  const f = ws.f32;
  const inv = new Float64Array(m);
  for (let c = 0; c < m; c++) inv[c] = -1 / f[ws.at(c, c)]!;
  const dst0 = ws.at(0, 0);
  // Row r moves from stride N to stride m; destinations never pass the entries still to be read.
  for (let r = 0; r < m; r++) {
    const src = ws.at(r, 0);
    const dst = dst0 + r * m;
    for (let c = 0; c < m; c++) {
      const v = c === r ? 0 : f[src + c]! * inv[c]!;
      if (!Number.isFinite(v)) throw new ModelFitError(`EASE weights are not finite at row ${r}, column ${c}`);
      f[dst + c] = v;
    }
  }
  return new Float32Array(ws.memory.buffer, ws.layout.matrix, m * m);
}
