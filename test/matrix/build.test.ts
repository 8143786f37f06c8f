import fc from 'fast-check';
import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { buildInteractionMatrix, DEFAULT_KIND_WEIGHTS, RATING_NEUTRAL } from '../../src-main/core/matrix/build.ts';
import { csrFromDense, transpose, type Csr } from '../../src-main/core/matrix/csr.ts';
import { DAY_MS, SIGNAL_KIND_CODE, type Dataset, type Item, type SignalKind } from '../../src-main/core/types.ts';

type Sig = [customer: number, item: number, kind: SignalKind, value: number, day: number];

function dataset(customers: number, items: number, sigs: Sig[]): Dataset {
  const n = sigs.length;
  return {
    items: Array.from({ length: items }, (_, i) => ({ id: i }) as Item),
    customerIds: Int32Array.from({ length: customers }, (_, i) => i + 1),
    customerExternalIds: Array.from({ length: customers }, (_, i) => `c${i}`),
    signals: {
      length: n,
      customer: Int32Array.from(sigs.map((s) => s[0])),
      item: Int32Array.from(sigs.map((s) => s[1])),
      kind: Uint8Array.from(sigs.map((s) => SIGNAL_KIND_CODE[s[2]])),
      value: Float32Array.from(sigs.map((s) => s[3])),
      at: Float64Array.from(sigs.map((s) => s[4] * DAY_MS)),
    },
  };
}

function dense(m: Csr): number[][] {
  const d = Array.from({ length: m.rows }, () => new Array<number>(m.cols).fill(0));
  for (let r = 0; r < m.rows; r++) for (let p = m.indptr[r]!; p < m.indptr[r + 1]!; p++) d[r]![m.indices[p]!]! += m.data[p]!;
  return d;
}

function expectSortedRows(m: Csr): void {
  for (let r = 0; r < m.rows; r++) for (let p = m.indptr[r]! + 1; p < m.indptr[r + 1]!; p++) expect(m.indices[p]!).toBeGreaterThan(m.indices[p - 1]!);
}

describe('buildInteractionMatrix', () => {
  const ds = dataset(3, 4, [
    [0, 2, 'view', 1, 10],
    [0, 1, 'purchase', 1, 10],
    [0, 2, 'view', 1, 11], // duplicate of (0, 2): summed
    [1, 3, 'basket', 2, 12], // quantity 2
    [1, 0, 'rating', 5, 12],
    [1, 1, 'rating', 2, 12], // below neutral: left out
    [2, 0, 'click', 1, NaN],
  ]);

  it('sums duplicates, weighs kinds by the documented defaults and sorts each row', () => {
    const m = buildInteractionMatrix(ds);
    expect(dense(m)).toEqual([
      [0, 5, 2, 0],
      [5 - RATING_NEUTRAL, 0, 0, 6],
      [1, 0, 0, 0],
    ]);
    expect(m.indptr[m.rows]).toBe(5);
    expectSortedRows(m);
  });

  it('applies kind weight overrides, 0 dropping a kind', () => {
    const m = buildInteractionMatrix(ds, { kindWeights: { view: 0, purchase: 2 } });
    expect(dense(m)[0]).toEqual([0, 2, 0, 0]);
    expect(() => buildInteractionMatrix(ds, { kindWeights: { view: -1 } })).toThrow(/weight for kind 'view'/);
  });

  it('decays by 2^(−age/halfLife) from now, leaving untimed signals whole', () => {
    const m = buildInteractionMatrix(ds, { halfLifeDays: 1 }); // now = day 12, the latest signal
    const d = dense(m);
    expect(d[0]![1]).toBeCloseTo(DEFAULT_KIND_WEIGHTS.purchase * 0.25, 6);
    expect(d[0]![2]).toBeCloseTo(0.25 + 0.5, 6);
    expect(d[1]![3]).toBeCloseTo(6, 6);
    expect(d[2]![0]).toBe(1);
  });

  it('leaves out a signal decayed below Float32 range instead of storing an empty entry', () => {
    const old = dataset(1, 2, [
      [0, 0, 'view', 1, 0],
      [0, 1, 'view', 1, 400],
    ]);
    const m = buildInteractionMatrix(old, { halfLifeDays: 1 }); // 2^-400 underflows Float32
    expect(Array.from(m.indices)).toEqual([1]);
    expect(Array.from(m.data)).toEqual([1]);
  });

  it('keeps only a time window [from, to), dropping untimed signals', () => {
    const m = buildInteractionMatrix(ds, { window: { from: 11 * DAY_MS, to: 12 * DAY_MS } });
    expect(dense(m)).toEqual([
      [0, 0, 1, 0],
      [0, 0, 0, 0],
      [0, 0, 0, 0],
    ]);
  });

  it('uses only the given signal indices and rejects an index out of range', () => {
    expect(dense(buildInteractionMatrix(ds, { rows: Int32Array.of(1, 6) }))).toEqual([
      [0, 5, 0, 0],
      [0, 0, 0, 0],
      [1, 0, 0, 0],
    ]);
    expect(() => buildInteractionMatrix(ds, { rows: Int32Array.of(7) })).toThrow(/signal index 7 is out of range/);
  });

  it('agrees with a dense accumulation on random signals (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.nat(5), fc.nat(6), fc.constantFrom<SignalKind>('view', 'purchase', 'basket'), fc.integer({ min: 1, max: 3 })), {
          maxLength: 60,
        }),
        (raw) => {
          const sigs = raw.map(([c, i, k, v]): Sig => [c, i, k, v, 1]);
          const m = buildInteractionMatrix(dataset(6, 7, sigs));
          const expected = Array.from({ length: 6 }, () => new Array<number>(7).fill(0));
          for (const [c, i, k, v] of sigs) expected[c]![i]! += DEFAULT_KIND_WEIGHTS[k] * v;
          expect(dense(m)).toEqual(expected);
          expectSortedRows(m);
          const stored = m.indptr[m.rows]!;
          expect(stored).toBe(expected.flat().filter((x) => x !== 0).length);
        },
      ),
    );
  });
});

describe('transpose', () => {
  it('matches ml-matrix transpose (reference library) and keeps rows sorted', () => {
    const values = [0, 1, 0, 2, 3, 0, 0, 0, 0, 4, 5, 0];
    const m = csrFromDense(3, 4, values);
    const t = transpose(m);
    const ref = Matrix.from1DArray(3, 4, values).transpose().to2DArray();
    expect(dense(t)).toEqual(ref);
    expectSortedRows(t);
    expect(dense(transpose(t))).toEqual(dense(m));
  });
});
