/**
 * Rule messages in words, not field paths (issue 12 item 3): the brief's fields as zod names them, the
 * rules the fill reports, and the api's error for a bad brief. The words are ours (common practice, no
 * source); the counts in a rule's words follow the fill's rounding of a share of slots (fill.ts: a ceiling
 * of share × size slots is floored, a floor is ceiled), so the numbers must match what the fill enforces.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { toApiError } from '../../src-main/api/errors.ts';
import { ApiBrief } from '../../src-main/api/contracts/curation.ts';
import { fieldWords, issueWords, ruleWords } from '../../src-main/core/curation/rule-words.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import { checkBrief } from '../../src-main/core/curation/brief-check.ts';

const brief = (size: number, promoted: Record<string, number>) => parseBrief({ size, rules: { promoted } });

describe('rules in words', () => {
  it('says a sponsored bound with the number of items the fill allows on this shelf', () => {
    // 25% of 8 slots = 2 items; 20% of 6 slots = 1.2, floored to 1 for a ceiling, ceiled to 2 for a floor.
    expect(ruleWords('promoted.maxCount', brief(8, { maxCount: 0.25 }))).toBe('At most 2 sponsored items (maxCount)');
    expect(ruleWords('promoted.maxCount', brief(6, { maxCount: 0.2 }))).toBe('At most 1 sponsored item (maxCount)');
    expect(ruleWords('promoted.minCount', brief(6, { minCount: 0.2 }))).toBe('At least 2 sponsored items (minCount)');
    expect(ruleWords('promoted.maxExposure', brief(6, { maxExposure: 0.125 }))).toBe('Sponsored items take at most 12.5% of the exposure (maxExposure)');
  });

  it('says a quota, a pin, an empty slot and the audience in words', () => {
    const b = brief(4, {});
    expect(ruleWords('quota category max 2', b)).toBe('At most 2 items per category (quota)');
    expect(ruleWords('quota supplier=Oxlip & Co max 1', b)).toBe('At most 1 item of the supplier Oxlip & Co (quota)');
    expect(ruleWords('size', b)).toBe('Every one of the 4 slots filled (size)');
    expect(ruleWords('pin', b)).toBe('Pinned items (pin)');
    expect(ruleWords('audience', b)).toBe('The audience (audience)');
    // Why an item left: the pool's exclusion words, as the shelf editor says them elsewhere.
    expect(ruleWords('category', b)).toBe('outside the category filter');
    expect(ruleWords('pushed off the end of the shelf', b)).toBe('pushed off the end of the shelf');
  });

  it('has words for every field of the brief an editor sets, in every spelling of its path', () => {
    const paths = [
      'size', 'lambda', 'anchors.0', 'audience.category', 'audience.withinDays', 'include.categories.0', 'include.tags', 'exclude.suppliers.2',
      'priceBand.min', 'priceBand.max', 'maxAgeDays', 'weights.trend', 'rules.quotas.0.max', 'rules.quotas.1.value', 'rules.promoted.minCount',
      'rules.promoted.maxCount', 'rules.promoted.minExposure', 'rules.promoted.maxExposure', 'rules.restPeriod', 'rules.allowRepeatInEdition',
    ];
    for (const p of paths) {
      const w = fieldWords(p);
      expect(w, p).not.toBeNull();
      // The words end with the field's own name in brackets, and never show the dotted path.
      expect(w!, p).toMatch(/ \([A-Za-z]+\)$/);
      expect(w!, p).not.toContain(p.includes('.') ? p : '\u0000');
    }
    expect(fieldWords('brief.rules.quotas[0].max')).toBe(fieldWords(['rules', 'quotas', 0, 'max']));
    expect(fieldWords('threads')).toBeNull();
  });

  it('turns a schema error in a brief into words through the api, for the app and the command line alike', () => {
    const bad = (b: unknown) => {
      const r = z.object({ brief: ApiBrief }).safeParse({ brief: b });
      if (r.success) throw new Error('expected a schema error');
      return toApiError(r.error).message;
    };
    expect(bad({ size: 6, rules: { promoted: { maxCount: 1.5 } } })).toBe('Most sponsored share of slots (maxCount): must be at most 1');
    expect(bad({ size: 6, rules: { quotas: [{ facet: 'category', max: 0 }] } })).toBe('Limit 1: most items (max): must be at least 1');
    expect(bad({ size: 0 })).toBe('Slots (size): must be at least 1');
    expect(bad({ size: 6, maxAgeDays: 'soon' })).toBe('Added within the last days (maxAgeDays): must be a number');
    expect(bad({ size: 6, rules: { quotas: [{ facet: 'colour', max: 2 }] } })).toBe('Limit 1: category, supplier or tag (facet): must be one of category, supplier, tag');
    for (const m of [bad({ size: 6, priceBand: { min: 'x' } }), bad({ size: 6, rules: { restPeriod: -1 } })]) expect(m).not.toMatch(/^[\w]+\.[\w.]+:/);
  });

  it('says a brief check in words, once', () => {
    expect(() => checkBrief(parseBrief({ size: 4, priceBand: { min: 50, max: 10 } }))).toThrow(/^Lowest price \(min\): is above max \(50 > 10\)$/);
    expect(issueWords({ code: 'custom', path: ['rules', 'restPeriod'], message: 'too long a rest' })).toBe(
      'Rest period in published editions (restPeriod): too long a rest',
    );
  });
});
