import { InputError } from '../errors.ts';
import type { Item } from '../types.ts';
import { fieldProblem } from './rule-words.ts';
import type { Brief } from './types.ts';
import { editDistance } from '../util/edit-distance.ts';

type Facet = 'category' | 'supplier' | 'tag';

/** The category, supplier and tag names the catalogue uses. */
export interface CatalogueNames {
  category: ReadonlySet<string>;
  supplier: ReadonlySet<string>;
  tag: ReadonlySet<string>;
}

export function catalogueNames(items: readonly Item[]): CatalogueNames {
  const names = { category: new Set<string>(), supplier: new Set<string>(), tag: new Set<string>() };
  for (const it of items) {
    names.category.add(it.category);
    names.supplier.add(it.supplier);
    for (const t of it.tags) names.tag.add(t);
  }
  return names;
}

/**
 * Refuses a name that no item of the catalogue carries, with the closest names it does carry: a misspelt
 * category in a filter would otherwise leave a shelf empty, and in a ban would ban nothing, both silently.
 */
export function checkName(names: CatalogueNames, facet: Facet, value: string, field: string): void {
  if (names[facet].has(value)) return;
  const near = closest(value, names[facet]);
  const hint = near.length ? ` (did you mean ${near.map((n) => `'${n}'`).join(' or ')}?)` : '';
  throw new InputError(fieldProblem(field, `no item has the ${facet} '${value}'${hint}`));
}

/** Every category, supplier and tag a brief names must exist in the catalogue. */
export function checkBriefNames(names: CatalogueNames, brief: Brief): void {
  const lists: [Facet, 'categories' | 'suppliers' | 'tags'][] = [['category', 'categories'], ['supplier', 'suppliers'], ['tag', 'tags']];
  for (const side of ['include', 'exclude'] as const) {
    for (const [facet, key] of lists) brief[side][key].forEach((v, i) => checkName(names, facet, v, `${side}.${key}.${i}`));
  }
  brief.rules.quotas.forEach((q, i) => {
    if (q.value !== undefined) checkName(names, q.facet, q.value, `rules.quotas.${i}.value`);
  });
  if (brief.audience.kind === 'rule') checkName(names, 'category', brief.audience.category, 'audience.category');
}

/** Up to three names within edit distance 2 of `value` (ignoring case), nearest first. */
function closest(value: string, names: ReadonlySet<string>): string[] {
  const v = value.toLowerCase();
  const scored: [string, number][] = [];
  for (const n of names) {
    if (n === '') continue;
    const d = n.toLowerCase() === v ? 0 : editDistance(v, n.toLowerCase(), 2);
    if (d <= 2) scored.push([n, d]);
  }
  return scored.sort((a, b) => a[1] - b[1] || a[0].localeCompare(b[0])).slice(0, 3).map(([n]) => n);
}
