/**
 * The random validation split was rewritten for large logs (typed-array flags per distinct pair instead of a Set of
 * u × nItems + i keys and number[] lists). It must hold out exactly the signals the earlier code held out: the
 * reference below is that code, kept verbatim, and both run on random untimed logs with repeats of one pair.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { customerItemSets } from '../../src-main/core/matrix/by-customer.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Dataset, Item } from '../../src-main/core/types.ts';
import { NOTHING_TO_HOLD_OUT, validationSplit } from '../../src-main/services/tune/split.ts';

/** The split as it was before the rewrite (services/tune/split.ts at c3abd73). */
function referenceSplit(ds: Dataset, share: number, seed: number): { train: Int32Array; validation: Int32Array } {
  const s = ds.signals;
  const nC = ds.customerIds.length;
  const owned = customerItemSets(s, nC, ds.items.length);
  const rng = seededRng(seed);
  const held = new Set<number>();
  const nI = ds.items.length;
  for (let u = 0; u < nC; u++) {
    const row = Array.from(owned.indices.subarray(owned.indptr[u]!, owned.indptr[u + 1]!), Number);
    if (row.length < 2) continue;
    const take = Math.min(row.length - 1, Math.max(1, Math.round(share * row.length)));
    for (let q = 0; q < take; q++) {
      const j = q + rng.int(row.length - q);
      const t = row[q]!;
      row[q] = row[j]!;
      row[j] = t;
      held.add(u * nI + row[q]!);
    }
  }
  const train: number[] = [];
  const validation: number[] = [];
  for (let k = 0; k < s.length; k++) (held.has(s.customer[k]! * nI + s.item[k]!) ? validation : train).push(k);
  if (validation.length === 0) throw new InputError(NOTHING_TO_HOLD_OUT);
  return { train: Int32Array.from(train), validation: Int32Array.from(validation) };
}

function untimedLog(nCustomers: number, nItems: number, pairs: [number, number][]): Dataset {
  const n = pairs.length;
  return {
    items: Array.from({ length: nItems }, (_, i) => ({ id: i + 1, externalId: `i${i}`, addedAt: null }) as Item),
    customerIds: Int32Array.from({ length: nCustomers }, (_, u) => u + 1),
    customerExternalIds: Array.from({ length: nCustomers }, (_, u) => `u${u}`),
    signals: {
      length: n,
      customer: Int32Array.from(pairs, (p) => p[0]),
      item: Int32Array.from(pairs, (p) => p[1]),
      kind: new Uint8Array(n).fill(2),
      value: new Float32Array(n).fill(1),
      at: new Float64Array(n).fill(Number.NaN),
    },
  };
}

describe('the random validation split on large logs', () => {
  it('holds out the same signals as the earlier code, repeats of one pair included', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        fc.integer({ min: 1, max: 30 }),
        fc.array(fc.tuple(fc.nat(), fc.nat()), { minLength: 1, maxLength: 200 }),
        fc.integer({ min: 1, max: 9 }),
        fc.integer({ min: 0, max: 1000 }),
        (nC, nI, raw, tenths, seed) => {
          const ds = untimedLog(nC, nI, raw.map(([u, i]) => [u % nC, i % nI]));
          const share = tenths / 10;
          let expected: ReturnType<typeof referenceSplit> | Error;
          try {
            expected = referenceSplit(ds, share, seed);
          } catch (e) {
            expected = e as Error;
          }
          if (expected instanceof Error) {
            expect(() => validationSplit(ds, { share, seed })).toThrow(expected.message);
            return;
          }
          const got = validationSplit(ds, { share, seed });
          expect(got.method).toBe('random');
          expect(Array.from(got.train)).toEqual(Array.from(expected.train));
          expect(Array.from(got.validation)).toEqual(Array.from(expected.validation));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('splits customers × items past 2^31 pairs (the keys of the earlier code were heap numbers there)', () => {
    // 70,000 customers × 40,000 items: u × nItems + i reaches 2.8e9. Each customer holds 3 items, one repeated.
    const nC = 70_000;
    const nI = 40_000;
    const pairs: [number, number][] = [];
    for (let u = 0; u < nC; u++) pairs.push([u, (u * 7) % nI], [u, (u * 13 + 1) % nI], [u, (u * 7) % nI], [u, (u * 31 + 2) % nI]);
    const ds = untimedLog(nC, nI, pairs);
    const got = validationSplit(ds, { share: 0.2, seed: 3 });
    const expected = referenceSplit(ds, 0.2, 3);
    expect(got.validation).toEqual(expected.validation);
    expect(got.train.length + got.validation.length).toBe(pairs.length);
  });
});
