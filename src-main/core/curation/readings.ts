/**
 * The meter's readings, named once (issue 12 item 4: "one name for each reading across app, command line,
 * exports and docs"). Every shell reads its labels, ranges, one-line help and default target bands from
 * this table; the machine key of each reading is the field it has in the meter (and in JSON). The scales
 * themselves are computed in meter.ts, each beside the definition it follows.
 */
import type { Brief } from './types.ts';

/** The shelf readings an editor watches (DESIGN.md "Meter readings"), in the order screens show them. */
export const SHELF_READING_KEYS = [
  'intraListDistance',
  'novelty',
  'calibrationGap',
  'ageMedianDays',
  'ageShareUnder30Days',
  'promotedShareCount',
  'promotedShareExposure',
  'predictedRelevance',
  'choiceCost',
] as const;
export type ShelfReadingKey = (typeof SHELF_READING_KEYS)[number];

/** Readings whose band the editor sets on the brief; the sponsored shares take theirs from the brief's rules. */
export const TARGET_KEYS = [
  'intraListDistance',
  'novelty',
  'calibrationGap',
  'ageMedianDays',
  'ageShareUnder30Days',
  'predictedRelevance',
  'choiceCost',
] as const;
export type TargetKey = (typeof TARGET_KEYS)[number];

/** A target band: the reading should sit in [min, max]; either end may be open. */
export interface Band {
  min?: number;
  max?: number;
}
export type Targets = Partial<Record<TargetKey, Band>>;

export interface ReadingSpec {
  key: ShelfReadingKey;
  /** The reading's one name, on screen, on the command line, in exports and in the docs. */
  name: string;
  /**
   * 'score': a number in [0, 1]; 'share': a fraction shown as a percentage; 'days': days, 0 and up (the
   * gauge draws up to `range.max` and marks a value beyond it).
   */
  unit: 'score' | 'share' | 'days';
  range: { min: number; max: number };
  /** What the reading means, in one line an editor reads without a mouse. */
  help: string;
  /** The band a shelf has until its brief sets one; {} = no target. */
  defaultBand: Band;
}

export const READINGS: Readonly<Record<ShelfReadingKey, ReadingSpec>> = {
  intraListDistance: {
    key: 'intraListDistance',
    name: 'Variety',
    unit: 'score',
    range: { min: 0, max: 1 },
    help: 'How unlike each other the items are: 0 = all alike, 0.5 = unrelated, 1 = opposite tastes.',
    // Common practice, no source: below 0.4 pairs of items are, on average, more alike than unrelated.
    defaultBand: { min: 0.4 },
  },
  novelty: {
    key: 'novelty',
    name: 'Novelty',
    unit: 'score',
    range: { min: 0, max: 1 },
    help: 'How unfamiliar the items are to customers: 0 = everyone has them, 1 = nobody has them yet.',
    defaultBand: {},
  },
  calibrationGap: {
    key: 'calibrationGap',
    name: 'Calibration gap',
    unit: 'score',
    range: { min: 0, max: 1 },
    help: "How far the shelf's category mix is from its audience's: 0 = the same mix, 1 = none of their categories.",
    defaultBand: {},
  },
  ageMedianDays: {
    key: 'ageMedianDays',
    name: 'Median age',
    unit: 'days',
    range: { min: 0, max: 730 },
    help: 'Half the items were added more recently than this, counted to the edition date.',
    defaultBand: {},
  },
  ageShareUnder30Days: {
    key: 'ageShareUnder30Days',
    name: 'Under 30 days',
    unit: 'share',
    range: { min: 0, max: 1 },
    help: 'Share of items added in the 30 days before the edition date.',
    defaultBand: {},
  },
  promotedShareCount: {
    key: 'promotedShareCount',
    name: 'Sponsored slots',
    unit: 'share',
    range: { min: 0, max: 1 },
    help: "Share of slots taken by sponsored items; the band is the brief's sponsored limits.",
    defaultBand: {},
  },
  promotedShareExposure: {
    key: 'promotedShareExposure',
    name: 'Sponsored exposure',
    unit: 'share',
    range: { min: 0, max: 1 },
    help: "Share of attention on sponsored items, top slots counting more; the band is the brief's sponsored limits.",
    defaultBand: {},
  },
  predictedRelevance: {
    key: 'predictedRelevance',
    name: 'Predicted relevance',
    unit: 'score',
    range: { min: 0, max: 1 },
    help: "How well the items suit the shelf's audience, by the validated models: 0 = least, 1 = most in the pool.",
    defaultBand: {},
  },
  choiceCost: {
    key: 'choiceCost',
    name: 'Price of choices',
    unit: 'share',
    range: { min: 0, max: 1 },
    help: 'Relevance the dials and rules give up against the most relevant list for this audience.',
    // The budget the default dials are held to (core/editing/brief-schema.ts DEFAULT_WEIGHTS, issue 10 item 4).
    defaultBand: { max: 0.05 },
  },
};

/** The edition readings (DESIGN.md), named here for the same reason. */
export const EDITION_READINGS = {
  distinctItems: { name: 'Distinct items', help: 'Items the edition shows, each counted once however many shelves carry it.' },
  supplierExposureGini: {
    name: 'Supplier exposure Gini',
    help: 'Gini coefficient of attention across the featured suppliers: 0 = shared evenly, 1 = one supplier takes it all.',
  },
} as const;

/** A reading of a shelf meter by its key (the age block is nested in ShelfMeter). */
export interface MeterLike extends Record<Exclude<ShelfReadingKey, 'ageMedianDays' | 'ageShareUnder30Days'>, number | null> {
  age: { medianDays: number | null; shareUnder30Days: number | null };
}

/** A reading of a shelf meter (core's, or the api's with null for no data) by its key; NaN without data. */
export function readingOf(m: MeterLike, key: ShelfReadingKey): number {
  const v = key === 'ageMedianDays' ? m.age.medianDays : key === 'ageShareUnder30Days' ? m.age.shareUnder30Days : m[key];
  return v === null || v === undefined ? NaN : v;
}

type Loose<T> = { [K in keyof T]?: T[K] | undefined };
/** Targets as the api's schemas give them (ends may be present as undefined). */
export type LooseTargets = Partial<Record<TargetKey, Loose<Band> | undefined>>;

/** What of a brief the bands read: its sponsored limits and its targets (core's Brief, or the api's). */
export interface BandSource {
  rules: { promoted: Loose<Brief['rules']['promoted']> };
  targets?: LooseTargets | undefined;
}

/**
 * The band a reading is held to on this brief: the brief's own target, else the default; the sponsored
 * shares take the brief's sponsored limits (count or exposure), so one band is never set in two places.
 */
export function bandFor(brief: BandSource, key: ShelfReadingKey): Band {
  if (key === 'promotedShareCount') return clean({ min: brief.rules.promoted.minCount, max: brief.rules.promoted.maxCount });
  if (key === 'promotedShareExposure') return clean({ min: brief.rules.promoted.minExposure, max: brief.rules.promoted.maxExposure });
  return clean(brief.targets?.[key] ?? READINGS[key].defaultBand);
}

function clean(b: { min?: number | undefined; max?: number | undefined }): Band {
  const out: Band = {};
  if (b.min !== undefined) out.min = b.min;
  if (b.max !== undefined) out.max = b.max;
  return out;
}

export type BandStatus = 'below' | 'within' | 'above' | 'no target' | 'no data';

export function bandStatus(v: number, band: Band): BandStatus {
  if (band.min === undefined && band.max === undefined) return 'no target';
  if (!Number.isFinite(v)) return 'no data';
  if (band.min !== undefined && v < band.min) return 'below';
  if (band.max !== undefined && v > band.max) return 'above';
  return 'within';
}

/** How far v lies outside the band (0 inside it). */
export function distanceToBand(v: number, band: Band): number {
  if (band.min !== undefined && v < band.min) return band.min - v;
  if (band.max !== undefined && v > band.max) return v - band.max;
  return 0;
}

export type Direction = 'closer' | 'further' | 'stays within' | 'no change' | 'no target' | 'no data';

/**
 * Whether a what-if moves a reading toward its band. Moves inside the band are "stays within"; a move
 * that leaves the distance to the band the same (e.g. 0 change) is "no change".
 */
export function towardTarget(before: number, after: number, band: Band): Direction {
  if (band.min === undefined && band.max === undefined) return 'no target';
  if (!Number.isFinite(before) || !Number.isFinite(after)) return 'no data';
  const d0 = distanceToBand(before, band);
  const d1 = distanceToBand(after, band);
  const eps = 1e-12;
  if (d0 <= eps && d1 <= eps) return 'stays within';
  if (d1 < d0 - eps) return 'closer';
  if (d1 > d0 + eps) return 'further';
  return 'no change';
}

/** Words for a direction, as screens and the command line print them. */
export const DIRECTION_WORDS: Record<Direction, string> = {
  closer: 'closer to target',
  further: 'further from target',
  'stays within': 'stays on target',
  'no change': 'no change',
  'no target': 'no target set',
  'no data': 'no data',
};

/** A value in the reading's unit, as people read it: 0.51, 34%, 21 days; '—' without data. */
export function formatReading(spec: Pick<ReadingSpec, 'unit'>, v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (spec.unit === 'share') return `${Math.round(v * 100)}%`;
  if (spec.unit === 'days') return `${Math.round(v).toLocaleString('en')} ${Math.round(v) === 1 ? 'day' : 'days'}`;
  return v.toFixed(2);
}

/** The reading's range in words: "0–1", "0–100%", "days, 0 and up". */
export function formatRange(spec: Pick<ReadingSpec, 'unit' | 'range'>): string {
  if (spec.unit === 'share') return '0–100%';
  if (spec.unit === 'days') return 'days, 0 and up';
  return `${spec.range.min}–${spec.range.max}`;
}

/** A band in words: "target 0.40 or more", "target 0–5%", "no target". */
export function describeBand(spec: Pick<ReadingSpec, 'unit'>, band: Band): string {
  const f = (v: number) => formatReading(spec, v);
  if (band.min !== undefined && band.max !== undefined) return `target ${f(band.min)} to ${f(band.max)}`;
  if (band.min !== undefined) return `target ${f(band.min)} or more`;
  if (band.max !== undefined) return `target ${f(band.max)} or less`;
  return 'no target';
}

/** Item-age bins of the meter's histogram (days to the edition date); the last bin has no upper end. */
export const AGE_BINS: readonly { label: string; upToDays: number }[] = [
  { label: 'under 1 week', upToDays: 7 },
  { label: '1–4 weeks', upToDays: 30 },
  { label: '1–3 months', upToDays: 91 },
  { label: '3–12 months', upToDays: 365 },
  { label: 'over a year', upToDays: Infinity },
];

/** Counts per AGE_BINS bin; a bin holds ages in [previous bin's end, its own end). */
export function ageBinOf(days: number): number {
  for (let b = 0; b < AGE_BINS.length; b++) if (days < (AGE_BINS[b] as { upToDays: number }).upToDays) return b;
  return AGE_BINS.length - 1;
}

/**
 * Checks targets as the brief's schema does not: a band's ends inside the reading's range and min ≤ max.
 * Returns the first problem in words, or null.
 */
export function targetProblem(targets: LooseTargets): string | null {
  for (const [k, b] of Object.entries(targets)) {
    const spec = (TARGET_KEYS as readonly string[]).includes(k) ? READINGS[k as TargetKey] : undefined;
    if (!spec) return `'${k}' is not a reading with a target`;
    const band = clean(b ?? {});
    for (const end of ['min', 'max'] as const) {
      const v = band[end];
      if (v === undefined) continue;
      const top = spec.unit === 'days' ? Infinity : spec.range.max;
      if (!Number.isFinite(v) && !(v === Infinity && top === Infinity)) return `${spec.name}: the target's ${end === 'min' ? 'lower' : 'upper'} end must be a number`;
      if (v < spec.range.min || v > top) {
        return `${spec.name}: the target's ${end === 'min' ? 'lower' : 'upper'} end must be within ${formatRange(spec)}, got ${formatReading(spec, v)}`;
      }
    }
    if (band.min !== undefined && band.max !== undefined && band.min > band.max) {
      return `${spec.name}: the target's lower end (${formatReading(spec, band.min)}) is above its upper end (${formatReading(spec, band.max)})`;
    }
  }
  return null;
}

/**
 * A what-if change in the reading's unit, signed: "+0.02", "−5 pts" (percentage points for shares),
 * "+12 days"; a change that rounds to nothing is "no change".
 */
export function formatChange(spec: Pick<ReadingSpec, 'unit'>, d: number | null | undefined): string {
  if (d === null || d === undefined || !Number.isFinite(d)) return 'no data';
  const text = spec.unit === 'share' ? `${Math.abs(Math.round(d * 100))} pts` : spec.unit === 'days' ? `${Math.abs(Math.round(d))} days` : Math.abs(d).toFixed(2);
  if (/^0(\.0+)?( pts| days)?$/.test(text)) return 'no change';
  return `${d > 0 ? '+' : '−'}${text}`;
}

/** A what-if change with where it moves the reading against its band, in words. */
export function describeChange(key: ShelfReadingKey, before: number | null, delta: number | null | undefined, band: Band): { text: string; direction: Direction } {
  const spec = READINGS[key];
  const text = formatChange(spec, delta);
  const b = before ?? NaN;
  const direction = text === 'no change' ? 'no change' : towardTarget(b, b + (delta ?? NaN), band);
  return { text, direction };
}

/** One reading as every surface prints it: the command line's table, the JSON and HTML exports. */
export interface ReadingRow {
  key: ShelfReadingKey;
  name: string;
  /** On the reading's scale; null without data. */
  value: number | null;
  /** The value as people read it ("0.48", "3%", "522 days"). */
  text: string;
  range: string;
  target: Band;
  /** "target 0.40 or more", "no target". */
  targetText: string;
  status: BandStatus;
}

export function readingRows(m: MeterLike, brief: BandSource): ReadingRow[] {
  return SHELF_READING_KEYS.map((key) => {
    const spec = READINGS[key];
    const v = readingOf(m, key);
    const target = bandFor(brief, key);
    return {
      key,
      name: spec.name,
      value: Number.isFinite(v) ? v : null,
      text: formatReading(spec, v),
      range: formatRange(spec),
      target,
      targetText: describeBand(spec, target),
      status: bandStatus(v, target),
    };
  });
}

/**
 * Whether a stored meter is on these scales: meters stored before them (in editions published earlier)
 * lack `noveltyBits`, and their variety, novelty and calibration gap are on other scales, so surfaces
 * that read a stored meter leave such a one out rather than print it under these names.
 */
export function onCurrentScales(m: object | null | undefined): boolean {
  return !!m && 'noveltyBits' in m;
}
