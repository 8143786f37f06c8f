import { describe, expect, it } from 'vitest';
import { fillShelf } from '../../src-main/core/curation/fill.ts';
import type { Brief } from '../../src-main/core/curation/types.ts';
import { InputError } from '../../src-main/core/errors.ts';
import type { Item } from '../../src-main/core/types.ts';
import { brief, context, EDITION, item, state } from './helpers.ts';
import type { EditorialState } from '../../src-main/core/curation/candidates.ts';

/** Items with orthogonal-ish vectors so diversity does not interfere; relevance falls with the index. */
function run(items: Item[], b: Brief, st: EditorialState = state()) {
  const ctx = context(
    items,
    items.map((_, i) => items.map((__, f) => (f === i ? 1 : 0))),
  );
  const candidates = items.map((_, index) => ({ index, relevance: 1 - index / 100 }));
  return fillShelf({ ctx, brief: b, candidates, state: st, editionDate: EDITION });
}

const rules = (r: Partial<Brief['rules']>, size = 4): Brief => brief({ size, lambda: 1 }, r);

describe('fillShelf: quotas', () => {
  it('keeps at most n per category when the pool allows it', () => {
    const items = [item(1), item(2), item(3, { category: 'Rugs' }), item(4), item(5, { category: 'Mugs' }), item(6, { category: 'Vases' })];
    const res = run(items, rules({ quotas: [{ facet: 'category', max: 1 }] }));
    expect(Array.from(res.slots)).toEqual([0, 2, 4, 5]);
    expect(res.violations).toEqual([]);
  });

  it('limits one named value only', () => {
    const items = [item(1, { tags: ['oak'] }), item(2, { tags: ['oak'] }), item(3, { tags: ['oak', 'wool'] }), item(4), item(5)];
    const res = run(items, rules({ quotas: [{ facet: 'tag', value: 'oak', max: 2 }] }));
    expect(Array.from(res.slots)).toEqual([0, 1, 3, 4]);
  });

  it('gives way and says so when too few candidates are left', () => {
    const items = [item(1), item(2), item(3)];
    const res = run(items, rules({ quotas: [{ facet: 'category', max: 1 }] }, 3));
    expect(Array.from(res.slots)).toEqual([0, 1, 2]);
    expect(res.violations).toEqual([
      { rule: 'quota category max 1', reason: 'slot 2: no candidate within the quotas; Lamps goes over; slot 3: no candidate within the quotas; Lamps goes over' },
    ]);
  });
});

describe('fillShelf: promoted share', () => {
  it('places promoted items late enough to meet a minimum count, no earlier than needed', () => {
    const items = [item(1), item(2), item(3), item(4), item(5, { promoted: true }), item(6, { promoted: true })];
    const res = run(items, rules({ promoted: { minCount: 0.5 } }));
    expect(Array.from(res.slots)).toEqual([0, 1, 4, 5]);
    expect(res.violations).toEqual([]);
  });

  it('moves promoted items forward to meet a minimum exposure share', () => {
    // Discounts for 4 slots (Järvelin & Kekäläinen 2002): 1, 0.631, 0.5, 0.431; total 2.562.
    // A 0.5 exposure share needs 1.281. Two promoted candidates: if slot 1 went organic, the best they
    // could add later is slots 2 + 3 = 1.131 < 1.281, so slot 1 must be promoted. Then 0.281 is still
    // needed; slot 4 alone (0.431) can give it, so the second promoted item waits until slot 4.
    const items = [item(1), item(2), item(3), item(4), item(5, { promoted: true }), item(6, { promoted: true })];
    const res = run(items, rules({ promoted: { minExposure: 0.5 } }));
    expect(Array.from(res.slots)).toEqual([4, 0, 1, 5]);
    expect(res.violations).toEqual([]);
  });

  it('caps promoted items by count and by exposure', () => {
    const items = [item(1, { promoted: true }), item(2, { promoted: true }), item(3, { promoted: true }), item(4), item(5), item(6)];
    expect(Array.from(run(items, rules({ promoted: { maxCount: 0.25 } })).slots)).toEqual([0, 3, 4, 5]);
    // 0.2 of 2.562 = 0.512: a promoted item fits only in slot 3 (0.5) or 4 (0.431), and only one of them.
    expect(Array.from(run(items, rules({ promoted: { maxExposure: 0.2 } })).slots)).toEqual([3, 4, 0, 5]);
  });

  it('reports a minimum it cannot meet', () => {
    const items = [item(1), item(2), item(3), item(4), item(5, { promoted: true })];
    const res = run(items, rules({ promoted: { minCount: 0.5 } }));
    expect(Array.from(res.slots)).toEqual([0, 1, 4, 2]);
    expect(res.violations.map((v) => v.rule)).toEqual(['promoted.minCount']);
    expect(res.violations[0]?.reason).toMatch(/slot 4: no promoted candidate/);
  });

  it('breaks the promoted cap last, and reports it', () => {
    const items = [item(1), item(2, { promoted: true }), item(3, { promoted: true })];
    const res = run(items, rules({ promoted: { maxCount: 0 } }, 3));
    expect(Array.from(res.slots)).toEqual([0, 1, 2]);
    expect(res.violations.map((v) => v.rule)).toEqual(['promoted.maxCount']);
  });
});

describe('fillShelf: pins and empty slots', () => {
  const items = [item(1), item(2), item(3, { available: false }), item(4), item(5)];

  it('keeps pins in their slots, reports the rules they override, refuses out-of-stock pins', () => {
    const st = state({ pins: new Map([[2, 4], [0, 2]]), bans: new Set([4]) });
    const res = run(items, rules({}), st);
    expect(res.slots[2]).toBe(4);
    expect(Array.from(res.slots)).toEqual([0, 1, 4, 3]);
    expect(res.violations).toEqual([
      {
        rule: 'pin',
        reason: 'slot 1: item sku-3 is out of stock; the pin is not applied; slot 3: item sku-5 is kept by its pin although it breaks: banned',
      },
    ]);
  });

  it('leaves a slot empty only when the pool runs out, and reports it', () => {
    const res = run([item(1), item(2)], rules({}, 3));
    expect(Array.from(res.slots)).toEqual([0, 1, -1]);
    expect(res.violations).toEqual([{ rule: 'size', reason: 'slot 3 left empty: no candidate left in the pool' }]);
  });

  it('rejects a pin outside the shelf and an item pinned twice', () => {
    expect(() => run(items, rules({}), state({ pins: new Map([[4, 0]]) }))).toThrow(InputError);
    expect(() => run(items, rules({}), state({ pins: new Map([[4, 0]]) }))).toThrow(/slot 5 is outside the shelf of 4/);
    expect(() => run(items, rules({}), state({ pins: new Map([[0, 1], [1, 1]]) }))).toThrow(/pinned to two slots/);
  });
});
