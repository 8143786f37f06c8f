import { describe, expect, it } from 'vitest';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { csrFromDense } from '../../src-main/core/matrix/csr.ts';
import { checkTransform, transformMatrix, transformValue } from '../../src-main/core/matrix/values.ts';
import { dataset } from './sig-dataset.ts';

const entries = (m: { indptr: Int32Array; indices: Int32Array; data: Float32Array; rows: number }) => {
  const out: [number, number, number][] = [];
  for (let r = 0; r < m.rows; r++) for (let p = m.indptr[r]!; p < m.indptr[r + 1]!; p++) out.push([r, m.indices[p]!, m.data[p]!]);
  return out;
};

describe('value transforms (presence, log(1 + v), linear)', () => {
  // Repeated rows of one (customer, item) pair: customer 0 views item 1 three times (values 1, 2, 4) and buys it
  // once; customer 1 plays item 0 once with value 299,999.
  const ds = dataset(2, 2, [
    [0, 1, 'view', 1, 1],
    [0, 1, 'view', 2, 2],
    [0, 1, 'purchase', 1, 3],
    [0, 1, 'view', 4, 3],
    [1, 0, 'view', 299_999, 3],
  ]);
  const m = buildInteractionMatrix(ds); // kind weights view 1, purchase 5 (build.ts defaults), no decay

  it('combines repeated rows of a pair first (the weighted sum), then transforms that sum once', () => {
    // Sum for (0, 1): 1·1 + 1·2 + 5·1 + 1·4 = 12.
    expect(entries(m)).toEqual([
      [0, 1, 12],
      [1, 0, 299_999],
    ]);
    expect(entries(transformMatrix(m, 'presence'))).toEqual([
      [0, 1, 1],
      [1, 0, 1],
    ]);
    const log = entries(transformMatrix(m, 'log'));
    expect(log[0]![2]).toBeCloseTo(Math.log(13), 5); // log(1 + 12), not the sum of the rows' logs
    expect(log[1]![2]).toBeCloseTo(Math.log(300_000), 4);
    expect(transformMatrix(m, 'linear')).toBe(m);
  });

  it('combines after time decay: a row half a half-life old counts half before the transform', () => {
    const decayed = buildInteractionMatrix(ds, { halfLifeDays: 1 });
    // (0, 1): 1·2^-2 + 2·2^-1 + 5·1 + 4·1 = 10.25 at the latest day (3).
    expect(entries(decayed)[0]![2]).toBeCloseTo(10.25, 5);
    expect(entries(transformMatrix(decayed, 'log'))[0]![2]).toBeCloseTo(Math.log1p(10.25), 5);
    expect(entries(transformMatrix(decayed, 'presence'))[0]![2]).toBe(1);
  });

  it('keeps the pattern: same indptr and indices, only the values change', () => {
    const x = csrFromDense(2, 3, [0, 3, 0.5, 7, 0, 0]);
    const p = transformMatrix(x, 'presence');
    expect(p.indptr).toBe(x.indptr);
    expect(p.indices).toBe(x.indices);
    expect(Array.from(p.data)).toEqual([1, 1, 1]);
  });

  it('maps entries without evidence (<= 0, NaN) to 0', () => {
    for (const t of ['presence', 'log', 'linear'] as const) {
      expect(transformValue(t, 0)).toBe(0);
      expect(transformValue(t, -1)).toBe(0);
      expect(transformValue(t, Number.NaN)).toBe(0);
    }
  });

  it('refuses an unknown transform, naming the field', () => {
    expect(() => checkTransform('sqrt', 'itemknn.values')).toThrow(/itemknn.values must be presence, log or linear, got sqrt/);
  });
});
