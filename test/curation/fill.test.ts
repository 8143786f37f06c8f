import { describe, expect, it } from 'vitest';
import type { CurationContext } from '../../src-main/core/curation/context.ts';
import { fillShelf } from '../../src-main/core/curation/fill.ts';
import { mmrObjective } from '../../src-main/core/curation/mmr.ts';
import type { Candidate } from '../../src-main/core/curation/types.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import { brief, context, EDITION, item, randomContext, state } from './helpers.ts';

function relevanceArray(ctx: CurationContext, cands: Candidate[]): Float64Array {
  const r = new Float64Array(ctx.n).fill(NaN);
  for (const c of cands) r[c.index] = c.relevance;
  return r;
}

/** Every ordered choice of `size` distinct candidates; the best mmrObjective (slow reference). */
function bruteForceBest(ctx: CurationContext, cands: Candidate[], size: number, lambda: number): number {
  const rel = relevanceArray(ctx, cands);
  const slots = new Int32Array(size);
  const used = new Uint8Array(cands.length);
  let best = -Infinity;
  const go = (s: number): void => {
    if (s === size) {
      best = Math.max(best, mmrObjective(ctx, slots, rel, lambda));
      return;
    }
    for (let k = 0; k < cands.length; k++) {
      if (used[k]) continue;
      used[k] = 1;
      slots[s] = (cands[k] as Candidate).index;
      go(s + 1);
      used[k] = 0;
    }
  };
  go(0);
  return best;
}

describe('fillShelf: MMR', () => {
  it('follows a hand-worked MMR example', () => {
    // MMR, Carbonell & Goldstein (1998), eq. 1: argmax λ·Sim1(D_i, Q) − (1 − λ)·max_{D_j ∈ S} Sim2(D_i, D_j).
    // Worked by hand, λ = 0.5, unit vectors A = (1, 0), B = (0.8, 0.6), C = (0, 1), D = (0.6, 0.8);
    // relevance A 0.9, B 0.8, C 0.6, D 0.5. Cosines: AB 0.8, AC 0, AD 0.6, BC 0.6, BD 0.96, CD 0.8.
    //   slot 1, S = {}: 0.5·rel → A 0.45, B 0.40, C 0.30, D 0.25 → A (gain 0.45)
    //   slot 2, S = {A}: B 0.40 − 0.5·0.8 = 0.00; C 0.30 − 0 = 0.30; D 0.25 − 0.30 = −0.05 → C (0.30)
    //   slot 3, S = {A, C}: B 0.40 − 0.5·0.8 = 0.00; D 0.25 − 0.5·0.8 = −0.15 → B (0.00)
    //   slot 4, S = {A, C, B}: D 0.25 − 0.5·0.96 = −0.23 → D
    // Order A, C, B, D; objective 0.45 + 0.30 + 0.00 − 0.23 = 0.52. Relevance alone (λ = 1) gives A, B, C, D.
    const ctx = context([item(1), item(2), item(3), item(4)], [[1, 0], [0.8, 0.6], [0, 1], [0.6, 0.8]]);
    const cands = [0.9, 0.8, 0.6, 0.5].map((relevance, index) => ({ index, relevance }));
    const half = fillShelf({ ctx, brief: brief({ lambda: 0.5 }), candidates: cands, state: state(), editionDate: EDITION });
    expect(Array.from(half.slots)).toEqual([0, 2, 1, 3]);
    expect(half.objective).toBeCloseTo(0.52, 6);
    expect(half.violations).toEqual([]);
    const relOnly = fillShelf({ ctx, brief: brief({ lambda: 1 }), candidates: cands, state: state(), editionDate: EDITION });
    expect(Array.from(relOnly.slots)).toEqual([0, 1, 2, 3]);
  });

  it('reports its objective as mmrObjective of the list it built', () => {
    const ctx = randomContext(7, 60, 8);
    const rng = seededRng(3);
    const cands = Array.from({ length: 60 }, (_, index) => ({ index, relevance: rng.next() }));
    const res = fillShelf({ ctx, brief: brief({ size: 10, lambda: 0.6 }), candidates: cands, state: state(), editionDate: EDITION });
    expect(res.objective).toBeCloseTo(mmrObjective(ctx, res.slots, relevanceArray(ctx, cands), 0.6), 9);
    // With pins: they are placed first (slot order), then the free slots, as mmr.ts defines the objective.
    const available = cands.filter((c) => ctx.available[c.index] === 1);
    const pins = new Map([
      [4, available[10]!.index],
      [1, available[20]!.index],
    ]);
    const pinned = fillShelf({
      ctx,
      brief: brief({ size: 10, lambda: 0.6 }),
      candidates: available,
      state: state({ pins }),
      editionDate: EDITION,
    });
    expect(pinned.slots[4]).toBe(available[10]!.index);
    expect(pinned.slots[1]).toBe(available[20]!.index);
    const objective = mmrObjective(ctx, pinned.slots, relevanceArray(ctx, cands), 0.6, new Set([1, 4]));
    expect(pinned.objective).toBeCloseTo(objective, 9);
  });

  it('stays close to the brute-force optimum of its own objective (200 seeded cases, 8 candidates, 4 slots)', () => {
    const rng = seededRng(2026);
    const ratios: number[] = [];
    const gaps: number[] = [];
    for (let t = 0; t < 200; t++) {
      const ctx = randomContext(1000 + t, 8, 3, 0, 0);
      const lambda = 0.3 + 0.7 * rng.next();
      const cands = Array.from({ length: 8 }, (_, index) => ({ index, relevance: rng.next() }));
      const greedy = fillShelf({ ctx, brief: brief({ size: 4, lambda }), candidates: cands, state: state(), editionDate: EDITION });
      const best = bruteForceBest(ctx, cands, 4, lambda);
      expect(greedy.objective).toBeLessThanOrEqual(best + 1e-9);
      // Ratios need a non-negative scale. Writing the penalty as a distance, λ·rel + (1 − λ)(1 − max sim)
      // for every slot after the first, adds the same constant (1 − λ)(n − 1) to every full list: same
      // optimum, and never negative here because the test vectors are non-negative (cosine in [0, 1]).
      const shift = (1 - lambda) * 3;
      ratios.push((greedy.objective + shift) / (best + shift));
      gaps.push(best - greedy.objective);
    }
    const mean = ratios.reduce((a, b) => a + b, 0) / ratios.length;
    const worst = Math.min(...ratios);
    const optimal = gaps.filter((g) => g < 1e-12).length;
    console.log(
      `greedy MMR vs brute-force optimum, ${ratios.length} cases: ratio mean ${mean.toFixed(4)}, worst ${worst.toFixed(4)}; ` +
        `greedy optimal in ${optimal}; largest absolute gap ${Math.max(...gaps).toFixed(4)}`,
    );
    // Observed at these seeds: see the line printed above (mean 0.9638, worst 0.7210, optimal in 23 of
    // 200: the first pick escapes the penalty, and greedy spends it on relevance rather than on the most
    // crowded item). Greedy MMR
    // has no proven approximation ratio for this objective, so the bounds are observations with a margin.
    expect(mean).toBeGreaterThan(0.94);
    expect(worst).toBeGreaterThan(0.65);
  });

  it('is optimal when λ = 1 (relevance only: the best list is the n most relevant in order)', () => {
    const rng = seededRng(99);
    for (let t = 0; t < 50; t++) {
      const ctx = randomContext(5000 + t, 8, 3, 0, 0);
      const cands = Array.from({ length: 8 }, (_, index) => ({ index, relevance: rng.next() }));
      const greedy = fillShelf({ ctx, brief: brief({ size: 4, lambda: 1 }), candidates: cands, state: state(), editionDate: EDITION });
      expect(greedy.objective).toBeCloseTo(bruteForceBest(ctx, cands, 4, 1), 12);
    }
  });
});
