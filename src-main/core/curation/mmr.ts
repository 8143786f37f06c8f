/**
 * Maximal Marginal Relevance, Carbonell & Goldstein (1998), eq. 1:
 *   MMR = argmax_{D_i ∈ R \ S} [ λ·Sim1(D_i, Q) − (1 − λ)·max_{D_j ∈ S} Sim2(D_i, D_j) ]
 * Here Sim1 is the blended relevance of the pool (boosts and sinks already applied by the caller) and
 * Sim2 the cosine of item vectors. With S empty the max term is absent (taken as 0), so the first pick
 * is the most relevant item.
 *
 * The objective of a full list is the sum of the MMR increments as placed: pinned slots first (in slot
 * order), then the free slots 1..n in order, each item scored against everything placed before it. The
 * greedy fill maximises each increment in turn; `mmrObjective` scores any list the same way, so a
 * brute-force search can check the greedy fill against the best list.
 */
import type { CurationContext } from './context.ts';
import { similarity } from './context.ts';

/** The placement order the objective uses: pinned slots ascending, then the others ascending. */
export function placementOrder(size: number, pinnedSlots: ReadonlySet<number>): number[] {
  const order: number[] = [];
  for (let s = 0; s < size; s++) if (pinnedSlots.has(s)) order.push(s);
  for (let s = 0; s < size; s++) if (!pinnedSlots.has(s)) order.push(s);
  return order;
}

/**
 * Σ over placed slots of λ·rel(i) − (1 − λ)·max_{j placed earlier} sim(i, j). `relevance` is indexed by
 * dense item index; NaN (an item outside the scored pool) counts as 0. Empty slots (-1) add nothing.
 */
export function mmrObjective(
  ctx: CurationContext,
  slots: Int32Array,
  relevance: Float64Array,
  lambda: number,
  pinnedSlots: ReadonlySet<number> = new Set(),
): number {
  const placed: number[] = [];
  let total = 0;
  for (const s of placementOrder(slots.length, pinnedSlots)) {
    const i = slots[s] as number;
    if (i < 0) continue;
    const rel = relevance[i] as number;
    let maxSim = -Infinity;
    for (const j of placed) {
      const sim = similarity(ctx, i, j);
      if (sim > maxSim) maxSim = sim;
    }
    total += lambda * (Number.isNaN(rel) ? 0 : rel) - (1 - lambda) * (placed.length === 0 ? 0 : maxSim);
    placed.push(i);
  }
  return total;
}
