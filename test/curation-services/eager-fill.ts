/**
 * The slow reference for the fill: the greedy MMR fill as it was before the lazy max term (the version of
 * src-main/core/curation/fill.ts that raised every candidate's max similarity after each placement, a full
 * pool × dim pass per slot). Kept verbatim apart from import paths and its name, so the fast fill can be
 * checked to pick the same items, in the same order, with the same objective and violations.
 */
import { BugError, InputError } from '../../src-main/core/errors.ts';
import { log2Discounts } from '../../src-main/core/metrics/discount.ts';
import { checkBrief } from '../../src-main/core/curation/brief-check.ts';
import type { EditorialState } from '../../src-main/core/curation/candidates.ts';
import { compileFilters, exclusionReasons } from '../../src-main/core/curation/candidates.ts';
import type { CurationContext } from '../../src-main/core/curation/context.ts';
import { checkFinished, ViolationLog } from '../../src-main/core/curation/fill-report.ts';
import { QuotaCounter } from '../../src-main/core/curation/quota-counter.ts';
import type { Brief, Candidate, FillResult } from '../../src-main/core/curation/types.ts';

interface FillInput {
  ctx: CurationContext;
  brief: Brief;
  /** The pool with blended relevance; ties go to the earlier candidate. */
  candidates: readonly Candidate[];
  state: EditorialState;
  /** Unix ms; used to report a pin's age-window breach. */
  editionDate: number;
}

const EPS = 1e-9;

export function fillShelfEager(input: FillInput): FillResult {
  const { ctx, brief, candidates, state } = input;
  checkBrief(brief);
  const n = brief.size;
  const lambda = brief.lambda;
  const promo = brief.rules.promoted;
  const disc = log2Discounts(n);
  let totalDisc = 0;
  for (let r = 0; r < n; r++) totalDisc += disc[r] as number;
  const maxCount = promo.maxCount === undefined ? n : Math.floor(promo.maxCount * n + EPS);
  const minCount = promo.minCount === undefined ? 0 : Math.ceil(promo.minCount * n - EPS);
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
  const maxSim = new Float64Array(m).fill(-Infinity);
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
    placedCount++;
    raiseMaxSim(ctx.vectors, ctx.dim, item, cand, m, used, maxSim);
    const k = slotOfCand.get(item);
    if (k !== undefined) used[k] = 1;
  };

  // Pins first, in slot order (mmr.ts placementOrder).
  const cf = compileFilters(ctx, brief, state, input.editionDate);
  const pinnedSlots = new Set<number>();
  const pinnedItems = new Set<number>();
  for (const [slot, item] of [...state.pins].sort((a, b) => a[0] - b[0])) {
    if (!Number.isInteger(slot) || slot < 0 || slot >= n) {
      throw new InputError(`pin: slot ${slot + 1} is outside the shelf of ${n} slots`, { column: 'pins' });
    }
    if (!Number.isInteger(item) || item < 0 || item >= ctx.n) throw new BugError(`fill: pinned item index ${item}`);
    if (pinnedItems.has(item)) {
      throw new InputError(`pin: item ${ctx.externalIds[item]} is pinned to two slots`, { column: 'pins' });
    }
    pinnedItems.add(item);
    const label = `slot ${slot + 1}: item ${ctx.externalIds[item]}`;
    const why = exclusionReasons(ctx, cf, state, item);
    if (why[0] === 'outOfStock') {
      log.add('pin', `${label} is out of stock; the pin is not applied`);
      continue;
    }
    if (why.length > 0) log.add('pin', `${label} is kept by its pin although it breaks: ${why.join(', ')}`);
    for (const b of quotas.breaches(item)) log.add(b.name, `${label} is pinned beyond the limit (${b.value})`);
    const k = slotOfCand.get(item);
    const r = k === undefined ? 0 : (rel[k] as number);
    pinnedSlots.add(slot);
    place(slot, item, lambda * r - (1 - lambda) * (placedCount === 0 ? 0 : maxSimTo(ctx, item, slots)));
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
    let b0 = -1, b1 = -1, b2 = -1, b3 = -1;
    let s0 = -Infinity, s1 = -Infinity, s2 = -Infinity, s3 = -Infinity;
    for (let k = 0; k < m; k++) {
      if (used[k] === 1) continue;
      const i = cand[k] as number;
      if (pinnedItems.has(i) || ctx.available[i] === 0) continue; // out of stock: never proposed
      const score = lambda * (rel[k] as number) - (1 - lambda) * (placedCount === 0 ? 0 : (maxSim[k] as number));
      if (score > s3) {
        s3 = score;
        b3 = k;
      }
      const isProm = ctx.promoted[i] === 1;
      if (forbid && isProm) continue;
      if (score > s2) {
        s2 = score;
        b2 = k;
      }
      const firstOk = !must || isProm;
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

/** maxSim[k] = max(maxSim[k], cos(item, cand[k])) for every unused candidate: the MMR max term, kept up to date. */
function raiseMaxSim(
  vectors: Float32Array,
  dim: number,
  item: number,
  cand: Int32Array,
  m: number,
  used: Uint8Array,
  maxSim: Float64Array,
): void {
  const oi = item * dim;
  for (let k = 0; k < m; k++) {
    if (used[k] === 1) continue;
    const ok = (cand[k] as number) * dim;
    let s = 0;
    for (let f = 0; f < dim; f++) s += (vectors[oi + f] as number) * (vectors[ok + f] as number);
    if (s > (maxSim[k] as number)) maxSim[k] = s;
  }
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
