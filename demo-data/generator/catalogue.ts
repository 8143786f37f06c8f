/**
 * The invented catalogue: each item is made for one hidden taste group, and its category, tags,
 * title and description lean to that group without giving it away (several groups share categories,
 * and a fifth of group tags are borrowed from other groups). Items arrive every Monday for two years.
 */
import type { Rng } from '../../src-main/core/rng.ts';
import { ARRIVAL_WEEKS, GRID_WEEKS } from './calendar.ts';
import { assignGroups, pick, pickWeighted, shuffle } from './sampling.ts';
import {
  CATEGORIES,
  CATEGORY_TAGS,
  GENERAL_TAGS,
  GROUPS,
  PRICE_BAND,
  SUPPLIERS,
  type Category,
} from './scenario.ts';
import {
  CATEGORY_USES,
  GROUP_TITLE_WORDS,
  LIVING,
  MAKER_WORDS,
  MATERIAL_SENTENCES,
  MODEL_WORDS,
  NOUNS,
  SEASON_SENTENCES,
  VARIETY_END,
  VARIETY_START,
} from './words.ts';

export interface DemoItem {
  id: string;
  title: string;
  description: string;
  /** Index into CATEGORIES. */
  category: number;
  tags: string[];
  supplier: string;
  /** Price in cents, so that formatting never meets a binary fraction. */
  priceCents: number;
  /** Arrival week on the calendar grid (the item is added on that week's Monday). */
  addedWeek: number;
  promoted: boolean;
  available: boolean;
  /** First grid week in which the item is out of stock (GRID_WEEKS when never). */
  outOfStockWeek: number;
  /** Index into GROUPS. */
  group: number;
  /** Zipf-like appeal within the group: 1 / rank^ZIPF_EXPONENT. */
  appeal: number;
}

/** Share of the catalogue present on opening day; the rest arrives week by week. */
const OPENING_SHARE = 0.15;
const PROMOTED_SHARE = 0.08;
const OUT_OF_STOCK_SHARE = 0.05;
/**
 * Exponent of the within-group popularity law. Near 1 gives the familiar long tail of retail
 * catalogues (common practice, no source).
 */
export const ZIPF_EXPONENT = 0.95;

const SUFFIX: Partial<Record<Category, string>> = { seeds: ' Seeds', bulbs: ' Bulbs' };

function titleFor(rng: Rng, category: Category, noun: string, group: string): string {
  const groupWord = rng.next() < 0.25 ? pick(rng, GROUP_TITLE_WORDS[group] ?? ['']) + ' ' : '';
  if (LIVING.has(category)) {
    const variety = pick(rng, VARIETY_START) + pick(rng, VARIETY_END);
    return `${groupWord}${variety} ${noun}${SUFFIX[category] ?? ''}`;
  }
  const model = pick(rng, MODEL_WORDS);
  return `${groupWord}${pick(rng, MAKER_WORDS)} ${noun}${model ? ' ' + model : ''}`;
}

function descriptionFor(rng: Rng, category: Category, noun: string, groupUses: readonly string[]): string {
  const sentences = [pick(rng, MATERIAL_SENTENCES[category]).replace('{n}', noun.toLowerCase())];
  if (rng.next() < 0.75) sentences.push(rng.next() < 0.75 ? pick(rng, groupUses) : pick(rng, CATEGORY_USES[category]));
  if (rng.next() < 0.6) sentences.push(pick(rng, SEASON_SENTENCES[category]));
  return sentences.join(' ');
}

function tagsFor(rng: Rng, category: Category, group: number): string[] {
  const tags = new Set<string>();
  const groupTag = (): string => {
    // A fifth of group tags come from another group: tags lean to the group, they do not name it.
    const g = rng.next() < 0.2 ? rng.int(GROUPS.length) : group;
    return pick(rng, GROUPS[g]!.tags);
  };
  tags.add(groupTag());
  tags.add(pick(rng, CATEGORY_TAGS[category]));
  if (rng.next() < 0.4) tags.add(groupTag());
  if (rng.next() < 0.15) tags.add(pick(rng, GENERAL_TAGS));
  return [...tags];
}

/** Prices end in .49/.99 below 20 and .99 above, as shops price (log-uniform inside the band). */
function priceFor(rng: Rng, category: Category): number {
  const [lo, hi] = PRICE_BAND[category];
  const p = lo * Math.exp(rng.next() * Math.log(hi / lo));
  if (p < 20) return Math.max(49, Math.floor(p) * 100 + (rng.next() < 0.5 ? 49 : 99));
  return Math.round(p) * 100 - 1;
}

export function generateCatalogue(rng: Rng, n: number): DemoItem[] {
  // Suppliers differ in size, so supplier exposure is uneven as in a real shop.
  const supplierSize = SUPPLIERS.map(() => 0.3 + rng.next() * 1.7);
  const groups = assignGroups(
    rng,
    n,
    GROUPS.map((g) => g.itemShare),
  );
  // Exact shares of promoted and out-of-stock items, placed at random.
  const promoted = shuffle(rng, Array.from({ length: n }, (_, k) => k < Math.round(n * PROMOTED_SHARE)));
  const soldOut = shuffle(rng, Array.from({ length: n }, (_, k) => k < Math.round(n * OUT_OF_STOCK_SHARE)));
  const drafts: DemoItem[] = [];
  for (let k = 0; k < n; k++) {
    const group = groups[k]!;
    const spec = GROUPS[group]!;
    const catNames = Object.keys(spec.categories) as Category[];
    const category = catNames[pickWeighted(rng, catNames.map((c) => spec.categories[c]!))]!;
    const noun = pick(rng, NOUNS[category]);
    const sellers = SUPPLIERS.map((s, j) => (s.categories.includes(category) ? supplierSize[j]! : 0));
    const addedWeek = rng.next() < OPENING_SHARE ? 0 : 1 + rng.int(ARRIVAL_WEEKS - 1);
    const available = !soldOut[k];
    drafts.push({
      id: '',
      title: titleFor(rng, category, noun, spec.id),
      description: descriptionFor(rng, category, noun, spec.uses),
      category: CATEGORIES.indexOf(category),
      tags: tagsFor(rng, category, group),
      supplier: SUPPLIERS[pickWeighted(rng, sellers)]!.name,
      priceCents: priceFor(rng, category),
      addedWeek,
      promoted: promoted[k]!,
      available,
      // Sold out at some point in the last eight weeks, never before it arrived.
      outOfStockWeek: available ? GRID_WEEKS : Math.max(addedWeek + 1, GRID_WEEKS - 1 - rng.int(8)),
      group,
      appeal: 0,
    });
  }
  // Ids follow arrival order, as a shop numbers its items (stable sort keeps draw order within a week).
  const items = drafts
    .map((item, k) => ({ item, k }))
    .sort((a, b) => a.item.addedWeek - b.item.addedWeek || a.k - b.k)
    .map(({ item }, k) => ({ ...item, id: 'I' + String(k + 1).padStart(5, '0') }));
  // Popularity rank within each group is independent of arrival: some new items become favourites.
  for (let g = 0; g < GROUPS.length; g++) {
    const members = shuffle(
      rng,
      items.filter((it) => it.group === g),
    );
    members.forEach((it, rank) => (it.appeal = 1 / Math.pow(rank + 1, ZIPF_EXPONENT)));
  }
  return items;
}
