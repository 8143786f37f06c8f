import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { spdInverseInPlace } from '../../src-main/core/linalg/cholesky.ts';
import { dotsModuleBytes, type DotsFn } from '../../src-main/core/linalg/dots-kernel.ts';
import { TILE, sequentialSchedule, spdInverseF32, spdLayout, spdMemory, SpdWorkspace } from '../../src-main/core/linalg/spd-f32.ts';
import { sleb, uleb } from '../../src-main/core/linalg/wasm-asm.ts';
import { seededRng } from '../../src-main/core/rng.ts';

/** A random SPD matrix R Rᵀ + n·I (seeded), as an ml-matrix Matrix. */
function randomSpd(n: number, seed: number): Matrix {
  const rng = seededRng(seed);
  const r = new Matrix(Array.from({ length: n }, () => Array.from({ length: n }, () => rng.normal())));
  return r.mmul(r.transpose()).add(Matrix.eye(n).mul(n));
}

const writeLower = (a: Matrix) => (ws: SpdWorkspace) => {
  for (let i = 0; i < a.rows; i++) for (let j = 0; j <= i; j++) ws.f32[ws.at(i, j)] = a.get(i, j);
};

/** max |x − ref| / max |ref| over the leading n × n block. */
function relErr(ws: SpdWorkspace, ref: Matrix, lowerOnly = false): number {
  let err = 0;
  let scale = 0;
  for (let i = 0; i < ref.rows; i++) {
    for (let j = 0; j < (lowerOnly ? i + 1 : ref.columns); j++) {
      err = Math.max(err, Math.abs(ws.f32[ws.at(i, j)]! - ref.get(i, j)));
      scale = Math.max(scale, Math.abs(ref.get(i, j)));
    }
  }
  return err / scale;
}

describe('wasm-asm LEB128', () => {
  it('encodes the worked examples of the DWARF 5 specification, §7.6 (figures 7.22 and 7.23)', () => {
    expect(uleb(2)).toEqual([2]);
    expect(uleb(127)).toEqual([127]);
    expect(uleb(128)).toEqual([0x80, 1]);
    expect(uleb(12857)).toEqual([0x80 + 57, 100]);
    expect(sleb(-2)).toEqual([0x7e]);
    expect(sleb(-127)).toEqual([0x80 + 1, 0x7f]);
    expect(sleb(-128)).toEqual([0x80, 0x7f]);
    expect(sleb(128)).toEqual([0x80, 1]);
  });
});

describe('dots kernel (WebAssembly SIMD)', () => {
  it('matches ml-matrix A·Bᵀ (reference library) and accumulates when asked', () => {
    const memory = new WebAssembly.Memory({ initial: 4, maximum: 4 });
    const dots = new WebAssembly.Instance(new WebAssembly.Module(dotsModuleBytes({ minPages: 1, maxPages: 65536, shared: false })), { env: { memory } })
      .exports['dots'] as DotsFn;
    const [nI, nJ, k, lda] = [8, 6, 40, 44]; // lda > k: row segments inside wider rows
    const rng = seededRng(7);
    const f = new Float32Array(memory.buffer);
    const aOff = 0;
    const bOff = nI * lda;
    for (let p = 0; p < (nI + nJ) * lda; p++) f[p] = rng.normal();
    const a = new Matrix(Array.from({ length: nI }, (_, i) => Array.from(f.subarray(aOff + i * lda, aOff + i * lda + k))));
    const b = new Matrix(Array.from({ length: nJ }, (_, j) => Array.from(f.subarray(bOff + j * lda, bOff + j * lda + k))));
    const ref = a.mmul(b.transpose());
    const out = 65536; // bytes
    const o = new Float64Array(memory.buffer, out, nI * nJ);
    o.fill(1);
    dots(out, nJ * 8, aOff * 4, lda * 4, bOff * 4, lda * 4, nI, nJ, k * 4, 0);
    for (let i = 0; i < nI; i++) for (let j = 0; j < nJ; j++) expect(o[i * nJ + j]).toBeCloseTo(ref.get(i, j), 4);
    dots(out, nJ * 8, aOff * 4, lda * 4, bOff * 4, lda * 4, nI, nJ, k * 4, 1);
    for (let i = 0; i < nI; i++) for (let j = 0; j < nJ; j++) expect(o[i * nJ + j]).toBeCloseTo(2 * ref.get(i, j), 4);
  });
});

// Sizes around the tile: one tile padded, exactly one, one plus a remainder, several.
const SIZES = [1, 5, TILE - 1, TILE, TILE + 1, 2 * TILE + 3, 200];

describe('float32 SPD workspace', () => {
  it.each(SIZES)('Cholesky factor matches ml-matrix CholeskyDecomposition (reference library), n = %i', (n) => {
    const a = randomSpd(n, n);
    const layout = spdLayout(n);
    const ws = new SpdWorkspace(layout, spdMemory(layout, false));
    ws.reset();
    writeLower(a)(ws);
    ws.cholesky(sequentialSchedule(layout.size / TILE));
    // Float32 storage: 1e-5 of the largest entry (float32 epsilon 6e-8 times growth with n; common practice, no source).
    expect(relErr(ws, new CholeskyDecomposition(a).lowerTriangularMatrix, true)).toBeLessThan(1e-5);
  });

  it.each(SIZES)('inverse matches ml-matrix inverse (reference library) to 1e-4 relative, n = %i', (n) => {
    const a = randomSpd(n, 100 + n);
    const ws = spdInverseF32(n, writeLower(a));
    expect(relErr(ws, inverse(a))).toBeLessThan(1e-4);
  });

  it('agrees with the float64 path (cholesky.ts) on a medium EASE-like Gram matrix', () => {
    // XᵀX + λI for a sparse 0/1 X: the structure EASE inverts, more ill-conditioned than R Rᵀ + n I.
    const n = 300;
    const users = 2000;
    const rng = seededRng(11);
    const g = new Float64Array(n * n);
    for (let u = 0; u < users; u++) {
      const items = Array.from({ length: 1 + rng.int(12) }, () => Math.floor(n * rng.next() ** 2)); // skewed popularity
      const set = [...new Set(items)];
      for (const i of set) for (const j of set) g[i * n + j]! += 1;
    }
    for (let i = 0; i < n; i++) g[i * n + i]! += 10;
    const ws = spdInverseF32(n, (w) => {
      for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) w.f32[w.at(i, j)] = g[i * n + j]!;
    });
    spdInverseInPlace(g, n);
    let err = 0;
    let scale = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        err = Math.max(err, Math.abs(ws.f32[ws.at(i, j)]! - g[i * n + j]!));
        scale = Math.max(scale, Math.abs(g[i * n + j]!));
      }
    }
    expect(err / scale).toBeLessThan(1e-4);
  });

  it('rejects a matrix that is not positive definite, saying what to do', () => {
    const a = new Matrix([
      [1, 2],
      [2, 1],
    ]);
    expect(() => spdInverseF32(2, writeLower(a))).toThrow(/not positive definite.*regularization/);
  });

  it('refuses a size above what 32-bit WebAssembly memory can hold, before allocating', () => {
    expect(() => spdMemory(spdLayout(40_000), false)).toThrow(/above WebAssembly's 4 GiB/);
  });
});
