import { describe, expect, it } from 'vitest';
import { catalogueNames, checkBriefNames, checkName } from '../../src-main/core/curation/brief-names.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import type { Item } from '../../src-main/core/types.ts';

const item = (category: string, supplier: string, tags: string[]): Item => ({
  id: 1, externalId: 'x', title: 'x', description: '', category, tags, supplier, price: null, addedAt: null, promoted: false, available: true, attributes: {},
});
const names = catalogueNames([item('kitten', 'Mossgate Works', ['sitting']), item('tools', 'Fernbrook', ['gift']), item('seeds', 'Fernbrook', [])]);

describe('names a brief refers to', () => {
  it('accepts names the catalogue uses', () => {
    expect(() => checkBriefNames(names, parseBrief({ size: 4, include: { categories: ['tools'], tags: ['gift'] }, rules: { quotas: [{ facet: 'supplier', max: 1, value: 'Fernbrook' }] } }))).not.toThrow();
  });

  it('refuses a misspelt name with the field and the nearest real names', () => {
    expect(() => checkBriefNames(names, parseBrief({ size: 4, include: { categories: ['tols'] } }))).toThrow(
      "Only these categories, entry 1 (categories): no item has the category 'tols' (did you mean 'tools'?)",
    );
    expect(() => checkBriefNames(names, parseBrief({ size: 4, rules: { quotas: [{ facet: 'tag', max: 1, value: 'Gift' }] } }))).toThrow(
      "Limit 1: which one (value): no item has the tag 'Gift' (did you mean 'gift'?)",
    );
    expect(() => checkBriefNames(names, parseBrief({ size: 4, audience: { kind: 'rule', category: 'bulbs' } }))).toThrow(/^Audience: bought in the category \(category\): no item has the category 'bulbs'$/);
  });

  it('suggests by Levenshtein distance: kitten -> sitting is 3 (too far), tols -> tools is 1', () => {
    // The classic worked example: d(kitten, sitting) = 3 (substitute k->s, e->i, insert g), from
    // Levenshtein (1966) as commonly presented, e.g. Jurafsky & Martin, "Speech and Language Processing",
    // ch. 2 (from memory). Beyond our limit of 2, so no suggestion.
    expect(() => checkName(names, 'category', 'sitting', 'category')).toThrow(/no item has the category 'sitting'$/);
    expect(() => checkName(names, 'category', 'kittens', 'category')).toThrow(/did you mean 'kitten'\?/);
  });
});
