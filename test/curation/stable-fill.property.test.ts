/**
 * The stable fill (issue 12, DESIGN.md "Data flow": an editor's action changes the list as little as it
 * can). Over random worlds and random current lists: a pin, boost or sink changes the membership of at
 * most one other item, a ban of exactly one, and a fill of a list it left keeps it exactly. The ban's
 * replacement is checked against Maximal Marginal Relevance computed here from its definition
 * (Carbonell & Goldstein 1998, eq. 1), not through the fill's own code.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildCandidatePool } from '../../src-main/core/curation/candidates.ts';
import type { CurationContext } from '../../src-main/core/curation/context.ts';
import { fillShelf } from '../../src-main/core/curation/fill.ts';
import { stableFill } from '../../src-main/core/curation/stable-fill.ts';
import type { Brief, Candidate } from '../../src-main/core/curation/types.ts';
import type { EditorialState } from '../../src-main/core/curation/candidates.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { brief, EDITION, randomContext, state } from './helpers.ts';

const caseArb = fc.record({
  seed: fc.integer({ min: 0, max: 1_000_000 }),
  items: fc.integer({ min: 6, max: 40 }),
  size: fc.integer({ min: 2, max: 10 }),
  lambda: fc.double({ min: 0, max: 1, noNaN: true }),
  pinCount: fc.integer({ min: 0, max: 2 }),
  // The current list: a full fill, or a random list of pool items (an earlier state's outcome).
  randomList: fc.boolean(),
});

type Case = typeof caseArb extends fc.Arbitrary<infer T> ? T : never;

interface World {
  ctx: CurationContext;
  b: Brief;
  st: EditorialState;
  rel: Float64Array;
  current: Int32Array;
  rng: ReturnType<typeof seededRng>;
}

function candidatesOf(ctx: CurationContext, b: Brief, st: EditorialState, rel: Float64Array): Candidate[] {
  const pool = buildCandidatePool(ctx, b, st, EDITION);
  return Array.from(pool.items, (index) => ({ index, relevance: rel[index] as number }));
}

const onList = (slots: Int32Array) => new Set(Array.from(slots).filter((i) => i >= 0));

/** A world with no quotas or promoted bounds (no rule can force a change), and an admissible current list. */
function world(c: Case): World {
  const ctx = randomContext(c.seed, c.items, 4);
  const b = brief({ size: c.size, lambda: c.lambda });
  const rng = seededRng(c.seed + 1);
  const rel = Float64Array.from({ length: ctx.n }, () => rng.next());
  const pins = new Map<number, number>();
  for (let k = 0; k < c.pinCount; k++) {
    const item = rng.int(ctx.n);
    if (ctx.available[item] === 1 && ![...pins.values()].includes(item)) pins.set(rng.int(c.size), item);
  }
  const st = state({ pins });
  const candidates = candidatesOf(ctx, b, st, rel);
  let start: Int32Array;
  if (c.randomList) {
    start = new Int32Array(c.size).fill(-1);
    const pool = candidates.map((x) => x.index).filter((i) => ctx.available[i] === 1);
    for (let s = 0; s < c.size && pool.length > 0; s++) start[s] = pool.splice(rng.int(pool.length), 1)[0] as number;
  } else {
    start = fillShelf({ ctx, brief: b, candidates, state: st, editionDate: EDITION }).slots;
  }
  // The list the shelf holds: the stable fill of that start under the current state.
  const current = stableFill({ ctx, brief: b, candidates, state: st, editionDate: EDITION, current: start }).slots;
  return { ctx, b, st, rel, current, rng };
}

/** Items other than `self` whose membership differs between two lists. */
function othersChanged(a: Int32Array, b: Int32Array, self: number): number {
  const A = onList(a);
  const B = onList(b);
  let k = 0;
  for (const i of A) if (i !== self && !B.has(i)) k++;
  for (const i of B) if (i !== self && !A.has(i)) k++;
  return k;
}

describe('stableFill properties (issue 12)', () => {
  it('keeps a list it left exactly (a fill with nothing to change changes nothing)', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const w = world(c);
        const r = stableFill({ ctx: w.ctx, brief: w.b, candidates: candidatesOf(w.ctx, w.b, w.st, w.rel), state: w.st, editionDate: EDITION, current: w.current });
        expect(Array.from(r.slots)).toEqual(Array.from(w.current));
        expect(r.changes).toEqual({ entered: [], left: [], moved: [] });
      }),
      { numRuns: 150 },
    );
  });

  it('a pin changes the membership of at most one other item and puts its item in its slot', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const w = world(c);
        const slot = w.rng.int(c.size);
        const item = w.rng.int(w.ctx.n);
        if (w.ctx.available[item] === 0 || [...w.st.pins.values()].includes(item)) return;
        const pins = new Map(w.st.pins);
        pins.set(slot, item);
        const st = { ...w.st, pins };
        const r = stableFill({ ctx: w.ctx, brief: w.b, candidates: candidatesOf(w.ctx, w.b, st, w.rel), state: st, editionDate: EDITION, current: w.current });
        expect(r.slots[slot]).toBe(item);
        expect(othersChanged(w.current, r.slots, item)).toBeLessThanOrEqual(1);
        // The other pins stay where they are.
        for (const [s, i] of w.st.pins) if (s !== slot) expect(r.slots[s]).toBe(i);
        // Undo (the service puts the recorded list back through the fill without repairs): the exact list.
        const back = stableFill({ ctx: w.ctx, brief: w.b, candidates: candidatesOf(w.ctx, w.b, w.st, w.rel), state: w.st, editionDate: EDITION, current: w.current, repair: false });
        expect(Array.from(back.slots)).toEqual(Array.from(w.current));
      }),
      { numRuns: 200 },
    );
  });

  it('a boost or a sink changes the membership of at most one other item and moves the item only its way', () => {
    fc.assert(
      fc.property(caseArb, fc.constantFrom(0.25, 0.5, 2, 4), (c, factor) => {
        const w = world(c);
        const item = w.rng.int(w.ctx.n);
        if ([...w.st.pins.values()].includes(item)) return;
        const rel = w.rel.slice();
        rel[item] = (rel[item] as number) * factor;
        const direction = factor > 1 ? ('up' as const) : ('down' as const);
        const r = stableFill({
          ctx: w.ctx, brief: w.b, candidates: candidatesOf(w.ctx, w.b, w.st, rel), state: w.st, editionDate: EDITION,
          current: w.current, rescored: { item, direction },
        });
        expect(othersChanged(w.current, r.slots, item)).toBeLessThanOrEqual(1);
        const was = Array.from(w.current).indexOf(item);
        const now = Array.from(r.slots).indexOf(item);
        if (direction === 'down') {
          // A sink lowers the item within the shelf; it never takes it off, and never brings anything in.
          expect(now >= 0).toBe(was >= 0);
          if (was >= 0) expect(now).toBeGreaterThanOrEqual(was);
          expect(othersChanged(w.current, r.slots, item)).toBe(0);
        } else if (was >= 0) {
          expect(now).toBeLessThanOrEqual(was);
          expect(othersChanged(w.current, r.slots, item)).toBe(0);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('a ban changes exactly one item: the banned one leaves, one replacement enters its slot by MMR', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const w = world(c);
        const unpinned = Array.from(w.current).filter((i, s) => i >= 0 && !w.st.pins.has(s));
        if (unpinned.length === 0) return;
        const banned = unpinned[w.rng.int(unpinned.length)] as number;
        const slot = Array.from(w.current).indexOf(banned);
        const st = { ...w.st, bans: new Set([banned]) };
        const candidates = candidatesOf(w.ctx, w.b, st, w.rel);
        const r = stableFill({ ctx: w.ctx, brief: w.b, candidates, state: st, editionDate: EDITION, current: w.current });
        expect(onList(r.slots).has(banned)).toBe(false);
        // Every other slot keeps its item.
        for (let s = 0; s < c.size; s++) if (s !== slot) expect(r.slots[s]).toBe(w.current[s]);
        // MMR, Carbonell & Goldstein (1998) eq. 1: argmax over the pool outside the list of
        // λ·rel(D_i) − (1 − λ)·max_{D_j ∈ S} cos(D_i, D_j), S = the rest of the list; ties to the earlier candidate.
        const rest = Array.from(r.slots).filter((i, s) => s !== slot && i >= 0);
        const cos = (i: number, j: number) => {
          let x = 0;
          for (let f = 0; f < w.ctx.dim; f++) x += (w.ctx.vectors[i * w.ctx.dim + f] as number) * (w.ctx.vectors[j * w.ctx.dim + f] as number);
          return x;
        };
        let best = -1;
        let bestScore = -Infinity;
        for (const { index: i, relevance } of candidates) {
          if (rest.includes(i) || w.ctx.available[i] === 0) continue;
          const maxSim = rest.length === 0 ? 0 : Math.max(...rest.map((j) => cos(i, j)));
          const score = c.lambda * relevance - (1 - c.lambda) * maxSim;
          if (score > bestScore + 1e-12) {
            best = i;
            bestScore = score;
          }
        }
        if (best < 0) {
          expect(r.slots[slot]).toBe(-1);
          return;
        }
        // Float32 vectors: the fill's own similarity may order a near-tie the other way.
        const got = r.slots[slot] as number;
        const gotMax = rest.length === 0 ? 0 : Math.max(...rest.map((j) => cos(got, j)));
        expect(c.lambda * (w.rel[got] as number) - (1 - c.lambda) * gotMax).toBeCloseTo(bestScore, 6);
        expect(othersChanged(w.current, r.slots, banned)).toBe(1);
      }),
      { numRuns: 200 },
    );
  });
});

describe('stableFill under rules', () => {
  const quotaArb = fc.record({
    facet: fc.constantFrom('category' as const, 'supplier' as const, 'tag' as const),
    max: fc.integer({ min: 1, max: 3 }),
  });
  it('a pin changes one other item at most, besides the swaps a rule forced, each named with its rule', () => {
    fc.assert(
      fc.property(caseArb, fc.array(quotaArb, { maxLength: 2 }), fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined }), (c, quotas, maxCount) => {
        const ctx = randomContext(c.seed, c.items, 4);
        const b = brief({ size: c.size, lambda: c.lambda }, { quotas, promoted: maxCount === undefined ? {} : { maxCount } });
        const rng = seededRng(c.seed + 2);
        const rel = Float64Array.from({ length: ctx.n }, () => rng.next());
        const st = state();
        const current = fillShelf({ ctx, brief: b, candidates: candidatesOf(ctx, b, st, rel), state: st, editionDate: EDITION }).slots;
        const item = rng.int(ctx.n);
        if (ctx.available[item] === 0) return;
        const pinned = state({ pins: new Map([[rng.int(c.size), item]]) });
        const r = stableFill({ ctx, brief: b, candidates: candidatesOf(ctx, b, pinned, rel), state: pinned, editionDate: EDITION, current });
        const ruleNames = new Set(['promoted.maxCount', 'promoted.maxExposure', 'promoted.minCount', 'promoted.minExposure']);
        const forced = r.changes.left.filter((l) => l.why.split(', ').every((w) => ruleNames.has(w) || w.startsWith('quota ')));
        const unforced = r.changes.left.filter((l) => l.item !== item && !forced.includes(l));
        expect(unforced.length).toBeLessThanOrEqual(1);
        // A swap replaces the item it forced out: no more come in than went out, besides the pinned item.
        expect(r.changes.entered.filter((e) => e.item !== item).length).toBeLessThanOrEqual(forced.length + unforced.length);
      }),
      { numRuns: 200 },
    );
  });
});

describe('stableFill worked cases', () => {
  // Items 1..6 with falling relevance; one direction each, so similarity never decides.
  const setup = () => {
    const ctx = randomContext(7, 8, 4, 0, 0);
    const rel = Float64Array.from({ length: ctx.n }, (_, i) => 1 - i / 10);
    const b = brief({ size: 5, lambda: 1 });
    return { ctx, rel, b };
  };
  const cands = (ctx: CurationContext, b: Brief, st: EditorialState, rel: Float64Array) => candidatesOf(ctx, b, st, rel);

  it('a pin takes its slot, the items at and after it shift down by one and the last drops', () => {
    const { ctx, rel, b } = setup();
    const current = Int32Array.from([0, 1, 2, 3, 4]);
    const st = state({ pins: new Map([[1, 6]]) });
    const r = stableFill({ ctx, brief: b, candidates: cands(ctx, b, st, rel), state: st, editionDate: EDITION, current });
    expect(Array.from(r.slots)).toEqual([0, 6, 1, 2, 3]);
    expect(r.changes.entered).toEqual([{ item: 6, slot: 1 }]);
    expect(r.changes.left).toEqual([{ item: 4, slot: 4, why: 'pushed off the end of the shelf' }]);
    expect(r.changes.moved).toEqual([{ item: 1, from: 1, to: 2 }, { item: 2, from: 2, to: 3 }, { item: 3, from: 3, to: 4 }]);
  });

  it('a pin of an item already on the shelf moves it; the items between close up', () => {
    const { ctx, rel, b } = setup();
    const st = state({ pins: new Map([[3, 0]]) });
    const r = stableFill({ ctx, brief: b, candidates: cands(ctx, b, st, rel), state: st, editionDate: EDITION, current: Int32Array.from([0, 1, 2, 3, 4]) });
    expect(Array.from(r.slots)).toEqual([1, 2, 3, 0, 4]);
  });

  it('a sink lowers the item past the items now ranked above it and keeps it on the shelf', () => {
    const { ctx, rel, b } = setup();
    rel[1] = 0.65; // item 1 sunk below items 2 and 3 (0.8, 0.7), still above item 4 (0.6)
    const r = stableFill({
      ctx, brief: b, candidates: cands(ctx, b, state(), rel), state: state(), editionDate: EDITION,
      current: Int32Array.from([0, 1, 2, 3, 4]), rescored: { item: 1, direction: 'down' },
    });
    expect(Array.from(r.slots)).toEqual([0, 2, 3, 1, 4]);
  });

  it('a pin that breaks a quota swaps the fewest items and names the quota', () => {
    const ctx = randomContext(3, 12, 4, 0, 0);
    const rel = Float64Array.from({ length: ctx.n }, (_, i) => 1 - i / 20);
    const cat = (i: number) => ctx.facets.category.values[ctx.category[i] as number];
    // A list of 4 with at most one item of the pinned item's category besides it.
    const pinned = 11;
    const b = brief({ size: 4, lambda: 1 }, { quotas: [{ facet: 'category', max: 1, value: cat(pinned)! }] });
    const base = fillShelf({ ctx, brief: b, candidates: cands(ctx, b, state(), rel), state: state(), editionDate: EDITION }).slots;
    const st = state({ pins: new Map([[3, pinned]]) });
    const r = stableFill({ ctx, brief: b, candidates: cands(ctx, b, st, rel), state: st, editionDate: EDITION, current: base });
    const same = Array.from(r.slots).filter((i) => i >= 0 && cat(i) === cat(pinned));
    expect(same).toEqual([pinned]);
    const forced = r.changes.left.filter((l) => l.why.startsWith('quota'));
    for (const l of forced) expect(cat(l.item)).toBe(cat(pinned));
    // The base list held one item of that category at most (the quota); if the pin did not push it off,
    // exactly that one is swapped out, and nothing else changes but the pushed-off last item.
    const baseSame = Array.from(base).slice(0, 3).filter((i) => cat(i) === cat(pinned));
    expect(forced.map((l) => l.item)).toEqual(baseSame);
    expect(r.violations).toEqual([]);
    expect(r.changes.left.length).toBeLessThanOrEqual(2);
  });
});
