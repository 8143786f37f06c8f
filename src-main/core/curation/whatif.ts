/**
 * What-if (DESIGN.md): the change a candidate would make to every meter reading if placed in a slot
 * (replacing whatever is there). The batch form serves the pool column of the editor's screen: many
 * candidates, one slot. It computes the shelf's sums once without the slot (pairwise similarity sum,
 * sorted ages, category counts, ...) and then adds each candidate in O(slots × dim), instead of a full
 * meter (O(slots² × dim)) per candidate. test/curation/whatif.test.ts checks it against full meters.
 */
import { BugError } from '../errors.ts';
import { log2Discounts } from '../metrics/discount.ts';
import { CALIBRATION_ALPHA } from '../stats/kl.ts';
import { medianOfSorted } from '../stats/summary.ts';
import { DAY_MS } from '../types.ts';
import { costOf } from './choice-cost.ts';
import type { CurationContext } from './context.ts';
import type { MeterInputs } from './meter.ts';
import { CALIBRATION_GAP_CEILING, meterShelf, SATURATION_THRESHOLD, scaledNovelty, YOUNG_DAYS } from './meter.ts';
import type { ShelfMeter, ShelfReadings, WhatIf, WhatIfReading } from './types.ts';
import { WHAT_IF_READINGS } from './types.ts';

export interface WhatIfBatch {
  slot: number;
  candidates: Int32Array;
  before: ShelfReadings;
  /** Per reading, one value per candidate (same order as `candidates`). */
  after: Record<WhatIfReading, Float64Array>;
  delta: Record<WhatIfReading, Float64Array>;
}

/** A full ShelfMeter as flat readings, with `slot` naming the slot whose saturation is reported. */
export function flatReadings(m: ShelfMeter, slot: number): ShelfReadings {
  return {
    intraListDistance: m.intraListDistance,
    ageMedianDays: m.age.medianDays,
    ageMeanDays: m.age.meanDays,
    ageNewestDays: m.age.newestDays,
    ageOldestDays: m.age.oldestDays,
    ageShareUnder30Days: m.age.shareUnder30Days,
    novelty: m.novelty,
    promotedShareCount: m.promotedShareCount,
    promotedShareExposure: m.promotedShareExposure,
    calibrationGap: m.calibrationGap,
    predictedRelevance: m.predictedRelevance,
    choiceCost: m.choiceCost,
    slotSaturation: m.saturation[slot] ?? NaN,
    saturatedSlotCount: m.saturatedSlots.length,
  };
}

function dot(v: Float32Array, dim: number, a: number, b: number): number {
  let s = 0;
  const oa = a * dim;
  const ob = b * dim;
  for (let f = 0; f < dim; f++) s += (v[oa + f] as number) * (v[ob + f] as number);
  return s;
}

export function whatIfBatch(
  ctx: CurationContext,
  slots: Int32Array,
  slot: number,
  candidates: Int32Array,
  inputs: MeterInputs,
): WhatIfBatch {
  if (!Number.isInteger(slot) || slot < 0 || slot >= slots.length) throw new BugError(`what-if: slot ${slot} outside the shelf`);
  const before = flatReadings(meterShelf(ctx, slots, inputs), slot);
  const threshold = inputs.saturationThreshold ?? SATURATION_THRESHOLD;
  const { vectors, dim } = ctx;
  const disc = log2Discounts(slots.length);

  // The shelf without `slot`.
  const others: number[] = [];
  for (let s = 0; s < slots.length; s++) if (s !== slot && (slots[s] as number) >= 0) others.push(slots[s] as number);
  const k1 = others.length + 1;
  let simPairs = 0;
  for (let a = 0; a < others.length; a++) {
    for (let b = a + 1; b < others.length; b++) simPairs += dot(vectors, dim, others[a] as number, others[b] as number);
  }
  const ages: number[] = [];
  let ageSum = 0;
  let young = 0;
  let info = 0;
  let relSum = 0;
  let relCount = 0;
  let prom = 0;
  let promExp = 0;
  let expAll = 0;
  let saturated = 0;
  const catCounts = new Float64Array(ctx.facets.category.values.length);
  for (let s = 0; s < slots.length; s++) {
    const i = slots[s] as number;
    if (s === slot || i < 0) continue;
    const added = ctx.addedAt[i] as number;
    if (!Number.isNaN(added)) {
      const d = (inputs.editionDate - added) / DAY_MS;
      ages.push(d);
      ageSum += d;
      if (d < YOUNG_DAYS) young++;
    }
    info += ctx.selfInformation[i] as number;
    const r = inputs.relevance[i] as number;
    if (!Number.isNaN(r)) {
      relSum += r;
      relCount++;
    }
    expAll += disc[s] as number;
    if (ctx.promoted[i] === 1) {
      prom++;
      promExp += disc[s] as number;
    }
    if ((inputs.ownedShare[i] as number) > threshold) saturated++;
    const c = ctx.category[i] as number;
    catCounts[c] = (catCounts[c] as number) + 1;
  }
  const sortedAges = Float64Array.from(ages).sort();
  const nAges = sortedAges.length;
  const minAge = nAges > 0 ? (sortedAges[0] as number) : NaN;
  const maxAge = nAges > 0 ? (sortedAges[nAges - 1] as number) : NaN;
  const expWith = expAll + (disc[slot] as number);

  // Calibration, Steck (2018): KL(p‖q̃) over categories, q = counts / k1 after the candidate is added.
  // Only the candidate's category term changes, so the other terms are summed once.
  const p = inputs.audienceCategories;
  let pSum = 0;
  for (let g = 0; g < p.length; g++) pSum += p[g] as number;
  const alpha = CALIBRATION_ALPHA;
  const term = (g: number, count: number): number => {
    const pg = (p[g] as number) / pSum;
    return pg <= 0 ? 0 : pg * Math.log(pg / ((1 - alpha) * (count / k1) + alpha * pg));
  };
  const baseTerms = new Float64Array(p.length);
  let klBase = 0;
  if (pSum > 0) {
    for (let g = 0; g < p.length; g++) {
      baseTerms[g] = term(g, catCounts[g] as number);
      klBase += baseTerms[g] as number;
    }
  }

  const m = candidates.length;
  const after = {} as Record<WhatIfReading, Float64Array>;
  const delta = {} as Record<WhatIfReading, Float64Array>;
  for (const r of WHAT_IF_READINGS) {
    after[r] = new Float64Array(m);
    delta[r] = new Float64Array(m);
  }
  const pairs = (k1 * (k1 - 1)) / 2;
  for (let k = 0; k < m; k++) {
    const c = candidates[k] as number;
    if (!Number.isInteger(c) || c < 0 || c >= ctx.n) throw new BugError(`what-if: candidate index ${c}`);
    let simC = 0;
    for (let o = 0; o < others.length; o++) simC += dot(vectors, dim, c, others[o] as number);
    // Variety: the intra-list distance halved onto [0, 1], as meter.ts `variety`.
    after.intraListDistance[k] = pairs === 0 ? NaN : (1 - (simPairs + simC) / pairs) / 2;

    const added = ctx.addedAt[c] as number;
    if (Number.isNaN(added)) {
      after.ageMedianDays[k] = medianOfSorted(sortedAges, nAges);
      after.ageMeanDays[k] = nAges === 0 ? NaN : ageSum / nAges;
      after.ageNewestDays[k] = minAge;
      after.ageOldestDays[k] = maxAge;
      after.ageShareUnder30Days[k] = nAges === 0 ? NaN : young / nAges;
    } else {
      const d = (inputs.editionDate - added) / DAY_MS;
      after.ageMedianDays[k] = medianWithInsert(sortedAges, d);
      after.ageMeanDays[k] = (ageSum + d) / (nAges + 1);
      after.ageNewestDays[k] = nAges === 0 ? d : Math.min(minAge, d);
      after.ageOldestDays[k] = nAges === 0 ? d : Math.max(maxAge, d);
      after.ageShareUnder30Days[k] = (young + (d < YOUNG_DAYS ? 1 : 0)) / (nAges + 1);
    }
    after.novelty[k] = scaledNovelty(ctx, (info + (ctx.selfInformation[c] as number)) / k1);
    const isProm = ctx.promoted[c] === 1 ? 1 : 0;
    after.promotedShareCount[k] = (prom + isProm) / k1;
    after.promotedShareExposure[k] = (promExp + isProm * (disc[slot] as number)) / expWith;
    const g = ctx.category[c] as number;
    after.calibrationGap[k] =
      pSum > 0 ? (klBase - (baseTerms[g] ?? 0) + (g < p.length ? term(g, (catCounts[g] as number) + 1) : 0)) / CALIBRATION_GAP_CEILING : NaN;
    const r = inputs.relevance[c] as number;
    after.predictedRelevance[k] = Number.isNaN(r)
      ? relCount === 0
        ? NaN
        : relSum / relCount
      : (relSum + r) / (relCount + 1);
    after.choiceCost[k] = inputs.bestRelevance ? costOf(Number.isNaN(r) ? relSum : relSum + r, k1, inputs.bestRelevance) : NaN;
    const owned = inputs.ownedShare[c] as number;
    after.slotSaturation[k] = owned;
    after.saturatedSlotCount[k] = saturated + (owned > threshold ? 1 : 0);
    for (const name of WHAT_IF_READINGS) (delta[name] as Float64Array)[k] = (after[name][k] as number) - before[name];
  }
  return { slot, candidates, before, after, delta };
}

/** The median of an ascending array with one value x inserted, without building the merged array. */
function medianWithInsert(sorted: Float64Array, x: number): number {
  const n = sorted.length + 1;
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((sorted[mid] as number) < x) lo = mid + 1;
    else hi = mid;
  }
  const at = (t: number): number => (t < lo ? (sorted[t] as number) : t === lo ? x : (sorted[t - 1] as number));
  const h = n >> 1;
  return n % 2 === 1 ? at(h) : (at(h - 1) + at(h)) / 2;
}

/** One candidate in one slot. */
export function whatIf(ctx: CurationContext, slots: Int32Array, slot: number, item: number, inputs: MeterInputs): WhatIf {
  const b = whatIfBatch(ctx, slots, slot, Int32Array.of(item), inputs);
  const after = {} as ShelfReadings;
  const delta = {} as ShelfReadings;
  for (const r of WHAT_IF_READINGS) {
    after[r] = b.after[r][0] as number;
    delta[r] = b.delta[r][0] as number;
  }
  return { slot, item, before: b.before, after, delta };
}
