import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildCandidatePool } from '../../src-main/core/curation/candidates.ts';
import { fillShelf } from '../../src-main/core/curation/fill.ts';
import { promotedShares } from '../../src-main/core/curation/meter.ts';
import { quotaName } from '../../src-main/core/curation/quota-counter.ts';
import type { Quota } from '../../src-main/core/curation/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { brief, EDITION, randomContext, state } from './helpers.ts';

const quotaArb: fc.Arbitrary<Quota> = fc
  .record({
    facet: fc.constantFrom('category' as const, 'supplier' as const, 'tag' as const),
    max: fc.integer({ min: 1, max: 3 }),
    named: fc.boolean(),
  })
  .map(({ facet, max, named }) => {
    const value = { category: 'Lamps', supplier: 'Pebble & Pine', tag: 'oak' }[facet];
    return named ? { facet, max, value } : { facet, max };
  });

const bound = fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined });

const caseArb = fc.record({
  seed: fc.integer({ min: 0, max: 1_000_000 }),
  items: fc.integer({ min: 3, max: 40 }),
  size: fc.integer({ min: 1, max: 12 }),
  lambda: fc.double({ min: 0, max: 1, noNaN: true }),
  quotas: fc.array(quotaArb, { maxLength: 3 }),
  promoted: fc.record({ minCount: bound, maxCount: bound, minExposure: bound, maxExposure: bound }),
  pinCount: fc.integer({ min: 0, max: 3 }),
});

describe('fillShelf properties', () => {
  it('never repeats, never shows out-of-stock items, keeps pins, and reports every broken rule', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const ctx = randomContext(c.seed, c.items, 4);
        const p: { minCount?: number | undefined; maxCount?: number | undefined; minExposure?: number | undefined; maxExposure?: number | undefined } = { ...c.promoted };
        if (p.minCount !== undefined && p.maxCount !== undefined && p.minCount > p.maxCount) p.minCount = undefined;
        if (p.minExposure !== undefined && p.maxExposure !== undefined && p.minExposure > p.maxExposure) p.minExposure = undefined;
        const promoted = Object.fromEntries(Object.entries(p).filter(([, v]) => v !== undefined));
        const b = brief({ size: c.size, lambda: c.lambda }, { quotas: c.quotas, promoted });
        const rng = seededRng(c.seed);
        const pins = new Map<number, number>();
        for (let k = 0; k < c.pinCount; k++) {
          const item = rng.int(ctx.n);
          if (![...pins.values()].includes(item)) pins.set(rng.int(c.size), item);
        }
        const st = state({ pins });
        const pool = buildCandidatePool(ctx, b, st, EDITION);
        const candidates = Array.from(pool.items, (index) => ({ index, relevance: rng.next() }));
        const res = fillShelf({ ctx, brief: b, candidates, state: st, editionDate: EDITION });
        const rules = new Set(res.violations.map((v) => v.rule));
        const filled = Array.from(res.slots).filter((i) => i >= 0);

        expect(new Set(filled).size).toBe(filled.length);
        for (const i of filled) expect(ctx.available[i]).toBe(1);
        for (const [slot, i] of pins) {
          if (ctx.available[i] === 1) expect(res.slots[slot]).toBe(i);
          else expect(rules.has('pin')).toBe(true);
        }
        if (filled.length < c.size) expect(rules.has('size')).toBe(true);
        for (const q of c.quotas) {
          const counts = new Map<string, number>();
          for (const i of filled) {
            const values =
              q.facet === 'tag'
                ? Array.from(ctx.tagCodes.subarray(ctx.tagPtr[i], ctx.tagPtr[i + 1]), (t) => ctx.facets.tag.values[t] as string)
                : [ctx.facets[q.facet].values[(q.facet === 'category' ? ctx.category : ctx.supplier)[i] as number] as string];
            for (const v of values) if (q.value === undefined || q.value === v) counts.set(v, (counts.get(v) ?? 0) + 1);
          }
          const over = [...counts.values()].some((n) => n > q.max);
          if (over) expect(rules.has(quotaName(q))).toBe(true);
        }
        if (filled.length > 0) {
          const shares = promotedShares(ctx, res.slots);
          const eps = 1e-9;
          if (p.minCount !== undefined && shares.count < p.minCount - eps) expect(rules.has('promoted.minCount')).toBe(true);
          if (p.maxCount !== undefined && shares.count > p.maxCount + eps) expect(rules.has('promoted.maxCount')).toBe(true);
          if (p.minExposure !== undefined && shares.exposure < p.minExposure - eps) {
            expect(rules.has('promoted.minExposure')).toBe(true);
          }
          if (p.maxExposure !== undefined && shares.exposure > p.maxExposure + eps) {
            expect(rules.has('promoted.maxExposure')).toBe(true);
          }
        }
      }),
      { numRuns: 300, seed: 42 },
    );
  });

  it('reports nothing when the rules are loose and the pool is large', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1_000_000 }), (seed) => {
        const ctx = randomContext(seed, 60, 4);
        const b = brief({ size: 6, lambda: 0.5 }, { quotas: [{ facet: 'category', max: 3 }], promoted: { maxCount: 0.5 } });
        const pool = buildCandidatePool(ctx, b, state(), EDITION);
        const rng = seededRng(seed);
        const candidates = Array.from(pool.items, (index) => ({ index, relevance: rng.next() }));
        const res = fillShelf({ ctx, brief: b, candidates, state: state(), editionDate: EDITION });
        expect(res.violations).toEqual([]);
        expect(Array.from(res.slots).every((i) => i >= 0)).toBe(true);
      }),
      { numRuns: 50, seed: 7 },
    );
  });
});
