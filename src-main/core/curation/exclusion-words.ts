import type { ExclusionReason } from './candidates.ts';

/** Why items are not in a shelf's pool, in the words the command line and the shelf editor show. */
export const EXCLUSION_WORDS: Readonly<Record<ExclusionReason, string>> = {
  outOfStock: 'out of stock',
  notYetAdded: 'added after the edition date',
  banned: 'banned',
  banRule: 'banned by a rule',
  resting: 'resting (rest period)',
  category: 'outside the category filter',
  tag: 'outside the tag filter',
  supplier: 'outside the supplier filter',
  price: 'outside the price band',
  age: 'older than the age limit',
  inEdition: 'on another shelf of this edition',
};

/** "12 out of stock, 3 banned": the non-zero counts in EXCLUSION_REASONS order, or '' when none. */
export function describeExclusions(excluded: Readonly<Record<string, number>>): string {
  return Object.entries(EXCLUSION_WORDS)
    .filter(([why]) => (excluded[why] ?? 0) > 0)
    .map(([why, words]) => `${excluded[why]!.toLocaleString('en-US')} ${words}`)
    .join(', ');
}
