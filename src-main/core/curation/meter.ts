/**
 * The shelf meter (DESIGN.md "Meter readings"): what an editor watches while building a shelf. Every
 * reading is over the filled slots (-1 = empty slot is skipped) and is NaN when it has no data
 * (e.g. intra-list distance with fewer than two items).
 */
import { log2Discounts } from '../metrics/discount.ts';
import { calibrationGap, CALIBRATION_ALPHA } from '../stats/kl.ts';
import { mean, median } from '../stats/summary.ts';
import { DAY_MS } from '../types.ts';
import { costOf } from './choice-cost.ts';
import type { CurationContext } from './context.ts';
import { AGE_BINS, ageBinOf } from './readings.ts';
import type { ShelfMeter } from './types.ts';

export const SATURATION_THRESHOLD = 0.5;
/** "Share younger than 30 days" (DESIGN.md): a month is what editors call new. */
export const YOUNG_DAYS = 30;

export interface MeterInputs {
  /** Unix ms of the edition the shelf belongs to; item ages are measured to it. */
  editionDate: number;
  /** Validated relevance per dense item, in [0, 1]; NaN for items no shelf could show (skipped). */
  relevance: Float64Array;
  /** best[f]: the most relevance f items can reach (choice-cost.ts `bestRelevanceSums`); absent = no price shown. */
  bestRelevance?: Float64Array;
  /** The audience's category mix, indexed by category code (weights; normalised here). */
  audienceCategories: Float64Array;
  /** Per dense item, the share of the shelf's audience who already have it. */
  ownedShare: Float64Array;
  /** Slots whose saturation is above this are flagged; default 0.5. */
  saturationThreshold?: number;
}

/**
 * Intra-list distance, Ziegler, McNee, Konstan & Lausen (2005): the mean over unordered pairs of filled
 * slots of 1 − cos(v_i, v_j). Rows of ctx.vectors are unit length, so cos is a dot product.
 */
export function intraListDistance(ctx: CurationContext, slots: Int32Array): number {
  const { vectors, dim } = ctx;
  let pairs = 0;
  let sum = 0;
  for (let a = 0; a < slots.length; a++) {
    const i = slots[a] as number;
    if (i < 0) continue;
    for (let b = a + 1; b < slots.length; b++) {
      const j = slots[b] as number;
      if (j < 0) continue;
      let s = 0;
      for (let f = 0; f < dim; f++) s += (vectors[i * dim + f] as number) * (vectors[j * dim + f] as number);
      sum += 1 - s;
      pairs++;
    }
  }
  return pairs === 0 ? NaN : sum / pairs;
}

/**
 * Promoted share by count (promoted filled slots / filled slots) and by exposure:
 * Σ_{promoted slots r} 1/log2(r + 1) / Σ_{filled slots r} 1/log2(r + 1) (Järvelin & Kekäläinen 2002's
 * discount, metrics/discount.ts). Empty slots show nothing to anyone, so they weigh nothing.
 */
export function promotedShares(ctx: CurationContext, slots: Int32Array): { count: number; exposure: number } {
  const disc = log2Discounts(slots.length);
  let filled = 0;
  let prom = 0;
  let exp = 0;
  let expAll = 0;
  for (let s = 0; s < slots.length; s++) {
    const i = slots[s] as number;
    if (i < 0) continue;
    filled++;
    expAll += disc[s] as number;
    if (ctx.promoted[i] === 1) {
      prom++;
      exp += disc[s] as number;
    }
  }
  return filled === 0 ? { count: NaN, exposure: NaN } : { count: prom / filled, exposure: exp / expAll };
}

/**
 * Variety on [0, 1]: Ziegler et al.'s intra-list distance with the cosine distance 1 − cos, whose range is
 * [0, 2] for vectors with signed entries (iALS factors; scipy.spatial.distance.cosine documents the same
 * range), halved. 0 = all alike, 0.5 = unrelated (orthogonal) items, 1 = opposite ones. Halving (not
 * clipping negative cosines at 0) keeps the order of any two shelves and the same meaning whichever
 * vectors the workspace has (non-negative content vectors reach at most 0.5).
 */
export function variety(ctx: CurationContext, slots: Int32Array): number {
  return intraListDistance(ctx, slots) / 2;
}

/**
 * Steck (2018)'s KL(p‖q̃) with q̃ = (1 − α)q + αp is at most ln(1/α): q̃_g ≥ α·p_g, so each term
 * p_g·ln(p_g / q̃_g) ≤ p_g·ln(1/α), with equality exactly when the list has none of the audience's
 * categories. Dividing by it puts the calibration gap on [0, 1]: 1 = "none of their categories".
 */
export const CALIBRATION_GAP_CEILING = Math.log(1 / CALIBRATION_ALPHA);

/** Mean self-information over the context's ceiling (Zhou et al. 2010's novelty, scaled to [0, 1]). */
export function scaledNovelty(ctx: CurationContext, meanBits: number): number {
  return ctx.selfInformationCeiling > 0 ? meanBits / ctx.selfInformationCeiling : NaN;
}

export function meterShelf(ctx: CurationContext, slots: Int32Array, inputs: MeterInputs): ShelfMeter {
  const threshold = inputs.saturationThreshold ?? SATURATION_THRESHOLD;
  const ages: number[] = [];
  let young = 0;
  let info = 0;
  let relSum = 0;
  let relCount = 0;
  let filled = 0;
  const shelfCategories = new Float64Array(ctx.facets.category.values.length);
  const saturation: number[] = [];
  const saturatedSlots: number[] = [];
  const ageHistogram = new Array<number>(AGE_BINS.length).fill(0);
  for (let s = 0; s < slots.length; s++) {
    const i = slots[s] as number;
    if (i < 0) {
      saturation.push(NaN);
      continue;
    }
    filled++;
    const added = ctx.addedAt[i] as number;
    if (!Number.isNaN(added)) {
      const days = (inputs.editionDate - added) / DAY_MS;
      ages.push(days);
      if (days < YOUNG_DAYS) young++;
      const bin = ageBinOf(days);
      ageHistogram[bin] = (ageHistogram[bin] as number) + 1;
    }
    info += ctx.selfInformation[i] as number;
    const rel = inputs.relevance[i] as number;
    if (!Number.isNaN(rel)) {
      relSum += rel;
      relCount++;
    }
    const c = ctx.category[i] as number;
    shelfCategories[c] = (shelfCategories[c] as number) + 1;
    const owned = inputs.ownedShare[i] as number;
    saturation.push(owned);
    if (owned > threshold) saturatedSlots.push(s);
  }
  const promoted = promotedShares(ctx, slots);
  let newest = Infinity;
  let oldest = -Infinity;
  for (const d of ages) {
    if (d < newest) newest = d;
    if (d > oldest) oldest = d;
  }
  const noveltyBits = filled === 0 ? NaN : info / filled;
  return {
    intraListDistance: variety(ctx, slots),
    age: {
      medianDays: median(ages),
      meanDays: mean(ages),
      newestDays: ages.length === 0 ? NaN : newest,
      oldestDays: ages.length === 0 ? NaN : oldest,
      shareUnder30Days: ages.length === 0 ? NaN : young / ages.length,
    },
    ageHistogram,
    // Novelty, Zhou et al. (2010): mean self-information −log2 p_i of the listed items, and on [0, 1].
    novelty: scaledNovelty(ctx, noveltyBits),
    noveltyBits,
    promotedShareCount: promoted.count,
    promotedShareExposure: promoted.exposure,
    // Calibration, Steck (2018): KL(p‖q̃), p = audience's category mix, q = the shelf's, α = 0.01, on [0, 1].
    calibrationGap: calibrationGap(inputs.audienceCategories, shelfCategories, CALIBRATION_ALPHA) / CALIBRATION_GAP_CEILING,
    categoryMix: categoryMix(ctx, inputs.audienceCategories, shelfCategories),
    predictedRelevance: relCount === 0 ? NaN : relSum / relCount,
    choiceCost: inputs.bestRelevance ? costOf(relSum, filled, inputs.bestRelevance) : NaN,
    saturation,
    saturatedSlots,
  };
}

/**
 * The shelf's and the audience's category shares, for every category either holds; the categories that
 * weigh most on either side first, so a short list shows both what the audience wants and what the shelf has.
 */
function categoryMix(ctx: CurationContext, audience: Float64Array, shelf: Float64Array): ShelfMeter['categoryMix'] {
  let sa = 0;
  let ss = 0;
  for (const v of audience) sa += v;
  for (const v of shelf) ss += v;
  const out: ShelfMeter['categoryMix'] = [];
  for (let g = 0; g < ctx.facets.category.values.length; g++) {
    const a = sa > 0 ? ((audience[g] ?? 0) as number) / sa : 0;
    const s = ss > 0 ? (shelf[g] as number) / ss : 0;
    if (a > 0 || s > 0) out.push({ category: ctx.facets.category.values[g] as string, shelf: s, audience: a });
  }
  return out.sort((x, y) => Math.max(y.audience, y.shelf) - Math.max(x.audience, x.shelf) || y.audience - x.audience || (x.category < y.category ? -1 : 1));
}
