import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildCandidatePool } from '../../src-main/core/curation/candidates.ts';
import { normaliseRows } from '../../src-main/core/curation/context.ts';
import { fillShelf } from '../../src-main/core/curation/fill.ts';
import { mmrObjective } from '../../src-main/core/curation/mmr.ts';
import type { Quota } from '../../src-main/core/curation/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { brief, EDITION, randomContext, state } from '../curation/helpers.ts';
import { fillShelfEager } from './eager-fill.ts';

const quotaArb: fc.Arbitrary<Quota> = fc
  .record({ facet: fc.constantFrom('category' as const, 'supplier' as const, 'tag' as const), max: fc.integer({ min: 1, max: 3 }) })
  .map(({ facet, max }) => ({ facet, max }));
const bound = fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined });

const caseArb = fc.record({
  seed: fc.integer({ min: 0, max: 1_000_000 }),
  items: fc.integer({ min: 2, max: 80 }),
  dim: fc.integer({ min: 1, max: 6 }),
  size: fc.integer({ min: 1, max: 14 }),
  // λ = 1 (relevance only) and λ = 0 (diversity only) are the edge cases of Carbonell & Goldstein's eq. 1.
  lambda: fc.oneof(fc.constantFrom(0, 0.5, 0.7, 1), fc.double({ min: 0, max: 1, noNaN: true })),
  // Few distinct relevance values and vectors make ties common: ties must go to the same candidate.
  relevanceLevels: fc.constantFrom(0, 2, 4),
  vectorPalette: fc.constantFrom(0, 3),
  signed: fc.boolean(),
  quotas: fc.array(quotaArb, { maxLength: 2 }),
  promoted: fc.record({ minCount: bound, maxCount: bound, minExposure: bound, maxExposure: bound }),
  pinCount: fc.integer({ min: 0, max: 3 }),
});

describe('fillShelf: lazy max term (issue 5)', () => {
  it('picks the same items in the same order, with the same objective and violations, as the eager fill', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const base = randomContext(c.seed, c.items, c.dim);
        const rng = seededRng(c.seed ^ 0x5bd1e995);
        // Signed vectors give negative similarities; a small palette repeats rows (equal similarities).
        const raw = new Float32Array(c.items * c.dim);
        for (let i = 0; i < c.items; i++) {
          const from = c.vectorPalette > 0 ? i % c.vectorPalette : i;
          for (let f = 0; f < c.dim; f++) raw[i * c.dim + f] = c.signed ? Math.sin(from * 7.3 + f * 1.9) : Math.abs(Math.sin(from * 7.3 + f * 1.9));
        }
        const ctx = { ...base, vectors: normaliseRows(raw, c.items, c.dim) };
        const p: Record<string, number | undefined> = { ...c.promoted };
        if (p['minCount'] !== undefined && p['maxCount'] !== undefined && p['minCount'] > p['maxCount']) p['minCount'] = undefined;
        if (p['minExposure'] !== undefined && p['maxExposure'] !== undefined && p['minExposure'] > p['maxExposure']) {
          p['minExposure'] = undefined;
        }
        const promoted = Object.fromEntries(Object.entries(p).filter(([, v]) => v !== undefined));
        const b = brief({ size: c.size, lambda: c.lambda }, { quotas: c.quotas, promoted });
        const pins = new Map<number, number>();
        for (let k = 0; k < c.pinCount; k++) {
          const item = rng.int(ctx.n);
          if (![...pins.values()].includes(item)) pins.set(rng.int(c.size), item);
        }
        const st = state({ pins });
        const pool = buildCandidatePool(ctx, b, st, EDITION);
        const rel = () => (c.relevanceLevels === 0 ? rng.next() : rng.int(c.relevanceLevels) / c.relevanceLevels);
        const candidates = Array.from(pool.items, (index) => ({ index, relevance: rel() }));
        const input = { ctx, brief: b, candidates, state: st, editionDate: EDITION };
        const fast = fillShelf(input);
        const slow = fillShelfEager(input);
        expect(Array.from(fast.slots)).toEqual(Array.from(slow.slots));
        expect(fast.objective).toBe(slow.objective);
        expect(fast.violations.map((v) => v.rule)).toEqual(slow.violations.map((v) => v.rule));
      }),
      { numRuns: 400, seed: 20261201 },
    );
  });

  it('matches a hand-worked MMR fill where a stale bound must be refreshed', () => {
    // Carbonell & Goldstein (1998), eq. 1, worked by hand with λ = 0.5 and unit vectors in the plane:
    // A = (1, 0), B = (0, 1), C = (0.6, 0.8), D = (0.8, 0.6); relevance A 1.0, B 0.9, C 0.8, D 0.7.
    //   slot 1: A (0.5). slot 2, S = {A}: B 0.45 − 0 = 0.45; C 0.40 − 0.3 = 0.10; D 0.35 − 0.4 = −0.05 → B.
    //   slot 3, S = {A, B}: C 0.40 − 0.5·0.8 = 0.00; D 0.35 − 0.5·0.8 = −0.05 → C.
    // At slot 3 C's and D's max terms from slot 2 (0.6 and 0.8) are stale (B raises C's to 0.8): C's bound
    // 0.40 − 0.3 = 0.10 beats no leader yet, so C is brought up to date; D's bound −0.05 does not beat 0.00.
    const ctx = randomContext(1, 4, 2, 0, 0);
    const v = Float32Array.of(1, 0, 0, 1, 0.6, 0.8, 0.8, 0.6);
    const c = { ...ctx, vectors: normaliseRows(v, 4, 2) };
    const candidates = [1, 0.9, 0.8, 0.7].map((relevance, index) => ({ index, relevance }));
    const b = brief({ size: 3, lambda: 0.5 });
    const r = fillShelf({ ctx: c, brief: b, candidates, state: state(), editionDate: EDITION });
    expect(Array.from(r.slots)).toEqual([0, 1, 2]);
    expect(r.objective).toBeCloseTo(0.5 + 0.45 + 0.0, 6); // float32 vectors: 0.8 is 0.800000011920929
    const relevance = Float64Array.of(1, 0.9, 0.8, 0.7);
    expect(r.objective).toBeCloseTo(mmrObjective(c, r.slots, relevance, 0.5), 9);
  });
});
