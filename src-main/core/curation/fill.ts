/**
 * The fill: pins stay in their slots; the free slots are filled in order 1..n by greedy MMR (mmr.ts) under
 * the brief's rules. Relevance comes in already blended, with the editor's boosts and sinks multiplied in
 * by the caller (a boost is a factor on relevance, not a rule, so the fill never sees it).
 *
 * Rules at each free slot: quotas (quota-counter.ts); promoted share bounds by count (share of the n
 * slots) and by log2-discounted exposure (share of Σ_r 1/log2(r + 1), Järvelin & Kekäläinen 2002 via
 * metrics/discount.ts); no repeats. A minimum promoted share forces a promoted pick at the slot where
 * the later free slots could no longer make it up.
 *
 * When no candidate meets every rule, rules give way in this order, one level at a time, and each
 * step is reported as a RuleViolation:
 *   1. promoted minimum (count, exposure): a floor is a target, the other rules are limits;
 *   2. quotas: variety gives way before sponsorship limits;
 *   3. promoted maximum (count, exposure): a cap on sponsored content is a promise to readers, so last;
 *   4. the slot stays empty (pool exhausted), reported as `size`.
 * Pins override filters, bans and the rest period (the editor's explicit choice) and are reported when
 * they do; a pin of an out-of-stock item is not applied (never proposed) and reported. Finally every
 * quota and bound is checked on the finished shelf, so nothing is broken without a violation.
 *
 * Cost: each candidate's max similarity to the placed items is brought up to date only when its bound
 * could change the pick (see the slot loop), so a slot costs O(pool) plus O(dim) per placed item for the
 * few candidates near the top, instead of O(pool × dim); the picks are the same as the full update's
 * (test/curation-services/fill-lazy.test.ts checks them against it).
 */
import { BugError } from '../errors.ts';
import { log2Discounts } from '../metrics/discount.ts';
import { checkBrief } from './brief-check.ts';
import type { EditorialState } from './candidates.ts';
import { compileFilters } from './candidates.ts';
import type { CurationContext } from './context.ts';
import { checkFinished, ViolationLog } from './fill-report.ts';
import { forEachPin } from './pins.ts';
import { QuotaCounter } from './quota-counter.ts';
import { promotedCountBounds } from './share-counts.ts';
import type { Brief, Candidate, FillResult } from './types.ts';

export interface FillInput {
  ctx: CurationContext;
  brief: Brief;
  /** The pool with blended relevance; ties go to the earlier candidate. */
  candidates: readonly Candidate[];
  state: EditorialState;
  /** Unix ms; used to report a pin's age-window breach. */
  editionDate: number;
}

const EPS = 1e-9;

export function fillShelf(input: FillInput): FillResult {
  const { ctx, brief, candidates, state } = input;
  checkBrief(brief);
  const n = brief.size;
  const lambda = brief.lambda;
  const promo = brief.rules.promoted;
  const disc = log2Discounts(n);
  let totalDisc = 0;
  for (let r = 0; r < n; r++) totalDisc += disc[r] as number;
  const { minCount, maxCount } = promotedCountBounds(promo, n);
  const maxExp = promo.maxExposure === undefined ? Infinity : promo.maxExposure * totalDisc + EPS;
  const minExp = promo.minExposure === undefined ? 0 : promo.minExposure * totalDisc - EPS;

  // Candidates as parallel typed arrays; an item listed twice keeps its first entry (no repeats).
  const cand = new Int32Array(candidates.length);
  const rel = new Float64Array(candidates.length);
  const slotOfCand = new Map<number, number>();
  let m = 0;
  for (const c of candidates) {
    if (!Number.isInteger(c.index) || c.index < 0 || c.index >= ctx.n) throw new BugError(`fill: candidate index ${c.index}`);
    if (!Number.isFinite(c.relevance)) throw new BugError(`fill: relevance of item ${c.index} is ${c.relevance}`);
    if (slotOfCand.has(c.index)) continue;
    slotOfCand.set(c.index, m);
    cand[m] = c.index;
    rel[m] = c.relevance;
    m++;
  }

  const log = new ViolationLog();
  const slots = new Int32Array(n).fill(-1);
  const used = new Uint8Array(m);
  // The MMR max term, kept lazily: maxSim[k] is the max similarity of candidate k to the first seen[k]
  // placed items (placed[0 .. placedCount)). It only grows as items are placed, so a stale value gives an
  // upper bound on k's score; the scan brings k up to date only when that bound could change a leader.
  const maxSim = new Float64Array(m).fill(-Infinity);
  const seen = new Int32Array(m);
  const placed = new Int32Array(n);
  const quotas = new QuotaCounter(ctx, brief.rules.quotas);
  const pinnedIds = new Set(state.pins.values());
  let promotedLeft = 0;
  for (let k = 0; k < m; k++) {
    const i = cand[k] as number;
    if (ctx.promoted[i] === 1 && ctx.available[i] === 1 && !pinnedIds.has(i)) promotedLeft++;
  }
  let placedCount = 0;
  let promCount = 0;
  let promExp = 0;
  let objective = 0;

  const place = (slot: number, item: number, gain: number): void => {
    slots[slot] = item;
    quotas.add(item);
    if (ctx.promoted[item] === 1) {
      if (!pinnedIds.has(item) && slotOfCand.has(item)) promotedLeft--;
      promCount++;
      promExp += disc[slot] as number;
    }
    objective += gain;
    placed[placedCount++] = item;
    const k = slotOfCand.get(item);
    if (k !== undefined) used[k] = 1;
  };

  // Pins first, in slot order (mmr.ts placementOrder).
  const cf = compileFilters(ctx, brief, state, input.editionDate);
  const pinnedSlots = new Set<number>();
  const pinnedItems = new Set<number>();
  forEachPin(ctx, cf, state, n, log, (slot, item, label) => {
    pinnedItems.add(item);
    for (const b of quotas.breaches(item)) log.add(b.name, `${label} is pinned beyond the limit (${b.value})`);
    const k = slotOfCand.get(item);
    const r = k === undefined ? 0 : (rel[k] as number);
    pinnedSlots.add(slot);
    place(slot, item, lambda * r - (1 - lambda) * (placedCount === 0 ? 0 : maxSimTo(ctx, item, slots)));
  });

  // Pinned and out-of-stock candidates are never proposed: drop them from every scan at once.
  for (let k = 0; k < m; k++) {
    const i = cand[k] as number;
    if (pinnedItems.has(i) || ctx.available[i] === 0) used[k] = 1;
  }

  for (let slot = 0; slot < n; slot++) {
    if (pinnedSlots.has(slot)) continue;
    let freeAfter = 0;
    let canReachLater = 0;
    // Exposure a later promoted pick could still add: the earliest later free slots, as many as the cap
    // and the promoted candidates left allow (an optimistic bound: quotas may block some of them).
    let promLeft = Math.min(maxCount - promCount, promotedLeft);
    for (let s = slot + 1; s < n; s++) {
      if (pinnedSlots.has(s)) continue;
      freeAfter++;
      if (promLeft > 0) {
        canReachLater += disc[s] as number;
        promLeft--;
      }
    }
    const mustByCount = minCount - promCount > freeAfter;
    const mustByExp = minExp - promExp > canReachLater + EPS;
    const must = mustByCount || mustByExp;
    const forbidByCount = promCount + 1 > maxCount;
    const forbidByExp = promExp + (disc[slot] as number) > maxExp;
    const forbid = forbidByCount || forbidByExp;
    // One pass keeps the best candidate at each relaxation level (0 = every rule ... 3 = no promoted cap).
    // Levels nest (each is the one below with a rule relaxed), so while scanning s0 <= s1 <= s2 <= s3.
    let b0 = -1, b1 = -1, b2 = -1, b3 = -1;
    let s0 = -Infinity, s1 = -Infinity, s2 = -Infinity, s3 = -Infinity;
    for (let k = 0; k < m; k++) {
      if (used[k] === 1) continue;
      const i = cand[k] as number;
      const isProm = ctx.promoted[i] === 1;
      const firstOk = !must || isProm;
      if (placedCount > 0 && (seen[k] as number) < placedCount) {
        // Lazy greedy: with a stale max term the score can only be lower than this bound. A candidate
        // replaces a leader only by beating it strictly (ties keep the earlier candidate), so when the
        // bound does not beat the lowest leader of a level k may join, k cannot change the outcome and
        // is skipped without its dot products; otherwise it is brought up to date. Same picks, same
        // tie-breaking as computing every max term (the lazy evaluation of Minoux 1978, "Accelerated
        // greedy algorithms for maximizing submodular set functions" — cited from memory — applied to
        // MMR's max term, which like a marginal gain can only fall as the list grows).
        // Never brought up to date (maxSim −∞): no bound (and 0·−∞ would be NaN when λ = 1).
        const bound = seen[k] === 0 ? Infinity : lambda * (rel[k] as number) - (1 - lambda) * (maxSim[k] as number);
        const floor = forbid && isProm ? s3 : firstOk ? s0 : s1;
        if (!(bound > floor)) continue;
        catchUp(ctx.vectors, ctx.dim, i, placed, seen[k] as number, placedCount, maxSim, k);
        seen[k] = placedCount;
      }
      const score = lambda * (rel[k] as number) - (1 - lambda) * (placedCount === 0 ? 0 : (maxSim[k] as number));
      if (score > s3) {
        s3 = score;
        b3 = k;
      }
      if (forbid && isProm) continue;
      if (score > s2) {
        s2 = score;
        b2 = k;
      }
      // The quota check is the dearest test, so it runs only for a candidate that would lead level 0 or 1.
      if (!(score > s1 || (firstOk && score > s0)) || !quotas.fits(i)) continue;
      if (score > s1) {
        s1 = score;
        b1 = k;
      }
      if (firstOk && score > s0) {
        s0 = score;
        b0 = k;
      }
    }
    const best = [b0, b1, b2, b3];
    const bestScore = [s0, s1, s2, s3];
    const level = best.findIndex((k) => k >= 0);
    if (level < 0) {
      log.add('size', `slot ${slot + 1} left empty: no candidate left in the pool`);
      continue;
    }
    const k = best[level] as number;
    const item = cand[k] as number;
    const label = `slot ${slot + 1}`;
    if (must && !(ctx.promoted[item] === 1)) {
      const reason = `${label}: no promoted candidate within the other rules`;
      if (mustByCount) log.add('promoted.minCount', reason);
      if (mustByExp) log.add('promoted.minExposure', reason);
    }
    if (level >= 2) {
      for (const b of quotas.breaches(item)) log.add(b.name, `${label}: no candidate within the quotas; ${b.value} goes over`);
    }
    if (level === 3 && ctx.promoted[item] === 1) {
      const reason = `${label}: only promoted candidates left`;
      if (forbidByCount) log.add('promoted.maxCount', reason);
      if (forbidByExp) log.add('promoted.maxExposure', reason);
    }
    place(slot, item, bestScore[level] as number);
  }

  checkFinished(ctx, slots, brief, quotas, log);
  return { slots, objective, violations: log.list() };
}

/**
 * maxSim[k] = max(maxSim[k], cos(placed[p], i)) for the placed items p in [from, to): candidate k (item i)
 * catches up with the items placed since it was last brought up to date.
 */
function catchUp(
  vectors: Float32Array,
  dim: number,
  i: number,
  placed: Int32Array,
  from: number,
  to: number,
  maxSim: Float64Array,
  k: number,
): void {
  const ok = i * dim;
  let best = maxSim[k] as number;
  for (let p = from; p < to; p++) {
    const oi = (placed[p] as number) * dim;
    let s = 0;
    for (let f = 0; f < dim; f++) s += (vectors[oi + f] as number) * (vectors[ok + f] as number);
    if (s > best) best = s;
  }
  maxSim[k] = best;
}

/** Max similarity of item i to the items already in slots (used for a pin outside the pool). */
function maxSimTo(ctx: CurationContext, i: number, slots: Int32Array): number {
  let best = -Infinity;
  const { vectors, dim } = ctx;
  for (const j of slots) {
    if (j < 0) continue;
    let s = 0;
    for (let f = 0; f < dim; f++) s += (vectors[i * dim + f] as number) * (vectors[j * dim + f] as number);
    if (s > best) best = s;
  }
  return best;
}
