/**
 * The stable fill (DESIGN.md "Data flow": an editor's action changes the list as little as it can; only
 * "Refill" starts over). It takes the shelf's current list and keeps it, changing only what a rule or the
 * editor forces:
 *   - an item no longer admissible (banned, filtered out, out of stock, on another shelf) leaves, and
 *     its slot stays open for one replacement;
 *   - a pin puts its item into its slot; the unpinned items keep their order over the free slots, so the
 *     ones at and after the slot shift down by one and, on a full shelf, the last unpinned one drops;
 *   - a boost or sink (`rescored`) moves the item up or down among the unpinned items by its new score
 *     (a boosted item not on the shelf enters where it ranks, and the last unpinned item drops);
 *   - open slots are filled one by one with the candidate that breaks the rules least, ties by the MMR
 *     increment against the rest of the list (Carbonell & Goldstein 1998, eq. 1, as in fill.ts);
 *   - then, while a quota or promoted bound is broken, the single swap of an unpinned item that lowers
 *     the breach most is made (fewest items changed), each reported with the rule that forced it.
 * What the list gives up against a full fill is measured by the caller (the meter's predicted relevance).
 */
import { BugError } from '../errors.ts';
import { log2Discounts } from '../metrics/discount.ts';
import { checkBrief } from './brief-check.ts';
import { compileFilters, exclusionReasons } from './candidates.ts';
import type { CurationContext } from './context.ts';
import { similarity } from './context.ts';
import type { FillInput } from './fill.ts';
import { checkFinished, ViolationLog } from './fill-report.ts';
import { mmrObjective } from './mmr.ts';
import { forEachPin } from './pins.ts';
import { QuotaCounter, quotaName } from './quota-counter.ts';
import { promotedCountBounds } from './share-counts.ts';
import type { Brief, FillResult } from './types.ts';

export interface StableFillInput extends FillInput {
  /** The shelf's current list: dense item per slot (-1 = empty), as last filled. Any length. */
  current: Int32Array;
  /** The item whose score the editor just raised ('up', a boost) or lowered ('down', a sink). */
  rescored?: { item: number; direction: 'up' | 'down' };
  /** Swap items to mend a broken quota or promoted bound (default true; undo restores without it). */
  repair?: boolean;
}

/** What one fill changed against the current list; slots are 0-based. */
export interface ListChanges {
  entered: { item: number; slot: number }[];
  /** `why`: the rule or edit that forced the item out. */
  left: { item: number; slot: number; why: string }[];
  moved: { item: number; from: number; to: number }[];
}

export interface StableFillResult extends FillResult {
  changes: ListChanges;
}

const EPS = 1e-9;

/** How the fill counts a list's breaches: weights follow fill.ts's give-way order (caps last to go). */
interface Breach {
  score: number;
  /** Each broken rule and by how much (items, or discounted exposure). */
  rules: Map<string, number>;
}

export function stableFill(input: StableFillInput): StableFillResult {
  const { ctx, brief, candidates, state, current } = input;
  checkBrief(brief);
  const n = brief.size;
  const lambda = brief.lambda;

  // Relevance by dense index (NaN = not in the pool) and the pool in the caller's order (ties: earlier).
  const rel = new Float64Array(ctx.n).fill(NaN);
  const order: number[] = [];
  for (const c of candidates) {
    if (!Number.isInteger(c.index) || c.index < 0 || c.index >= ctx.n) throw new BugError(`fill: candidate index ${c.index}`);
    if (!Number.isFinite(c.relevance)) throw new BugError(`fill: relevance of item ${c.index} is ${c.relevance}`);
    if (!Number.isNaN(rel[c.index] as number)) continue;
    rel[c.index] = c.relevance;
    order.push(c.index);
  }
  const admissible = (i: number) => !Number.isNaN(rel[i] as number) && ctx.available[i] === 1;
  const relOf = (i: number) => (Number.isNaN(rel[i] as number) ? 0 : (rel[i] as number));

  const log = new ViolationLog();
  const cf = compileFilters(ctx, brief, state, input.editionDate);
  const pins = new Map<number, number>();
  forEachPin(ctx, cf, state, n, log, (slot, item) => pins.set(slot, item));
  const pinnedItems = new Set(pins.values());

  // The unpinned items of the current list in order; -1 marks a slot opened by an item that must leave.
  const slotBefore = new Map<number, number>();
  const leftWhy = new Map<number, string>();
  const seq: number[] = [];
  for (let s = 0; s < current.length; s++) {
    const i = current[s] as number;
    if (i >= 0 && !slotBefore.has(i)) slotBefore.set(i, s);
    if (i >= 0 && pinnedItems.has(i)) continue;
    if (i < 0 || slotBefore.get(i) !== s) {
      seq.push(-1);
      continue;
    }
    if (!admissible(i)) {
      leftWhy.set(i, exclusionReasons(ctx, cf, state, i)[0] ?? 'not in the pool');
      seq.push(-1);
      continue;
    }
    seq.push(i);
  }

  const r = input.rescored;
  if (r && !pinnedItems.has(r.item) && admissible(r.item)) {
    const b = r.item;
    const rb = rel[b] as number;
    const at = seq.indexOf(b);
    if (at >= 0) {
      seq.splice(at, 1);
      let to = at;
      if (r.direction === 'up') {
        for (let p = 0; p < at; p++) {
          const j = seq[p] as number;
          if (j >= 0 && (rel[j] as number) < rb) {
            to = p;
            break;
          }
        }
      } else {
        for (let p = seq.length - 1; p >= at; p--) {
          const j = seq[p] as number;
          if (j >= 0 && (rel[j] as number) > rb) {
            to = p + 1;
            break;
          }
        }
      }
      seq.splice(to, 0, b);
    } else if (r.direction === 'up') {
      const to = seq.findIndex((j) => j >= 0 && (rel[j] as number) < rb);
      if (to >= 0) seq.splice(to, 0, b);
    }
  }

  // Lay the sequence over the free slots: a surplus closes open slots first (last first), then drops
  // the last unpinned items; a shortfall leaves the last slots open.
  const free: number[] = [];
  for (let s = 0; s < n; s++) if (!pins.has(s)) free.push(s);
  while (seq.length > free.length) {
    const hole = seq.lastIndexOf(-1);
    if (hole >= 0) seq.splice(hole, 1);
    else leftWhy.set(seq.pop() as number, 'pushed off the end of the shelf');
  }
  const slots = new Int32Array(n).fill(-1);
  for (const [s, i] of pins) slots[s] = i;
  free.forEach((s, k) => {
    slots[s] = k < seq.length ? (seq[k] as number) : -1;
  });

  const rules = ruleBook(ctx, brief);
  const onList = new Set<number>();
  for (const i of slots) if (i >= 0) onList.add(i);
  const mmrAt = (s: number, c: number): number => {
    let maxSim = -Infinity;
    for (let t = 0; t < n; t++) {
      const j = slots[t] as number;
      if (t === s || j < 0) continue;
      const sim = similarity(ctx, c, j);
      if (sim > maxSim) maxSim = sim;
    }
    return lambda * relOf(c) - (1 - lambda) * (maxSim === -Infinity ? 0 : maxSim);
  };
  /** The best candidate off the list for slot s: least breach, then best MMR increment. */
  const bestFor = (s: number): { item: number; breach: Breach } | null => {
    const keep = slots[s] as number;
    let best = -1;
    let bestBreach: Breach | null = null;
    let bestScore = -Infinity;
    for (const c of order) {
      if (onList.has(c) || pinnedItems.has(c) || ctx.available[c] === 0) continue;
      slots[s] = c;
      const b = rules(slots);
      if (bestBreach !== null && b.score > bestBreach.score + EPS) continue;
      const score = mmrAt(s, c);
      if (bestBreach === null || b.score < bestBreach.score - EPS || score > bestScore) {
        best = c;
        bestBreach = b;
        bestScore = score;
      }
    }
    slots[s] = keep;
    return best < 0 || bestBreach === null ? null : { item: best, breach: bestBreach };
  };

  for (const s of free) {
    if ((slots[s] as number) >= 0) continue;
    const pick = bestFor(s);
    if (!pick) {
      log.add('size', `slot ${s + 1} left empty: no candidate left in the pool`);
      continue;
    }
    slots[s] = pick.item;
    onList.add(pick.item);
  }

  if (input.repair ?? true) {
    // Swaps while a rule is broken: each time the single swap that lowers the breach most, the victim
    // being the least relevant unpinned item among equals. At most n swaps.
    for (let round = 0; round < n; round++) {
      const now = rules(slots);
      if (now.score <= EPS) break;
      // Only an item whose leaving lowers the breach (a cap or quota it counts toward), or an organic item
      // when a promoted floor is short, can be the one to swap: the others cannot mend anything.
      const floorShort = now.rules.has('promoted.minCount') || now.rules.has('promoted.minExposure');
      const victims = free.filter((s) => {
        const i = slots[s] as number;
        if (i < 0 || i === r?.item) return false;
        if (floorShort && ctx.promoted[i] !== 1) return true;
        slots[s] = -1;
        const lower = rules(slots).score < now.score - EPS;
        slots[s] = i;
        return lower;
      });
      victims.sort((a, b) => relOf(slots[a] as number) - relOf(slots[b] as number) || a - b);
      let swap: { slot: number; item: number; breach: Breach } | null = null;
      for (const s of victims) {
        const out = slots[s] as number;
        onList.delete(out);
        const pick = bestFor(s);
        onList.add(out);
        if (pick && pick.breach.score < now.score - EPS && (!swap || pick.breach.score < swap.breach.score - EPS)) {
          swap = { slot: s, ...pick };
        }
      }
      if (!swap) break;
      const out = slots[swap.slot] as number;
      // The rules the swap mended, wholly or in part.
      const fixed = [...now.rules].filter(([rule, amount]) => (swap.breach.rules.get(rule) ?? 0) < amount - EPS).map(([rule]) => rule);
      leftWhy.set(out, fixed.length > 0 ? fixed.join(', ') : 'rules');
      onList.delete(out);
      onList.add(swap.item);
      slots[swap.slot] = swap.item;
    }
  }

  const quotas = new QuotaCounter(ctx, brief.rules.quotas);
  for (const i of slots) if (i >= 0) quotas.add(i);
  checkFinished(ctx, slots, brief, quotas, log);
  const pinnedSlots = new Set(pins.keys());
  return { slots, objective: mmrObjective(ctx, slots, rel, lambda, pinnedSlots), violations: log.list(), changes: listChanges(current, slots, leftWhy) };
}

/** Entered, left and moved items between two lists (dense items per slot, -1 empty). */
export function listChanges(before: Int32Array, after: Int32Array, why: ReadonlyMap<number, string> = new Map()): ListChanges {
  const at = new Map<number, number>();
  before.forEach((i, s) => {
    if (i >= 0 && !at.has(i)) at.set(i, s);
  });
  const now = new Map<number, number>();
  after.forEach((i, s) => {
    if (i >= 0 && !now.has(i)) now.set(i, s);
  });
  const out: ListChanges = { entered: [], left: [], moved: [] };
  for (const [i, s] of now) {
    const from = at.get(i);
    if (from === undefined) out.entered.push({ item: i, slot: s });
    else if (from !== s) out.moved.push({ item: i, from, to: s });
  }
  for (const [i, s] of at) if (!now.has(i)) out.left.push({ item: i, slot: s, why: why.get(i) ?? 'replaced' });
  return out;
}

/**
 * The breach of a list: quota excess (items over each limit), promoted count and exposure out of bounds,
 * weighted 4 (promoted caps), 2 (quotas), 1 (promoted floors) so the fill gives way in fill.ts's order.
 * Bounds as fill.ts turns them into counts and log2-discounted exposure over the n slots.
 */
function ruleBook(ctx: CurationContext, brief: Brief): (slots: Int32Array) => Breach {
  const n = brief.size;
  const promo = brief.rules.promoted;
  const disc = log2Discounts(n);
  let totalDisc = 0;
  for (let s = 0; s < n; s++) totalDisc += disc[s] as number;
  const { minCount, maxCount } = promotedCountBounds(promo, n);
  const maxExp = promo.maxExposure === undefined ? Infinity : promo.maxExposure * totalDisc;
  const minExp = promo.minExposure === undefined ? 0 : promo.minExposure * totalDisc;
  const quotas = brief.rules.quotas.map((q) => ({
    q,
    name: quotaName(q),
    code: q.value === undefined ? -1 : (ctx.facets[q.facet].code.get(q.value) ?? -2),
  }));
  const counts = new Map<number, number>();
  return (slots) => {
    const rules = new Map<string, number>();
    let score = 0;
    let prom = 0;
    let exp = 0;
    for (let s = 0; s < slots.length; s++) {
      const i = slots[s] as number;
      if (i >= 0 && ctx.promoted[i] === 1) {
        prom++;
        exp += disc[s] as number;
      }
    }
    const over = (rule: string, amount: number, weight: number) => {
      if (amount > EPS) {
        rules.set(rule, amount);
        score += weight * amount;
      }
    };
    over('promoted.maxCount', prom - maxCount, 4);
    over('promoted.maxExposure', exp - maxExp, 4);
    over('promoted.minCount', minCount - prom, 1);
    over('promoted.minExposure', minExp - exp, 1);
    for (const { q, name, code } of quotas) {
      if (code === -2) continue;
      counts.clear();
      for (const i of slots) {
        if (i < 0) continue;
        if (q.facet === 'tag') {
          for (let p = ctx.tagPtr[i] as number, end = ctx.tagPtr[i + 1] as number; p < end; p++) {
            const c = ctx.tagCodes[p] as number;
            if (code === -1 || code === c) counts.set(c, (counts.get(c) ?? 0) + 1);
          }
        } else {
          const c = (q.facet === 'category' ? ctx.category[i] : ctx.supplier[i]) as number;
          if (code === -1 || code === c) counts.set(c, (counts.get(c) ?? 0) + 1);
        }
      }
      let excess = 0;
      for (const k of counts.values()) if (k > q.max) excess += k - q.max;
      over(name, excess, 2);
    }
    return { score, rules };
  };
}
