import { describe, expect, it } from 'vitest';
import type { Csr } from '../../src-main/core/matrix/csr.ts';
import { fitEase } from '../../src-main/core/models/ease.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { easeSolver, THREADED_MIN_ITEMS } from '../../src-main/services/train/ease-solver.ts';

/** A skewed random 0/1 customers × items matrix with ascending columns (seeded). */
function interactions(customers: number, items: number, seed: number): Csr {
  const rng = seededRng(seed);
  const indptr = new Int32Array(customers + 1);
  const cols: number[] = [];
  for (let u = 0; u < customers; u++) {
    const row = [...new Set(Array.from({ length: 2 + rng.int(12) }, () => Math.floor(items * rng.next() ** 2)))].sort((a, b) => a - b);
    cols.push(...row);
    indptr[u + 1] = cols.length;
  }
  return { rows: customers, cols: items, indptr, indices: Int32Array.from(cols), data: new Float32Array(cols.length).fill(1) };
}

describe('easeSolver (the inverse the EASE thread and the validated blend use)', () => {
  it('fits, on two threads, the weights one thread fits, bit for bit, above the threaded size', () => {
    const x = interactions(6000, THREADED_MIN_ITEMS + 48, 11);
    const one = fitEase(x, { lambda: 50 });
    const two = fitEase(x, { lambda: 50 }, {}, easeSolver(2));
    expect(two.model.kept).toEqual(one.model.kept);
    const bytes = (b: Float32Array) => Buffer.from(b.buffer, b.byteOffset, b.byteLength);
    expect(two.model.b.length).toBe(one.model.b.length);
    expect(bytes(two.model.b).equals(bytes(one.model.b))).toBe(true);
  });

  it('keeps one thread below that size or when one thread is asked for', () => {
    expect(easeSolver(1)).toEqual({});
    const x = interactions(300, 120, 12);
    expect(fitEase(x, {}, {}, easeSolver(2)).model.b).toEqual(fitEase(x).model.b);
  });
});
