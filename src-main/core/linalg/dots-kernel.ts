import { T, assemble, op } from './wasm-asm.ts';

/**
 * The one hot loop of the float32 SPD routines (spd-f32.ts), as a WebAssembly SIMD function:
 *   dots(out, ldo, a, lda, b, ldb, nI, nJ, kBytes, accumulate)
 *   out[i][j] (+)= Σ_k a[i][k] · b[j][k]   for i < nI, j < nJ, k < kBytes / 4,
 * where a, b are row-major float32 row segments (leading dimensions lda, ldb in bytes) and out is float64
 * (ldo bytes per row). Every operand is read along contiguous rows, so no packing is needed.
 * Register blocking (Golub & Van Loan, Matrix Computations, §1.5): MI rows of a × MJ rows of b per tile,
 * f32x4 vectors along k; MI + MJ loads feed MI·MJ vector multiply-adds. Each of the 4 lanes sums one
 * quarter of k in float32; the lanes are added in float64, and so are successive calls with accumulate = 1
 * (the caller splits long k ranges into chunks, which bounds the float32 sums to chunk/4 terms).
 * Requires nI % MI = 0, nJ % MJ = 0, kBytes % 16 = 0 (the caller pads).
 */
export interface DotsShape {
  mi: number;
  mj: number;
}

export const DOTS_SHAPE: DotsShape = { mi: 4, mj: 2 };

export type DotsFn = (out: number, ldo: number, a: number, lda: number, b: number, ldb: number, nI: number, nJ: number, kBytes: number, accumulate: number) => void;

export function dotsModuleBytes(memory: { minPages: number; maxPages: number; shared: boolean }, shape: DotsShape = DOTS_SHAPE): Uint8Array<ArrayBuffer> {
  const { mi, mj } = shape;
  const [OUT, LDO, A, LDA, B, LDB, NI, NJ, KB, ACC] = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
  const JB = 10;
  const IB = 11;
  const K = 12;
  const PA = 13; // mi locals
  const PB = PA + mi; // mj locals
  const ADDR = PB + mj;
  const V = ADDR + 1; // first v128 local
  const ACCV = (r: number, c: number) => V + r * mj + c;
  const VA = V + mi * mj; // mi locals
  const VB = VA + mi;
  const i32Locals = 3 + mi + mj + 1;
  const v128Locals = mi * mj + mi + 1;

  const b: number[] = [];
  const emit = (...xs: (readonly number[])[]) => {
    for (const x of xs) b.push(...x);
  };
  // for jb in 0..nJ step mj
  emit(op.i32(0), op.set(JB), op.block, op.loop, op.get(JB), op.get(NJ), op.i32GeU, op.brIf(1));
  //   for ib in 0..nI step mi
  emit(op.i32(0), op.set(IB), op.block, op.loop, op.get(IB), op.get(NI), op.i32GeU, op.brIf(1));
  for (let r = 0; r < mi; r++) emit(op.get(IB), op.i32(r), op.i32Add, op.get(LDA), op.i32Mul, op.get(A), op.i32Add, op.set(PA + r));
  for (let c = 0; c < mj; c++) emit(op.get(JB), op.i32(c), op.i32Add, op.get(LDB), op.i32Mul, op.get(B), op.i32Add, op.set(PB + c));
  for (let r = 0; r < mi; r++) for (let c = 0; c < mj; c++) emit(op.v128Zero, op.set(ACCV(r, c)));
  //     for k in 0..kBytes step 16
  emit(op.i32(0), op.set(K), op.block, op.loop, op.get(K), op.get(KB), op.i32GeU, op.brIf(1));
  for (let r = 0; r < mi; r++) emit(op.get(PA + r), op.get(K), op.i32Add, op.v128Load(), op.set(VA + r));
  for (let c = 0; c < mj; c++) {
    emit(op.get(PB + c), op.get(K), op.i32Add, op.v128Load(), op.set(VB));
    for (let r = 0; r < mi; r++) emit(op.get(ACCV(r, c)), op.get(VA + r), op.get(VB), op.f32x4Mul, op.f32x4Add, op.set(ACCV(r, c)));
  }
  emit(op.get(K), op.i32(16), op.i32Add, op.set(K), op.br(0), op.end, op.end);
  //     write the tile: lanes summed in float64
  for (let r = 0; r < mi; r++) {
    for (let c = 0; c < mj; c++) {
      emit(op.get(IB), op.i32(r), op.i32Add, op.get(LDO), op.i32Mul, op.get(OUT), op.i32Add);
      emit(op.get(JB), op.i32(c), op.i32Add, op.i32(8), op.i32Mul, op.i32Add, op.set(ADDR));
      emit(op.get(ADDR)); // store address
      emit(op.get(ACCV(r, c)), op.f64x2PromoteLow, op.get(ACCV(r, c)), op.get(ACCV(r, c)), op.shuffleHigh, op.f64x2PromoteLow, op.f64x2Add);
      emit(op.set(VB), op.get(VB), op.f64x2Lane(0), op.get(VB), op.f64x2Lane(1), op.f64Add);
      // + out[i][j] when accumulating, else + 0 (select reads both; out is always addressable)
      emit(op.get(ADDR), op.f64Load(), op.f64Zero, op.get(ACC), op.select, op.f64Add, op.f64Store());
    }
  }
  emit(op.get(IB), op.i32(mi), op.i32Add, op.set(IB), op.br(0), op.end, op.end);
  emit(op.get(JB), op.i32(mj), op.i32Add, op.set(JB), op.br(0), op.end, op.end);

  return assemble(
    [
      {
        name: 'dots',
        params: new Array<number>(10).fill(T.i32),
        locals: [...new Array<number>(i32Locals).fill(T.i32), ...new Array<number>(v128Locals).fill(T.v128)],
        body: b,
      },
    ],
    memory,
  );
}
