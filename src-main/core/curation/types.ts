/**
 * The curation vocabulary as types (DESIGN.md: brief, rules, pool, pin/ban/boost/sink/lock, meter).
 * Shared by core/curation (fill, rules, meter), the store, the services, the api and the renderer.
 */

import type { IdleDial } from './idle-dials.ts';
import type { Targets } from './readings.ts';

export type Facet = 'category' | 'supplier' | 'tag';

/** "At most n items per category / supplier / tag on a shelf." `value` narrows it to one value. */
export interface Quota {
  facet: Facet;
  max: number;
  value?: string;
}

/** Bounds on the share of slots (count) and of log2-discounted exposure taken by promoted items. */
export interface PromotedBounds {
  minCount?: number;
  maxCount?: number;
  minExposure?: number;
  maxExposure?: number;
}

export interface Rules {
  quotas: Quota[];
  promoted: PromotedBounds;
  /** Published editions that must pass before an item may be proposed again (0 = off). */
  restPeriod: number;
  /** Allow the same item on two shelves of one edition. */
  allowRepeatInEdition: boolean;
}

export type Audience =
  | { kind: 'everyone' }
  | { kind: 'rule'; category: string; signalKinds: string[]; withinDays: number }
  /**
   * A taste group. `name`, when the group was named, is what the brief aims at: groups are renumbered at
   * each training, so the name is resolved at fill time to whichever group carries it now; `group` is the
   * number it had when chosen, used only for a group without a name.
   */
  | { kind: 'group'; group: number; name?: string };

export interface BlendWeights {
  content: number;
  collaborative: number;
  audience: number;
  popularity: number;
  trend: number;
  freshness: number;
}

export interface AutoDials {
  limit: number;
  cost: number | null;
  /** Dials held at 0 because the workspace has nothing for them to read (curation/idle-dials.ts). */
  idle?: IdleDial[] | undefined;
}

export interface Brief {
  size: number;
  /** Workspace item ids the shelf is built around. */
  anchors: number[];
  audience: Audience;
  include: { categories: string[]; tags: string[]; suppliers: string[] };
  exclude: { categories: string[]; tags: string[]; suppliers: string[] };
  priceBand: { min?: number; max?: number };
  /** Only items added within this many days of the edition date (undefined = any age). */
  maxAgeDays?: number;
  weights: BlendWeights;
  /**
   * Present when the service set the dials (popularity, trend, freshness) for this brief so that they cost at
   * most `limit` of validated relevance (services/curation/brief-dials.ts); `cost` is what they cost when set
   * (null: no trained model to measure with). Absent: the weights are the editor's and are never changed.
   */
  autoDials?: AutoDials;
  /** MMR trade-off: 1 = relevance only, 0 = diversity only (Carbonell & Goldstein 1998). */
  lambda: number;
  rules: Rules;
  /** The editor's target band per meter reading (readings.ts); a reading left out keeps its default band. */
  targets?: Targets;
}

/** One scored candidate of a shelf's pool. `relevance` is the blended score in [0, 1]. */
export interface Candidate {
  /** Dense item index into the catalogue array used for the fill. */
  index: number;
  relevance: number;
}

/** A rule that could not be met, and why; a fill never drops a rule silently. */
export interface RuleViolation {
  rule: string;
  reason: string;
}

/** A filled shelf: item index per slot (-1 = empty) and what gave way. */
export interface FillResult {
  slots: Int32Array;
  objective: number;
  violations: RuleViolation[];
}

/**
 * DESIGN.md "Meter readings" for one shelf, each on the scale readings.ts states (meter.ts computes them).
 * NaN where a reading has no data.
 */
export interface ShelfMeter {
  /** Variety: Ziegler et al.'s intra-list distance over cosine, halved into [0, 1]. */
  intraListDistance: number;
  age: { medianDays: number; meanDays: number; newestDays: number; oldestDays: number; shareUnder30Days: number };
  /** Items per bin of readings.ts AGE_BINS (items with no date are left out). */
  ageHistogram: number[];
  /** Mean self-information over its ceiling, in [0, 1]. */
  novelty: number;
  /** The same, in bits: 2^bits is "one customer in N" has a typical item. */
  noveltyBits: number;
  promotedShareCount: number;
  promotedShareExposure: number;
  /** Steck's KL(p‖q̃) over its ceiling ln(1/α), in [0, 1]. */
  calibrationGap: number;
  /** The shelf's category mix beside its audience's, for every category either has (shares; largest on either side first). */
  categoryMix: { category: string; shelf: number; audience: number }[];
  predictedRelevance: number;
  /** The share of predicted relevance the dials and rules give up against the best list (choice-cost.ts). */
  choiceCost: number;
  /** Per slot, the share of the audience who already have the item; flagged above the threshold. */
  saturation: number[];
  saturatedSlots: number[];
}

export interface EditionMeter {
  distinctItems: number;
  /** Pairs of shelves and how many items they share. */
  overlaps: { a: number; b: number; shared: number }[];
  supplierExposureGini: number;
}

/** The meter readings a what-if reports, as flat numbers (ShelfMeter's age block spread out). */
export const WHAT_IF_READINGS = [
  'intraListDistance',
  'ageMedianDays',
  'ageMeanDays',
  'ageNewestDays',
  'ageOldestDays',
  'ageShareUnder30Days',
  'novelty',
  'promotedShareCount',
  'promotedShareExposure',
  'calibrationGap',
  'predictedRelevance',
  'choiceCost',
  /** The saturation of the slot the candidate goes into. */
  'slotSaturation',
  /** How many slots of the shelf are flagged as saturated. */
  'saturatedSlotCount',
] as const;
export type WhatIfReading = (typeof WHAT_IF_READINGS)[number];
export type ShelfReadings = Record<WhatIfReading, number>;

/** A what-if for one candidate in one slot: the readings before, after, and after − before. */
export interface WhatIf {
  slot: number;
  item: number;
  before: ShelfReadings;
  after: ShelfReadings;
  delta: ShelfReadings;
}
