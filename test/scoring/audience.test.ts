import { describe, expect, it } from 'vitest';
import { IalsModel } from '../../src-main/core/models/ials.ts';
import { ialsParams } from '../../src-main/core/models/ials-params.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { audienceAffinityInto, audienceWindowNote, resolveAudience } from '../../src-main/core/scoring/index.ts';
import { DAY_MS, SIGNAL_KIND_CODE, type Dataset, type Item } from '../../src-main/core/types.ts';
import { binaryRows } from '../eval/csr-helper.ts';
import { matrixScorer } from './fakes.ts';

function item(id: number, category: string): Item {
  return {
    id, externalId: `i${id}`, title: '', description: '', category, tags: [], supplier: 's', price: null,
    addedAt: null, promoted: false, available: true, attributes: {},
  };
}

describe('audienceAffinityInto', () => {
  // Exactness of the iALS shortcut: mean_u x_uᵀy_i = (mean_u x_u)ᵀy_i by linearity; checked against the
  // slow definition (mean of scoreInto over the audience).
  it('equals the mean of scoreInto for iALS (mean customer factor, linearity)', () => {
    const k = 4, customers = 30, items = 12;
    const rng = seededRng(5);
    const x = Float32Array.from({ length: customers * k }, () => rng.normal());
    const y = Float32Array.from({ length: items * k }, () => rng.normal());
    const model = new IalsModel(ialsParams({ factors: k }), x, y);
    const audience = Int32Array.of(1, 4, 7, 20, 29);
    const history = binaryRows(Array.from({ length: customers }, () => [0]), items);
    const fast = new Float32Array(items);
    const report = audienceAffinityInto(model, history, audience, fast);
    expect(report).toEqual({ customersUsed: 5, exact: true });
    const buf = new Float32Array(items);
    const slow = new Float64Array(items);
    for (const u of audience) {
      model.scoreInto(u, history, buf);
      buf.forEach((v, i) => (slow[i]! += v / audience.length));
    }
    fast.forEach((v, i) => expect(v).toBeCloseTo(slow[i]!, 4));
  });

  it('averages scoreInto over the whole audience when it is small, and samples a large one reproducibly', () => {
    const sim = [
      [0, 1, 0],
      [1, 0, 2],
      [0, 2, 0],
    ];
    const model = matrixScorer('itemknn', sim);
    const history = binaryRows([[0], [1], [2], [0]], 3);
    const out = new Float32Array(3);
    expect(audienceAffinityInto(model, history, Int32Array.of(0, 1), out)).toEqual({ customersUsed: 2, exact: true });
    // Customer 0 (has item 0): [0, 1, 0]; customer 1 (has item 1): [1, 0, 2]; mean [0.5, 0.5, 1].
    expect(Array.from(out)).toEqual([0.5, 0.5, 1]);
    const a = new Float32Array(3);
    const b = new Float32Array(3);
    expect(audienceAffinityInto(model, history, Int32Array.of(0, 1, 2, 3), a, { sample: 2, seed: 9 })).toEqual({
      customersUsed: 2,
      exact: false,
    });
    audienceAffinityInto(model, history, Int32Array.of(0, 1, 2, 3), b, { sample: 2, seed: 9 });
    expect(Array.from(a)).toEqual(Array.from(b));
  });

  it('gives zeros for an empty audience', () => {
    const out = Float32Array.of(5, 5);
    audienceAffinityInto(matrixScorer('itemknn', [[0, 1], [1, 0]]), binaryRows([[0]], 2), new Int32Array(0), out);
    expect(Array.from(out)).toEqual([0, 0]);
  });
});

describe('resolveAudience', () => {
  const ed = Date.UTC(2026, 5, 1);
  const ds: Dataset = {
    items: [item(1, 'seeds'), item(2, 'tools')],
    customerIds: Int32Array.of(10, 11, 12, 13),
    customerExternalIds: ['a', 'b', 'c', 'd'],
    signals: {
      length: 4,
      customer: Int32Array.of(0, 1, 2, 3),
      item: Int32Array.of(0, 0, 1, 0),
      kind: Uint8Array.of(SIGNAL_KIND_CODE.purchase, SIGNAL_KIND_CODE.view, SIGNAL_KIND_CODE.purchase, SIGNAL_KIND_CODE.purchase),
      value: Float32Array.of(1, 1, 1, 1),
      at: Float64Array.of(ed - 10 * DAY_MS, ed - 5 * DAY_MS, ed - DAY_MS, ed - 100 * DAY_MS),
    },
  };
  it('finds who bought in a category within the window', () => {
    const rule = { kind: 'rule' as const, category: 'seeds', signalKinds: ['purchase'], withinDays: 90 };
    expect(Array.from(resolveAudience(ds, rule, ed))).toEqual([0]);
    expect(Array.from(resolveAudience(ds, { ...rule, signalKinds: ['purchase', 'view'] }, ed))).toEqual([0, 1]);
    expect(Array.from(resolveAudience(ds, { ...rule, withinDays: 120 }, ed))).toEqual([0, 3]);
  });
  it('resolves everyone and groups, and names what is missing', () => {
    expect(resolveAudience(ds, { kind: 'everyone' }, ed).length).toBe(4);
    expect(Array.from(resolveAudience(ds, { kind: 'group', group: 2 }, ed, Int32Array.of(1, 2, 2, 0)))).toEqual([1, 2]);
    expect(() => resolveAudience(ds, { kind: 'group', group: 2 }, ed)).toThrow(/taste groups/);
    expect(() =>
      resolveAudience(ds, { kind: 'rule', category: 'seeds', signalKinds: ['bought'], withinDays: 9 }, ed),
    ).toThrow(/unknown signal kind 'bought'/);
  });
});

describe('a rule audience on signals without any time', () => {
  const timeless = (): Dataset => {
    const at = new Float64Array(3).fill(NaN);
    return {
      items: [item(1, 'seeds'), item(2, 'tools')],
      customerIds: Int32Array.of(10, 11, 12),
      customerExternalIds: ['a', 'b', 'c'],
      signals: {
        length: 3,
        customer: Int32Array.of(0, 1, 2),
        item: Int32Array.of(0, 1, 0),
        kind: Uint8Array.of(SIGNAL_KIND_CODE.other, SIGNAL_KIND_CODE.other, SIGNAL_KIND_CODE.purchase),
        value: Float32Array.of(3, 1, 2),
        at,
      },
    };
  };
  const rule = { kind: 'rule' as const, category: 'seeds', signalKinds: ['other'], withinDays: 30 };

  it('reads the whole history, since no window can be placed, and says so', () => {
    const ds = timeless();
    expect(Array.from(resolveAudience(ds, rule, Date.UTC(2026, 0, 1)))).toEqual([0]);
    expect(audienceWindowNote(rule, ds)).toBe('no signal has a time, so "the last 30 days" cannot be placed: the audience is everyone with such a signal in seeds at any time');
    expect(audienceWindowNote({ kind: 'everyone' }, ds)).toBeNull();
  });

  it('keeps the window where some signals have a time: an untimed signal is then in no window', () => {
    const ds = timeless();
    ds.signals.at[1] = Date.UTC(2025, 11, 20);
    expect(Array.from(resolveAudience(ds, rule, Date.UTC(2026, 0, 1)))).toEqual([]);
    expect(audienceWindowNote(rule, ds)).toBeNull();
  });
});
