import { describe, expect, it } from 'vitest';
import { buildCandidatePool } from '../../src-main/core/curation/candidates.ts';
import { InputError } from '../../src-main/core/errors.ts';
import { brief, context, EDITION, item, state } from './helpers.ts';

const DAY = 86_400_000;
const ctx = context([
  item(1), // 0: passes everything
  item(2, { available: false }), // 1: out of stock
  item(3), // 2: banned by id
  item(4, { supplier: 'Pebble & Pine' }), // 3: ban rule on the supplier
  item(5), // 4: resting
  item(6, { category: 'Mugs' }), // 5: not in the included categories
  item(7, { tags: ['clay'] }), // 6: excluded tag
  item(8, { price: 500 }), // 7: above the price band
  item(9, { addedAt: EDITION - 400 * DAY }), // 8: too old
  item(10), // 9: already in the edition
  item(11, { price: null }), // 10: unknown price fails a set band
  item(12, { addedAt: EDITION + 3 * DAY }), // 11: added after the edition date
]);

const b = brief(
  {
    include: { categories: ['Lamps'], tags: [], suppliers: [] },
    exclude: { categories: [], tags: ['clay'], suppliers: [] },
    priceBand: { max: 100 },
    maxAgeDays: 365,
  },
  { restPeriod: 2 },
);
const st = state({
  bans: new Set([2]),
  banRules: [{ facet: 'supplier', value: 'Pebble & Pine' }],
  resting: new Set([4]),
  usedInEdition: new Set([9]),
});

describe('buildCandidatePool', () => {
  it('keeps only items that pass every rule and counts each exclusion once', () => {
    const pool = buildCandidatePool(ctx, b, st, EDITION);
    expect(Array.from(pool.items)).toEqual([0]);
    expect(pool.excluded).toEqual({
      outOfStock: 1,
      notYetAdded: 1,
      banned: 1,
      banRule: 1,
      resting: 1,
      category: 1,
      tag: 1,
      supplier: 0,
      price: 2,
      age: 1,
      inEdition: 1,
    });
  });

  it('leaves out an item added after the edition date, but not one whose date is unknown', () => {
    const open = brief({}, { restPeriod: 0 });
    const later = buildCandidatePool(ctx, open, state({}), EDITION);
    expect(later.items).not.toContain(11);
    expect(later.excluded.notYetAdded).toBe(1);
    expect(buildCandidatePool(context([item(1, { addedAt: null })]), open, state({}), EDITION).items).toContain(0);
    // Four days on, the item exists and is proposed.
    expect(buildCandidatePool(ctx, open, state({}), EDITION + 4 * DAY).items).toContain(11);
  });

  it('lets pinned items past rest, bans and filters but never out-of-stock ones', () => {
    const pins = new Map([
      [0, 4],
      [1, 2],
      [2, 1],
    ]);
    const pool = buildCandidatePool(ctx, b, { ...st, pins }, EDITION);
    expect(Array.from(pool.items)).toEqual([0, 2, 4]);
    expect(pool.excluded.outOfStock).toBe(1);
  });

  it('ignores the rest list when the rest period is 0 and allows repeats when asked', () => {
    const open = brief({}, { restPeriod: 0, allowRepeatInEdition: true });
    const pool = buildCandidatePool(ctx, open, st, EDITION);
    expect(pool.items).toContain(4);
    expect(pool.items).toContain(9);
  });

  it('rejects quota 0 and names the field', () => {
    const bad = brief({}, { quotas: [{ facet: 'category', max: 0 }] });
    expect(() => buildCandidatePool(ctx, bad, st, EDITION)).toThrow(InputError);
    expect(() => buildCandidatePool(ctx, bad, st, EDITION)).toThrow(/^Limit 1: most items \(max\): must be a whole number >= 1/);
    expect(() => buildCandidatePool(ctx, brief({ lambda: 1.5 }), st, EDITION)).toThrow(/^Relevance against variety \(lambda\): must be between 0 and 1/);
    const inverted = brief({}, { promoted: { minCount: 0.5, maxCount: 0.25 } });
    expect(() => buildCandidatePool(ctx, inverted, st, EDITION)).toThrow(/^Least sponsored share of slots \(minCount\): is above maxCount/);
  });
});
