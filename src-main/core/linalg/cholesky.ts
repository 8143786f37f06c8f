import { CancelledError, InputError } from '../errors.ts';
import { dot4x4 } from './kernel.ts';

/** Long inversions (minutes at 20,000 items) can be stopped between row blocks and report their phases. */
export interface InverseHooks {
  /** Checked once per block of four rows; aborting throws CancelledError. */
  signal?: AbortSignal;
  /** Called after each of the three phases (Cholesky, L⁻¹, product). */
  onPhase?: (phase: number, phases: number) => void;
}

function check(h: InverseHooks | undefined): void {
  if (h?.signal?.aborted) throw new CancelledError();
}

/**
 * Dense symmetric positive-definite algebra over flat row-major Float64Arrays (n × n), for EASE's
 * (XᵀX + λI)⁻¹. Every phase is arranged so its inner loop is a dot product of two contiguous row
 * segments, and is blocked 4 rows × 4 rows (kernel.ts): each loaded value serves four products, which is
 * what lets scalar JavaScript approach one multiply-add per cycle on a matrix far larger than the cache.
 * Cost ≈ n³/2 multiply-adds in all: Cholesky n³/6, L⁻¹ n³/6, L⁻ᵀL⁻¹ n³/6 (as LAPACK's potrf + potri).
 * EASE now fits with the float32 SIMD path (spd-f32.ts); this float64 path is its accuracy reference in tests.
 */

/**
 * Cholesky–Banachiewicz (Golub & Van Loan, Matrix Computations, §4.2), row by row:
 *   L_ij = (A_ij − Σ_{k<j} L_ik L_jk) / L_jj,   L_ii = sqrt(A_ii − Σ_{k<i} L_ik²).
 * Overwrites the lower triangle (diagonal included) of `a` with L; the upper triangle is left as it was.
 */
export function choleskyInPlace(a: Float64Array, n: number, hooks?: InverseHooks): void {
  if (a.length !== n * n) throw new RangeError(`matrix has ${a.length} entries, expected ${n * n}`);
  const acc = new Float64Array(16);
  let i0 = 0;
  for (; i0 + 4 <= n; i0 += 4) {
    check(hooks);
    for (let j0 = 0; j0 < i0; j0 += 4) {
      dot4x4(a, n, i0, j0, 0, j0, acc); // Σ_{k<j0}; the few k in [j0, j) follow in order below
      for (let c = 0; c < 4; c++) {
        const j = j0 + c;
        const rj = j * n;
        const d = a[rj + j]!;
        for (let r = 0; r < 4; r++) {
          const ri = (i0 + r) * n;
          let s = a[ri + j]! - acc[r * 4 + c]!;
          for (let k = j0; k < j; k++) s -= a[ri + k]! * a[rj + k]!;
          a[ri + j] = s / d;
        }
      }
    }
    for (let i = i0; i < i0 + 4; i++) choleskyRowFrom(a, n, i, i0);
  }
  for (; i0 < n; i0++) choleskyRowFrom(a, n, i0, 0);
}

/** Finishes row i of L for columns j0..i, columns before j0 being done. */
function choleskyRowFrom(a: Float64Array, n: number, i: number, j0: number): void {
  const ri = i * n;
  for (let j = j0; j <= i; j++) {
    const rj = j * n;
    let s = a[ri + j]!;
    for (let k = 0; k < j; k++) s -= a[ri + k]! * a[rj + k]!;
    if (j < i) {
      a[ri + j] = s / a[rj + j]!;
    } else {
      if (!(s > 0)) {
        throw new InputError(`matrix is not positive definite (pivot ${i} is ${s}); increase the regularization`);
      }
      a[ri + i] = Math.sqrt(s);
    }
  }
}

/**
 * Replaces L (lower triangle of `a`, from choleskyInPlace) with M = L⁻¹, using M·L = I read row by row:
 *   M_ij = (δ_ij − Σ_{k=j+1}^{i} M_ik L_kj) / L_jj,  j = i, i−1, …, 0.
 * L's columns are first copied into the upper triangle as rows of Lᵀ, so Σ_k M_ik L_kj is a dot product
 * of row i (its lower part) with row j (its upper part). Afterwards the upper triangle holds Lᵀ.
 */
export function lowerInverseInPlace(a: Float64Array, n: number, hooks?: InverseHooks): void {
  const diag = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    diag[j] = a[j * n + j]!;
    for (let k = j + 1; k < n; k++) a[j * n + k] = a[k * n + j]!;
  }
  const acc = new Float64Array(16);
  let i0 = 0;
  for (; i0 + 4 <= n; i0 += 4) {
    check(hooks);
    for (let i = i0; i < i0 + 4; i++) inverseRowDown(a, n, diag, i, i, i0);
    for (let j0 = i0 - 4; j0 >= 0; j0 -= 4) {
      dot4x4(a, n, i0, j0, j0 + 4, i0, acc); // k in [j0+4, i0): both rows final there
      for (let r = 0; r < 4; r++) {
        const i = i0 + r;
        const ri = i * n;
        for (let c = 3; c >= 0; c--) {
          const j = j0 + c;
          const rj = j * n;
          let s = -acc[r * 4 + c]!;
          for (let k = i0; k <= i; k++) s -= a[ri + k]! * a[rj + k]!;
          for (let k = j + 1; k < j0 + 4; k++) s -= a[ri + k]! * a[rj + k]!;
          a[ri + j] = s / diag[j]!;
        }
      }
    }
  }
  for (; i0 < n; i0++) inverseRowDown(a, n, diag, i0, i0, 0);
}

/** Row i of M for columns jHigh down to jLow, by the recurrence of lowerInverseInPlace without blocking. */
function inverseRowDown(a: Float64Array, n: number, diag: Float64Array, i: number, jHigh: number, jLow: number): void {
  const ri = i * n;
  for (let j = jHigh; j >= jLow; j--) {
    const rj = j * n;
    let s = i === j ? 1 : 0;
    for (let k = j + 1; k <= i; k++) s -= a[ri + k]! * a[rj + k]!;
    a[ri + j] = s / diag[j]!;
  }
}

/**
 * The inverse of an SPD matrix, in place: A⁻¹ = L⁻ᵀ L⁻¹. With U = L⁻ᵀ = Mᵀ in the upper triangle,
 *   (A⁻¹)_ij = Σ_{k ≥ max(i,j)} U_ik U_jk,
 * a dot product of two contiguous row suffixes. Entries (i, j < i) go to the free lower triangle; U_ii is
 * still needed by row i's own products, so each diagonal entry is written last in its row.
 * Throws InputError when A is not positive definite.
 */
export function spdInverseInPlace(a: Float64Array, n: number, hooks?: InverseHooks): void {
  choleskyInPlace(a, n, hooks);
  hooks?.onPhase?.(1, 3);
  lowerInverseInPlace(a, n, hooks);
  hooks?.onPhase?.(2, 3);
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) a[i * n + j] = a[j * n + i]!;
  const acc = new Float64Array(16);
  let i0 = 0;
  for (; i0 + 4 <= n; i0 += 4) {
    check(hooks);
    for (let j0 = 0; j0 < i0; j0 += 4) {
      dot4x4(a, n, i0, j0, i0 + 4, n, acc); // k >= i0+4; row i's head k in [i, i0+4) below
      for (let r = 0; r < 4; r++) {
        const ri = (i0 + r) * n;
        for (let c = 0; c < 4; c++) {
          const rj = (j0 + c) * n;
          let s = acc[r * 4 + c]!;
          for (let k = i0 + r; k < i0 + 4; k++) s += a[ri + k]! * a[rj + k]!;
          a[ri + j0 + c] = s;
        }
      }
    }
    for (let i = i0; i < i0 + 4; i++) productRow(a, n, i, i0);
  }
  for (; i0 < n; i0++) productRow(a, n, i0, 0);
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) a[i * n + j] = a[j * n + i]!;
  hooks?.onPhase?.(3, 3);
}

/** (A⁻¹)_ij for j = jLow..i of row i, unblocked; the diagonal last. */
function productRow(a: Float64Array, n: number, i: number, jLow: number): void {
  const ri = i * n;
  for (let j = jLow; j <= i; j++) {
    const rj = j * n;
    let s = 0;
    for (let k = i; k < n; k++) s += a[ri + k]! * a[rj + k]!;
    a[ri + j] = s;
  }
}
