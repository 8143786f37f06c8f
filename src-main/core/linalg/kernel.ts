/**
 * The one hot loop of the dense SPD routines: the 16 dot products of rows i0..i0+3 with rows j0..j0+3 of
 * a row-major n × n matrix over columns [k0, k1), written to out[r * 4 + c]. Register blocking (Golub &
 * Van Loan, §1.5): 8 loads feed 16 multiply-adds, so the loop is bound by arithmetic, not memory.
 */
export function dot4x4(a: Float64Array, n: number, i0: number, j0: number, k0: number, k1: number, out: Float64Array): void {
  const a0 = i0 * n;
  const a1 = a0 + n;
  const a2 = a1 + n;
  const a3 = a2 + n;
  const b0 = j0 * n;
  const b1 = b0 + n;
  const b2 = b1 + n;
  const b3 = b2 + n;
  let s00 = 0, s01 = 0, s02 = 0, s03 = 0;
  let s10 = 0, s11 = 0, s12 = 0, s13 = 0;
  let s20 = 0, s21 = 0, s22 = 0, s23 = 0;
  let s30 = 0, s31 = 0, s32 = 0, s33 = 0;
  for (let k = k0; k < k1; k++) {
    const x0 = a[a0 + k]!;
    const x1 = a[a1 + k]!;
    const x2 = a[a2 + k]!;
    const x3 = a[a3 + k]!;
    const y0 = a[b0 + k]!;
    const y1 = a[b1 + k]!;
    const y2 = a[b2 + k]!;
    const y3 = a[b3 + k]!;
    s00 += x0 * y0; s01 += x0 * y1; s02 += x0 * y2; s03 += x0 * y3;
    s10 += x1 * y0; s11 += x1 * y1; s12 += x1 * y2; s13 += x1 * y3;
    s20 += x2 * y0; s21 += x2 * y1; s22 += x2 * y2; s23 += x2 * y3;
    s30 += x3 * y0; s31 += x3 * y1; s32 += x3 * y2; s33 += x3 * y3;
  }
  out[0] = s00; out[1] = s01; out[2] = s02; out[3] = s03;
  out[4] = s10; out[5] = s11; out[6] = s12; out[7] = s13;
  out[8] = s20; out[9] = s21; out[10] = s22; out[11] = s23;
  out[12] = s30; out[13] = s31; out[14] = s32; out[15] = s33;
}
