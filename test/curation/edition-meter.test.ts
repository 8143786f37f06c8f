import { describe, expect, it } from 'vitest';
import { meterEdition } from '../../src-main/core/curation/edition-meter.ts';
import { context, item } from './helpers.ts';

describe('meterEdition', () => {
  const ctx = context([
    item(1, { supplier: 'Northwind Makers' }),
    item(2, { supplier: 'Pebble & Pine' }),
    item(3, { supplier: 'Northwind Makers' }),
    item(4, { supplier: 'Pebble & Pine' }),
    item(5, { supplier: 'Quillfield Co' }),
    item(6, { supplier: 'Harrow Loom' }),
  ]);
  const shelves = [Int32Array.of(0, 1, 2), Int32Array.of(2, 3, -1), Int32Array.of(4)];
  const d2 = 1 / Math.log2(3);

  it('counts distinct items and overlapping pairs', () => {
    const m = meterEdition(ctx, shelves);
    expect(m.distinctItems).toBe(5);
    expect(m.overlaps).toEqual([{ a: 0, b: 1, shared: 1 }]);
  });

  it('takes the Gini of discounted supplier exposure over the featured suppliers', () => {
    // Exposure (Järvelin & Kekäläinen 2002 discount): Northwind 1 + 1/2 (shelf 1, slots 1 and 3) + 1
    // (shelf 2, slot 1) = 2.5; Pebble 2 × 1/log2 3 = 1.2619; Quillfield 1. Gini by the definition
    // ΣΣ|x_i − x_j| / (2 n² x̄): pair gaps 1.2381, 1.5, 0.2619 → 2 · 3.0 / (2 · 9 · 1.58731) = 0.21000.
    const x = [2.5, 2 * d2, 1];
    const mean = (x[0]! + x[1]! + x[2]!) / 3;
    const pairs = Math.abs(x[0]! - x[1]!) + Math.abs(x[0]! - x[2]!) + Math.abs(x[1]! - x[2]!);
    expect(meterEdition(ctx, shelves).supplierExposureGini).toBeCloseTo((2 * pairs) / (2 * 9 * mean), 12);
    expect(meterEdition(ctx, shelves).supplierExposureGini).toBeCloseTo(0.21, 4);
  });

  it('can include suppliers with no exposure, and is NaN for an empty edition', () => {
    // Harrow Loom (zero exposure) joins: n = 4, the gaps to 0 add 2.5 + 1.2619 + 1 = 4.7619.
    const x = [2.5, 2 * d2, 1, 0];
    let s = 0;
    for (const a of x) for (const b of x) s += Math.abs(a - b);
    const mean = x.reduce((a, b) => a + b, 0) / 4;
    expect(meterEdition(ctx, shelves, { suppliers: 'catalogue' }).supplierExposureGini).toBeCloseTo(s / (2 * 16 * mean), 12);
    const empty = meterEdition(ctx, [Int32Array.of(-1)]);
    expect(empty.distinctItems).toBe(0);
    expect(empty.supplierExposureGini).toBeNaN();
  });
});
