import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { customerItemSets, signalsByCustomer } from '../../src-main/core/matrix/by-customer.ts';
import type { SignalColumns } from '../../src-main/core/types.ts';

const columns = (pairs: [number, number][]): SignalColumns => ({
  length: pairs.length,
  customer: Int32Array.from(pairs, (p) => p[0]),
  item: Int32Array.from(pairs, (p) => p[1]),
  kind: new Uint8Array(pairs.length),
  value: new Float32Array(pairs.length).fill(1),
  at: new Float64Array(pairs.length).fill(Number.NaN),
});

/** The reference is the plain reading of the definitions: filter the signals per customer, in order. */
describe('grouping signals by customer', () => {
  const pairs = fc.array(fc.tuple(fc.nat(5), fc.nat(7)), { maxLength: 60 });

  it('lists each customer’s signal indices in their original order', () => {
    fc.assert(
      fc.property(pairs, (ps) => {
        const { ptr, signal } = signalsByCustomer(columns(ps), 6);
        for (let u = 0; u < 6; u++) {
          const expected = ps.flatMap((p, k) => (p[0] === u ? [k] : []));
          expect(Array.from(signal.subarray(ptr[u]!, ptr[u + 1]!))).toEqual(expected);
        }
      }),
    );
  });

  it('gives each customer’s distinct items, ascending, with value 1', () => {
    fc.assert(
      fc.property(pairs, (ps) => {
        const m = customerItemSets(columns(ps), 6, 8);
        expect([m.rows, m.cols]).toEqual([6, 8]);
        for (let u = 0; u < 6; u++) {
          const expected = [...new Set(ps.filter((p) => p[0] === u).map((p) => p[1]))].sort((a, b) => a - b);
          expect(Array.from(m.indices.subarray(m.indptr[u]!, m.indptr[u + 1]!))).toEqual(expected);
        }
        expect(Array.from(m.data).every((v) => v === 1)).toBe(true);
      }),
    );
  });
});
