import { describe, expect, it } from 'vitest';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { signalUnit } from '../../src-main/core/matrix/signal-unit.ts';
import { confidence } from '../../src-main/core/models/ials-params.ts';
import type { Dataset, SignalKind } from '../../src-main/core/types.ts';
import { dataset as timedDataset } from './sig-dataset.ts';

type Sig = [customer: number, item: number, kind: SignalKind, value: number];

/** 3 customers × 4 items holding the signals given, every one on day 10 (sig-dataset.ts). */
const dataset = (sigs: Sig[]): Dataset => timedDataset(3, 4, sigs.map(([c, i, kind, v]) => [c, i, kind, v, 10]));

describe('signalUnit', () => {
  it('is the weight of the most frequent kind', () => {
    expect(signalUnit(dataset([[0, 0, 'purchase', 3], [1, 1, 'purchase', 1], [2, 2, 'view', 1]]))).toBe(5);
    expect(signalUnit(dataset([[0, 0, 'view', 1], [1, 1, 'view', 1], [2, 2, 'purchase', 1]]))).toBe(1);
    expect(signalUnit(dataset([[0, 0, 'purchase', 1], [1, 1, 'purchase', 1]]), { purchase: 2 })).toBe(2);
  });
  it('takes the lighter kind on a tie, skips kinds that weigh nothing, and is 1 with no signals', () => {
    expect(signalUnit(dataset([[0, 0, 'purchase', 1], [1, 1, 'basket', 1]]))).toBe(3);
    expect(signalUnit(dataset([[0, 0, 'purchase', 1], [1, 1, 'view', 1], [2, 1, 'view', 1]]), { view: 0 })).toBe(5);
    expect(signalUnit(dataset([]))).toBe(1);
  });
  it('makes the log confidence the same whatever the scale of the kind weights', () => {
    // Hu, Koren & Volinsky (2008) define r as how often an item was consumed: with ε = the unit, r/ε counts
    // ordinary signals, so scaling every kind weight by 7 leaves every confidence unchanged.
    const ds = dataset([[0, 0, 'purchase', 12], [0, 1, 'purchase', 1], [1, 1, 'purchase', 3], [2, 3, 'purchase', 250]]);
    const heavy = { purchase: 35 };
    const a = buildInteractionMatrix(ds);
    const b = buildInteractionMatrix(ds, { kindWeights: heavy });
    const ca = Array.from(a.data, (r) => confidence({ alpha: 10, scaling: 'log', epsilon: signalUnit(ds) }, r));
    const cb = Array.from(b.data, (r) => confidence({ alpha: 10, scaling: 'log', epsilon: signalUnit(ds, heavy) }, r));
    for (let k = 0; k < ca.length; k++) expect(cb[k]).toBeCloseTo(ca[k]!, 10);
    // With ε fixed at 1 it is not: the case this unit exists for.
    expect(confidence({ alpha: 10, scaling: 'log', epsilon: 1 }, b.data[1]!)).not.toBeCloseTo(confidence({ alpha: 10, scaling: 'log', epsilon: 1 }, a.data[1]!), 3);
  });
});
