import { CancelledError, InputError } from '../errors.ts';
import { dotsModuleBytes, type DotsFn } from './dots-kernel.ts';

/** A Cholesky pivot that is not positive: the matrix is not positive definite (λ too small for the data). */
export class NotPositiveDefiniteError extends InputError {
  constructor(
    readonly pivot: number,
    detail: string,
  ) {
    super(`matrix is not positive definite (pivot ${pivot} ${detail}); increase the regularization`);
  }
}

/**
 * The inverse of a large SPD matrix in float32, in place, as LAPACK's potrf + potri do it (Cholesky
 * A = L Lᵀ, then A⁻¹ = L⁻ᵀ L⁻¹), for EASE's (XᵀX + λI)⁻¹ on up to ~20,000 items: one n × n float32
 * matrix (1.6 GB at 20,000) and nothing else of that size. The matrix lives in WebAssembly memory so
 * that the SIMD kernel (dots-kernel.ts) works on it directly, and so that threads can share it.
 *
 * Blocked by B × B tiles (Golub & Van Loan, Matrix Computations, §4.2.9 block Cholesky; §3.1 block
 * triangular inverse). Every large product is a block of dot products of contiguous row segments:
 * 1. Cholesky, row block I after row block I−1: L_IJ = (A_IJ − Σ_{K<J} L_IK L_JKᵀ) W_Jᵀ for J < I, where
 *    W_J = L_JJ⁻¹ (B × B, computed in float64 when the diagonal tile is factored).
 * 2. U = L⁻ᵀ into the free upper triangle, column block J of L⁻¹ at a time (independent across J):
 *    (L⁻¹)_IJ = −W_I Σ_{K=J}^{I−1} L_IK (L⁻¹)_KJ, with (L⁻¹)_KJ read as row segments of U.
 * 3. P = U Uᵀ into the lower triangle (independent across tiles): P_IJ = Σ_{K≥I} U_IK U_JKᵀ.
 * The diagonal tiles of U live in a side buffer (they would collide with L's diagonal). Cost ≈ n³/2
 * multiply-adds, as potrf + potri. The size is padded to a multiple of B with an identity block, which
 * leaves the leading n × n inverse unchanged and spares the kernel any edge case.
 *
 * Accuracy: storage is float32 (the input is rounded once, relative 6e-8); each kernel call sums at most
 * K_CHUNK / 4 products per float32 lane and adds lanes and chunks in float64; tiles are factored in float64.
 */
export const TILE = 64;
/** Length of the k ranges summed in one kernel call (float32 partial sums of at most 256 terms). */
const K_CHUNK = 1024;
const PAGE = 65536;

/** Which tiles this thread works on; the single-thread schedule takes all in order. */
export interface TileSchedule {
  /** Next block index to process in `phase` (1, 2, 3), or -1 when the phase has none left. */
  next(phase: number): number;
  /** Phase 1: returns once row block j is final (another thread may be writing it). */
  waitRow(j: number): void;
  /** Phase 1: row block i is final. */
  rowDone(i: number): void;
  /** Returns once every thread has finished `phase` (the next phase reads what all of them wrote). */
  barrier(phase: number): void;
  /**
   * This thread failed: the others stop at their next wait instead of waiting forever. A failing pivot is
   * passed on, so whichever thread stops reports the real cause, not only that another thread failed.
   */
  fail(pivot?: number): void;
}

export function sequentialSchedule(blocks: number): TileSchedule {
  const cursor = [0, 0, 0, 0];
  return {
    next: (phase) => (cursor[phase]! < blocks ? cursor[phase]!++ : -1),
    waitRow: () => undefined,
    rowDone: () => undefined,
    barrier: () => undefined,
    fail: () => undefined,
  };
}

/** Int32 slots the shared schedule needs for `blocks` row blocks and `threads` threads. */
export function scheduleSlots(blocks: number, threads: number): number {
  return ROW + blocks + threads;
}

const FAILED = 0;
const CURSOR = 1; // + phase − 1 (0..2)
const BARRIER = 4; // + phase − 1 (0..2)
const STARTED = 7; // helper threads running
const ROW = 8; // + row block; then one count of claimed blocks per thread

/**
 * The schedule of `threads` threads sharing one workspace, over an Int32Array on a SharedArrayBuffer
 * (scheduleSlots(blocks), zeroed): blocks are claimed with Atomics.add, row blocks flagged final for
 * phase 1's waits, phases separated by a counting barrier. Waits wake every 100 ms to see whether a
 * thread failed, so an error anywhere ends every thread instead of leaving one blocked.
 */
export function sharedSchedule(slots: Int32Array, blocks: number, threads: number, thread: number): TileSchedule {
  // FAILED: 0 running, 1 another thread failed, 2 + p the pivot p was not positive (the first failure wins).
  const stopIfFailed = () => {
    const f = Atomics.load(slots, FAILED);
    if (f >= 2) throw new NotPositiveDefiniteError(f - 2, 'is not positive, found by another thread');
    if (f !== 0) throw new CancelledError('another thread of the inverse failed');
  };
  const waitUntil = (index: number, value: number) => {
    for (let v = Atomics.load(slots, index); v < value; v = Atomics.load(slots, index)) {
      stopIfFailed();
      Atomics.wait(slots, index, v, 100);
    }
  };
  return {
    next: (phase) => {
      stopIfFailed();
      const b = Atomics.add(slots, CURSOR + phase - 1, 1);
      if (b >= blocks) return -1;
      Atomics.add(slots, ROW + blocks + thread, 1);
      return b;
    },
    waitRow: (j) => waitUntil(ROW + j, 1),
    rowDone: (i) => {
      Atomics.store(slots, ROW + i, 1);
      Atomics.notify(slots, ROW + i);
    },
    barrier: (phase) => {
      Atomics.add(slots, BARRIER + phase - 1, 1);
      Atomics.notify(slots, BARRIER + phase - 1);
      waitUntil(BARRIER + phase - 1, threads);
    },
    fail: (pivot) => {
      Atomics.compareExchange(slots, FAILED, 0, pivot === undefined ? 1 : pivot + 2);
      for (let k = 0; k < slots.length; k++) Atomics.notify(slots, k);
    },
  };
}

/** A helper thread says it runs (the starting thread waits for all, so the barriers count right). */
export function helperStarted(slots: Int32Array): void {
  Atomics.add(slots, STARTED, 1);
  Atomics.notify(slots, STARTED);
}

/**
 * Waits until `helpers` helper threads run, or up to `limitMs` (a thread that cannot even start must not
 * leave the others waiting at a barrier); false when they did not all start in time.
 */
export function awaitHelpers(slots: Int32Array, helpers: number, limitMs: number): boolean {
  const end = Date.now() + limitMs;
  for (let v = Atomics.load(slots, STARTED); v < helpers; v = Atomics.load(slots, STARTED)) {
    const left = end - Date.now();
    if (left <= 0) return false;
    Atomics.wait(slots, STARTED, v, left);
  }
  return true;
}

/** Blocks claimed by each thread so far (to see that every thread took part). */
export function claimsPerThread(slots: Int32Array, blocks: number, threads: number): number[] {
  return Array.from({ length: threads }, (_, t) => Atomics.load(slots, ROW + blocks + t));
}

/** This thread's share of the three phases (every thread of a shared workspace runs this). */
export function runInverse(
  ws: SpdWorkspace,
  schedule: TileSchedule,
  hooks: { signal?: AbortSignal; onPhase?: (phase: number, phases: number) => void } = {},
): void {
  try {
    ws.cholesky(schedule, hooks.signal);
    schedule.barrier(1);
    hooks.onPhase?.(1, 3);
    ws.upperInverse(schedule, hooks.signal);
    schedule.barrier(2);
    hooks.onPhase?.(2, 3);
    ws.product(schedule, hooks.signal);
    schedule.barrier(3);
  } catch (e) {
    schedule.fail(e instanceof NotPositiveDefiniteError ? e.pivot : undefined);
    throw e;
  }
}

export interface SpdLayout {
  n: number;
  /** n padded to a multiple of TILE. */
  size: number;
  threads: number;
  /** Byte offsets in the memory. */
  scratch: number;
  w: number;
  ut: number;
  matrix: number;
  bytes: number;
}

export function spdLayout(n: number, threads = 1): SpdLayout {
  if (!(Number.isInteger(n) && n > 0)) throw new InputError(`matrix size must be a positive integer, got ${n}`);
  const size = Math.ceil(n / TILE) * TILE;
  const scratch = 0;
  const scratchBytes = threads * scratchPerThread();
  const w = scratch + scratchBytes;
  const ut = w + size * TILE * 4;
  const matrix = ut + size * TILE * 4;
  const bytes = matrix + size * size * 4;
  return { n, size, threads, scratch, w, ut, matrix, bytes };
}

/** Per thread: the float64 product tile, then two float32 tiles. */
function scratchPerThread(): number {
  return TILE * TILE * 16;
}

/** Largest memory a 32-bit WebAssembly instance can address (65,536 pages of 64 KiB). */
export const MAX_WASM_BYTES = 65536 * PAGE;

/** A WebAssembly memory sized for `layout` (shared when threads will use it). */
export function spdMemory(layout: SpdLayout, shared: boolean): WebAssembly.Memory {
  if (layout.bytes > MAX_WASM_BYTES) {
    throw new InputError(`a ${layout.n} × ${layout.n} float32 matrix needs ${layout.bytes} bytes, above WebAssembly's 4 GiB`);
  }
  const pages = Math.ceil(layout.bytes / PAGE);
  return new WebAssembly.Memory(shared ? { initial: pages, maximum: pages, shared: true } : { initial: pages, maximum: pages });
}

const modules = new Map<boolean, WebAssembly.Module>();
function dotsModule(shared: boolean): WebAssembly.Module {
  let m = modules.get(shared);
  if (!m) {
    m = new WebAssembly.Module(dotsModuleBytes({ minPages: 1, maxPages: 65536, shared }));
    modules.set(shared, m);
  }
  return m;
}

/**
 * One thread's view of the workspace: the kernel instance on the memory and typed views. The memory is
 * never grown after creation, so the views stay valid.
 */
export class SpdWorkspace {
  readonly f32: Float32Array;
  readonly f64: Float64Array;
  readonly #dots: DotsFn;
  readonly #out: number;
  readonly #s: number;
  readonly #t: number;
  /** Size, padded. */
  readonly N: number;

  constructor(
    readonly layout: SpdLayout,
    readonly memory: WebAssembly.Memory,
    thread = 0,
  ) {
    const shared = typeof SharedArrayBuffer !== 'undefined' && memory.buffer instanceof SharedArrayBuffer;
    const instance = new WebAssembly.Instance(dotsModule(shared), { env: { memory } });
    this.#dots = instance.exports['dots'] as DotsFn;
    this.f32 = new Float32Array(memory.buffer);
    this.f64 = new Float64Array(memory.buffer);
    this.N = layout.size;
    const base = layout.scratch + thread * scratchPerThread();
    this.#out = base;
    this.#s = base + TILE * TILE * 8;
    this.#t = this.#s + TILE * TILE * 4;
  }

  /** Index in f32 of matrix entry (i, j). */
  at(i: number, j: number): number {
    return this.layout.matrix / 4 + i * this.N + j;
  }

  /**
   * Puts ones on the padding's diagonal (call once, on a fresh memory, before writing A). A new
   * WebAssembly memory is zero-filled (core spec, memory allocation: every byte starts at 0), so the padding's other entries already are 0.
   */
  reset(): void {
    const { n } = this.layout;
    for (let i = n; i < this.N; i++) this.f32[this.at(i, i)] = 1;
  }

  #ptr(i: number, j: number): number {
    return this.layout.matrix + (i * this.N + j) * 4;
  }

  /** out (TILE × TILE float64) (+)= a-rows · b-rowsᵀ over kLen columns, in chunks of K_CHUNK. */
  #dotsInto(a: number, lda: number, b: number, ldb: number, kLen: number, accumulate: boolean): void {
    for (let k = 0; k < kLen; k += K_CHUNK) {
      const len = Math.min(K_CHUNK, kLen - k);
      this.#dots(this.#out, TILE * 8, a + k * 4, lda, b + k * 4, ldb, TILE, TILE, len * 4, accumulate || k > 0 ? 1 : 0);
    }
  }

  /** Phase 1: the Cholesky factor L in the lower triangle; W_J = L_JJ⁻¹ and its transpose on the side. */
  cholesky(schedule: TileSchedule, signal?: AbortSignal): void {
    const { N } = this;
    const ldm = N * 4;
    const f32 = this.f32;
    const out = this.#out / 8;
    const s = this.#s / 4;
    for (let I = schedule.next(1); I >= 0; I = schedule.next(1)) {
      if (signal?.aborted) throw new CancelledError();
      const i0 = I * TILE;
      for (let J = 0; J < I; J++) {
        schedule.waitRow(J);
        const j0 = J * TILE;
        if (j0 > 0) this.#dotsInto(this.#ptr(i0, 0), ldm, this.#ptr(j0, 0), ldm, j0, false);
        for (let r = 0; r < TILE; r++) {
          const row = this.at(i0 + r, j0);
          for (let c = 0; c < TILE; c++) f32[s + r * TILE + c] = f32[row + c]! - (j0 > 0 ? this.f64[out + r * TILE + c]! : 0);
        }
        // L_IJ = S W_Jᵀ: dot products of S's rows with W_J's rows.
        this.#dots(this.#out, TILE * 8, this.#s, TILE * 4, this.layout.w + J * TILE * TILE * 4, TILE * 4, TILE, TILE, TILE * 4, 0);
        for (let r = 0; r < TILE; r++) {
          const row = this.at(i0 + r, j0);
          for (let c = 0; c < TILE; c++) f32[row + c] = this.f64[out + r * TILE + c]!;
        }
      }
      if (i0 > 0) this.#dotsInto(this.#ptr(i0, 0), ldm, this.#ptr(i0, 0), ldm, i0, false);
      this.#factorDiagonal(I, i0 > 0);
      schedule.rowDone(I);
    }
  }

  /** Factors the diagonal tile A_II − (product in out) in float64; writes L_II, W_I and W_Iᵀ. */
  #factorDiagonal(I: number, subtract: boolean): void {
    const i0 = I * TILE;
    const out = this.#out / 8;
    const l = new Float64Array(TILE * TILE);
    for (let r = 0; r < TILE; r++) {
      for (let c = 0; c <= r; c++) l[r * TILE + c] = this.f32[this.at(i0 + r, i0 + c)]! - (subtract ? this.f64[out + r * TILE + c]! : 0);
    }
    // Cholesky–Banachiewicz on the tile (Golub & Van Loan §4.2).
    for (let r = 0; r < TILE; r++) {
      for (let c = 0; c <= r; c++) {
        let v = l[r * TILE + c]!;
        for (let k = 0; k < c; k++) v -= l[r * TILE + k]! * l[c * TILE + k]!;
        if (c < r) l[r * TILE + c] = v / l[c * TILE + c]!;
        else {
          if (!(v > 0)) {
            throw new NotPositiveDefiniteError(i0 + r, `is ${v}`);
          }
          l[r * TILE + r] = Math.sqrt(v);
        }
      }
    }
    // W = L⁻¹ by forward substitution, column by column.
    const w = new Float64Array(TILE * TILE);
    for (let c = 0; c < TILE; c++) {
      for (let r = c; r < TILE; r++) {
        let v = r === c ? 1 : 0;
        for (let k = c; k < r; k++) v -= l[r * TILE + k]! * w[k * TILE + c]!;
        w[r * TILE + c] = v / l[r * TILE + r]!;
      }
    }
    const wOff = this.layout.w / 4 + I * TILE * TILE;
    const utOff = this.layout.ut / 4 + I * TILE * TILE;
    for (let r = 0; r < TILE; r++) {
      for (let c = 0; c < TILE; c++) {
        if (c <= r) this.f32[this.at(i0 + r, i0 + c)] = l[r * TILE + c]!;
        this.f32[wOff + r * TILE + c] = w[r * TILE + c]!;
        this.f32[utOff + c * TILE + r] = w[r * TILE + c]!;
      }
    }
  }

  /** Phase 2: U = L⁻ᵀ, off-diagonal tiles into the upper triangle (row block J per claimed J). */
  upperInverse(schedule: TileSchedule, signal?: AbortSignal): void {
    const { N } = this;
    const nb = N / TILE;
    const ldm = N * 4;
    const out = this.#out / 8;
    const t = this.#t / 4;
    for (let J = schedule.next(2); J >= 0; J = schedule.next(2)) {
      if (signal?.aborted) throw new CancelledError();
      const j0 = J * TILE;
      const j1 = j0 + TILE;
      for (let I = J + 1; I < nb; I++) {
        const i0 = I * TILE;
        // T = L_IJ W_JJ + Σ_{J<K<I} L_IK (L⁻¹)_KJ, i.e. rows of L against rows of U.
        this.#dots(this.#out, TILE * 8, this.#ptr(i0, j0), ldm, this.layout.ut + J * TILE * TILE * 4, TILE * 4, TILE, TILE, TILE * 4, 0);
        if (i0 > j1) this.#dotsInto(this.#ptr(i0, j1), ldm, this.#ptr(j0, j1), ldm, i0 - j1, true);
        for (let r = 0; r < TILE; r++) for (let c = 0; c < TILE; c++) this.f32[t + c * TILE + r] = this.f64[out + r * TILE + c]!;
        // U_JI = −Tᵀ W_Iᵀ.
        this.#dots(this.#out, TILE * 8, this.#t, TILE * 4, this.layout.w + I * TILE * TILE * 4, TILE * 4, TILE, TILE, TILE * 4, 0);
        for (let r = 0; r < TILE; r++) {
          const row = this.at(j0 + r, i0);
          for (let c = 0; c < TILE; c++) this.f32[row + c] = -this.f64[out + r * TILE + c]!;
        }
      }
    }
  }

  /** Phase 3: P = U Uᵀ into the lower triangle, diagonal tiles whole (row block I per claimed I). */
  product(schedule: TileSchedule, signal?: AbortSignal): void {
    const { N } = this;
    const ldm = N * 4;
    const out = this.#out / 8;
    for (let I = schedule.next(3); I >= 0; I = schedule.next(3)) {
      if (signal?.aborted) throw new CancelledError();
      const i0 = I * TILE;
      const i1 = i0 + TILE;
      const ut = this.layout.ut + I * TILE * TILE * 4;
      for (let J = 0; J <= I; J++) {
        const j0 = J * TILE;
        if (J < I) this.#dots(this.#out, TILE * 8, ut, TILE * 4, this.#ptr(j0, i0), ldm, TILE, TILE, TILE * 4, 0);
        else this.#dots(this.#out, TILE * 8, ut, TILE * 4, ut, TILE * 4, TILE, TILE, TILE * 4, 0);
        if (i1 < N) this.#dotsInto(this.#ptr(i0, i1), ldm, this.#ptr(j0, i1), ldm, N - i1, true);
        for (let r = 0; r < TILE; r++) {
          const row = this.at(i0 + r, j0);
          for (let c = 0; c < TILE; c++) this.f32[row + c] = this.f64[out + r * TILE + c]!;
        }
      }
    }
  }

  /** After phase 3: copies the lower triangle to the upper, so the leading n × n block is all of P. */
  mirrorLower(): void {
    const { n } = this.layout;
    const f = this.f32;
    for (let i0 = 0; i0 < n; i0 += TILE) {
      for (let j0 = i0; j0 < n; j0 += TILE) {
        for (let i = i0; i < Math.min(i0 + TILE, n); i++) {
          const row = this.at(i, 0);
          for (let j = Math.max(j0, i + 1); j < Math.min(j0 + TILE, n); j++) f[row + j] = f[this.at(j, i)]!;
        }
      }
    }
  }
}

/** (A)⁻¹ of an SPD matrix given as its lower triangle, one thread; returns the workspace holding P. */
export function spdInverseF32(
  n: number,
  writeLower: (ws: SpdWorkspace) => void,
  hooks: { signal?: AbortSignal; onPhase?: (phase: number, phases: number) => void } = {},
): SpdWorkspace {
  const layout = spdLayout(n, 1);
  const ws = new SpdWorkspace(layout, spdMemory(layout, false));
  ws.reset();
  writeLower(ws);
  runInverse(ws, sequentialSchedule(layout.size / TILE), hooks);
  ws.mirrorLower();
  hooks.onPhase?.(3, 3);
  return ws;
}
