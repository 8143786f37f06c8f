import { describe, expect, it } from 'vitest';
import type { EditorialState } from '../../src-main/core/curation/candidates.ts';
import { fillShelf } from '../../src-main/core/curation/fill.ts';
import { capOf, floorOf, promotedCountBounds } from '../../src-main/core/curation/share-counts.ts';
import { stableFill } from '../../src-main/core/curation/stable-fill.ts';
import { compilePlan } from '../../src-main/core/planning/compile.ts';
import { InputError } from '../../src-main/core/errors.ts';
import type { Item } from '../../src-main/core/types.ts';
import { randomInstance } from '../planning/instances.ts';
import { brief, context, EDITION, item, state } from './helpers.ts';

/** floor and ceil of (p/100) × n in exact integer arithmetic: the reference the float rounding must match. */
const exactCap = (p: number, n: number) => Math.floor((p * n) / 100);
const exactFloor = (p: number, n: number) => Math.ceil((p * n) / 100);

describe('share → slot count: one rounding (core/curation/share-counts.ts)', () => {
  it('matches exact rational arithmetic for every whole-percent share on 1..200 slots', () => {
    // p × n is an integer product, so the reference has no floating-point error at all.
    for (let p = 0; p <= 100; p++) {
      for (let n = 1; n <= 200; n++) {
        expect(capOf(p / 100, n)).toBe(exactCap(p, n));
        expect(floorOf(p / 100, n) + 0).toBe(exactFloor(p, n)); // + 0: a floor of 0 comes out as -0, the same count
      }
    }
  });

  it('counts a share that is exactly k/n in decimal as k, where plain floor/ceil of the float product would not', () => {
    // In IEEE 754 doubles 0.28 × 25 is 7.000000000000001 and 0.29 × 100 is 28.999999999999996.
    expect(Math.ceil(0.28 * 25)).toBe(8);
    expect(floorOf(0.28, 25)).toBe(7);
    expect(Math.floor(0.29 * 100)).toBe(28);
    expect(capOf(0.29, 100)).toBe(29);
  });

  it('is what the fill, the stable fill and the planner each computed before (floor(s·n + 1e-9), ceil(s·n − 1e-9))', () => {
    // The three inline copies this helper replaced, written out once more as they were.
    const before = (promo: { minCount?: number; maxCount?: number }, n: number) => ({
      minCount: promo.minCount === undefined ? 0 : Math.ceil(promo.minCount * n - 1e-9),
      maxCount: promo.maxCount === undefined ? n : Math.floor(promo.maxCount * n + 1e-9),
    });
    const shares = [undefined, 0, 1 / 3, 0.1, 0.125, 0.2, 0.25, 0.3, 0.5, 2 / 3, 0.7, 0.99, 1];
    for (const minCount of shares) {
      for (const maxCount of shares) {
        for (const n of [1, 3, 4, 7, 8, 10, 12, 24, 30, 100, 200]) {
          const promo = { ...(minCount !== undefined && { minCount }), ...(maxCount !== undefined && { maxCount }) };
          expect(promotedCountBounds(promo, n)).toEqual(before(promo, n));
        }
      }
    }
  });

  it('gives the planner the promoted bounds the fill enforces (0.7 and 0.9 of 10 slots: 7 and 9)', () => {
    const inst = randomInstance({ seed: 3, items: 30, weeks: 2, shelves: 1, size: 10, promotedShare: 0.9, rules: { promoted: { minCount: 0.7, maxCount: 0.9 } } });
    const plan = compilePlan(inst);
    expect(Array.from(plan.promotedMin)).toEqual([7]);
    expect(Array.from(plan.promotedMax)).toEqual([9]);
  });
});

describe('pins: one check for both fills (core/curation/pins.ts)', () => {
  const items: Item[] = [item(1), item(2), item(3, { available: false }), item(4), item(5)];
  const ctx = context(items, items.map((_, i) => items.map((__, f) => (f === i ? 1 : 0))));
  const candidates = items.map((_, index) => ({ index, relevance: 1 - index / 100 }));
  const b = brief({ size: 4, lambda: 1 });
  const fill = (st: EditorialState) => fillShelf({ ctx, brief: b, candidates, state: st, editionDate: EDITION });
  const stable = (st: EditorialState) =>
    stableFill({ ctx, brief: b, candidates, state: st, editionDate: EDITION, current: Int32Array.from([0, 1, 3, 4]) });

  it('refuses a slot outside the shelf and an item pinned twice with the same words in either fill', () => {
    for (const run of [fill, stable]) {
      expect(() => run(state({ pins: new Map([[4, 0]]) }))).toThrow(InputError);
      expect(() => run(state({ pins: new Map([[4, 0]]) }))).toThrow('pin: slot 5 is outside the shelf of 4 slots');
      expect(() => run(state({ pins: new Map([[0, 1], [1, 1]]) }))).toThrow('pin: item sku-2 is pinned to two slots');
      // An out-of-stock item pinned twice is refused too (the stable fill used to let it through).
      expect(() => run(state({ pins: new Map([[0, 2], [1, 2]]) }))).toThrow('pin: item sku-3 is pinned to two slots');
    }
  });

  it('reports the same pins in either fill, keeps the pinned item in its slot, drops an out-of-stock pin', () => {
    const st = state({ pins: new Map([[2, 4], [0, 2]]), bans: new Set([4]) });
    const a = fill(st);
    const s = stable(st);
    expect(a.slots[2]).toBe(4);
    expect(s.slots[2]).toBe(4);
    const pinReport = 'slot 1: item sku-3 is out of stock; the pin is not applied; slot 3: item sku-5 is kept by its pin although it breaks: banned';
    expect(a.violations.find((v) => v.rule === 'pin')?.reason).toBe(pinReport);
    expect(s.violations.find((v) => v.rule === 'pin')?.reason).toBe(pinReport);
  });
});
