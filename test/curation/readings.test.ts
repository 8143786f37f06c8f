import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildCurationContext } from '../../src-main/core/curation/context.ts';
import { CALIBRATION_GAP_CEILING, meterShelf, variety } from '../../src-main/core/curation/meter.ts';
import {
  ageBinOf,
  bandFor,
  bandStatus,
  describeBand,
  formatReading,
  READINGS,
  SHELF_READING_KEYS,
  TARGET_KEYS,
  targetProblem,
  towardTarget,
} from '../../src-main/core/curation/readings.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import { calibrationGap } from '../../src-main/core/stats/kl.ts';
import { context, EDITION, item } from './helpers.ts';

const base = {
  editionDate: EDITION,
  relevance: Float64Array.of(0.5, 0.5, 0.5),
  audienceCategories: Float64Array.of(1),
  ownedShare: Float64Array.of(0, 0, 0),
};

describe('variety on [0, 1]', () => {
  it('reads 0 for alike items, 0.5 for unrelated ones and 1 for opposite ones', () => {
    // scipy.spatial.distance.cosine documents 1 − u·v / (‖u‖‖v‖), whose value for [1, 0] and [−1, 0] is 2.0
    // and for [1, 0] and [0, 1] is 1.0: the distance runs over [0, 2]; variety halves it.
    const ctx = context([item(1), item(2), item(3), item(4)], [[1, 0], [2, 0], [0, 1], [-1, 0]]);
    expect(variety(ctx, Int32Array.of(0, 1))).toBeCloseTo(0, 6);
    expect(variety(ctx, Int32Array.of(0, 2))).toBeCloseTo(0.5, 6);
    expect(variety(ctx, Int32Array.of(0, 3))).toBeCloseTo(1, 6);
  });

  it('never leaves [0, 1], whatever the signs of the vectors', () => {
    fc.assert(
      fc.property(fc.array(fc.array(fc.integer({ min: -9, max: 9 }), { minLength: 3, maxLength: 3 }), { minLength: 2, maxLength: 8 }), (rows) => {
        const ctx = context(rows.map((_, i) => item(i + 1)), rows);
        const v = variety(ctx, Int32Array.from(rows, (_, i) => i));
        expect(v).toBeGreaterThanOrEqual(-1e-6);
        expect(v).toBeLessThanOrEqual(1 + 1e-6);
      }),
    );
  });
});

describe('calibration gap on [0, 1]', () => {
  it('reaches 1 exactly when the shelf has none of the audience categories', () => {
    // Steck (2018) §2.1: q̃ = (1 − α)q + αp with α = 0.01. Audience (½, ½, 0), shelf all in the third
    // category: q̃ = (0.005, 0.005, 0.99), KL = ½ ln(0.5/0.005) · 2 = ln 100, the ceiling.
    expect(calibrationGap([0.5, 0.5, 0], [0, 0, 1])).toBeCloseTo(Math.log(100), 12);
    expect(CALIBRATION_GAP_CEILING).toBeCloseTo(Math.log(100), 12);
    const ctx = context([item(1, { category: 'Lamps' }), item(2, { category: 'Rugs' }), item(3, { category: 'Mugs' })]);
    const m = meterShelf(ctx, Int32Array.of(2, 2), { ...base, audienceCategories: Float64Array.of(1, 1, 0) });
    expect(m.calibrationGap).toBeCloseTo(1, 12);
    // The same mix as the audience's: 0.
    expect(meterShelf(ctx, Int32Array.of(0, 1), { ...base, audienceCategories: Float64Array.of(1, 1, 0) }).calibrationGap).toBeCloseTo(0, 12);
  });

  it('reads about 0.52 at best for 8 slots over 20 equally liked categories (a short shelf cannot cover them)', () => {
    // By hand from Steck (2018)'s KL with α = 0.01: 8 categories at q = 1/8 give q̃ = 0.99/8 + 0.0005 = 0.12425,
    // 12 absent ones q̃ = 0.0005; KL = 0.4·ln(0.05/0.12425) + 0.6·ln(100) = 2.39899 nats → 2.39899 / ln 100.
    const p = new Array(20).fill(1);
    const q = p.map((_, g) => (g < 8 ? 1 : 0));
    expect(calibrationGap(p, q) / CALIBRATION_GAP_CEILING).toBeCloseTo(0.520934, 5);
  });

  it('never leaves [0, 1] for any audience and shelf mix', () => {
    const weights = fc.array(fc.integer({ min: 0, max: 20 }), { minLength: 4, maxLength: 4 }).filter((w) => w.some((x) => x > 0));
    fc.assert(
      fc.property(weights, weights, (p, q) => {
        const g = calibrationGap(p, q) / CALIBRATION_GAP_CEILING;
        expect(g).toBeGreaterThanOrEqual(-1e-12);
        expect(g).toBeLessThanOrEqual(1 + 1e-12);
      }),
    );
  });
});

describe('novelty on [0, 1]', () => {
  it('reads 0 for items everyone has and 1 for items nobody has', () => {
    // Zhou et al. (2010): self-information −log2 p_i. An untouched item counts as one customer, as the offline
    // novelty counts it (core/metrics/novelty.ts), so with 4 customers the ceiling is log2 4 = 2 bits, reached
    // by the rarest item and an untouched one alike; p = 1/2 gives 1 bit → 0.5.
    const items = [item(1), item(2), item(3), item(4)];
    const ctx = buildCurationContext(items, { vectors: Float32Array.of(1, 1, 1, 1), dim: 1, popularity: [1, 0, 1 / 4, 1 / 2], customerCount: 4 });
    expect(ctx.selfInformationCeiling).toBeCloseTo(2, 12);
    expect(meterShelf(ctx, Int32Array.of(0), base).novelty).toBeCloseTo(0, 12);
    expect(meterShelf(ctx, Int32Array.of(1), base).novelty).toBeCloseTo(1, 12);
    expect(meterShelf(ctx, Int32Array.of(2), base).novelty).toBeCloseTo(1, 12);
    const half = meterShelf(ctx, Int32Array.of(3), base);
    expect(half.noveltyBits).toBeCloseTo(1, 12);
    expect(half.novelty).toBeCloseTo(0.5, 12);
  });
});

describe('target bands', () => {
  const brief = parseBrief({ size: 8, rules: { promoted: { maxCount: 0.25 } } });

  it('come from the brief, else the stated defaults; the sponsored shares from the brief’s limits', () => {
    expect(bandFor(brief, 'intraListDistance')).toEqual(READINGS.intraListDistance.defaultBand);
    expect(bandFor(brief, 'choiceCost')).toEqual({ max: 0.05 });
    expect(bandFor(brief, 'novelty')).toEqual({});
    expect(bandFor(brief, 'promotedShareCount')).toEqual({ max: 0.25 });
    const set = parseBrief({ ...brief, targets: { novelty: { min: 0.3, max: 0.6 }, intraListDistance: {} } });
    expect(bandFor(set, 'novelty')).toEqual({ min: 0.3, max: 0.6 });
    // An empty band is the editor saying "no target", not "the default".
    expect(bandFor(set, 'intraListDistance')).toEqual({});
  });

  it('judge a value and a what-if move against the band', () => {
    expect(bandStatus(0.2, { min: 0.4 })).toBe('below');
    expect(bandStatus(0.4, { min: 0.4 })).toBe('within');
    expect(bandStatus(0.07, { max: 0.05 })).toBe('above');
    expect(bandStatus(0.5, {})).toBe('no target');
    expect(bandStatus(NaN, { min: 0 })).toBe('no data');
    expect(towardTarget(0.3, 0.35, { min: 0.4 })).toBe('closer');
    expect(towardTarget(0.3, 0.25, { min: 0.4 })).toBe('further');
    // Crossing the band to the far side by more than it started away is further.
    expect(towardTarget(0.45, 0.75, { min: 0.4, max: 0.5 })).toBe('further');
    expect(towardTarget(0.42, 0.48, { min: 0.4, max: 0.5 })).toBe('stays within');
    expect(towardTarget(0.3, 0.3, { min: 0.4 })).toBe('no change');
    expect(towardTarget(0.3, 0.6, {})).toBe('no target');
  });

  it('are refused outside the reading’s range or upside down, naming the reading in words', () => {
    expect(targetProblem({ novelty: { min: 1.2 } })).toBe("Novelty: the target's lower end must be within 0–1, got 1.20");
    expect(targetProblem({ choiceCost: { min: 0.1, max: 0.05 } })).toBe("Price of choices: the target's lower end (10%) is above its upper end (5%)");
    expect(targetProblem({ ageMedianDays: { max: 4000 } })).toBeNull();
    expect(() => parseBrief({ size: 8, targets: { calibrationGap: { max: 2.9 } } })).toThrow(/Calibration gap: the target's upper end must be within 0–1/);
    expect(() => parseBrief({ size: 8, targets: { promotedShareCount: { max: 0.2 } } })).toThrow();
  });

  it('are described in the reading’s own unit', () => {
    expect(describeBand(READINGS.choiceCost, { max: 0.05 })).toBe('target 5% or less');
    expect(describeBand(READINGS.intraListDistance, { min: 0.4, max: 1 })).toBe('target 0.40 to 1.00');
    expect(describeBand(READINGS.ageMedianDays, { max: 90 })).toBe('target 90 days or less');
    expect(describeBand(READINGS.novelty, {})).toBe('no target');
    expect(formatReading(READINGS.ageMedianDays, 1)).toBe('1 day');
  });
});

describe('the reading table', () => {
  it('names every reading once and gives each a range and help', () => {
    const names = SHELF_READING_KEYS.map((k) => READINGS[k].name);
    expect(new Set(names).size).toBe(names.length);
    for (const k of SHELF_READING_KEYS) expect(READINGS[k].help.length).toBeGreaterThan(20);
    for (const k of TARGET_KEYS) expect(targetProblem({ [k]: READINGS[k].defaultBand })).toBeNull();
  });

  it('bins ages at 7, 30, 91 and 365 days', () => {
    expect([0, 6.9, 7, 29, 30, 90, 91, 364, 365, 5000].map(ageBinOf)).toEqual([0, 0, 1, 1, 2, 2, 3, 3, 4, 4]);
  });
});
