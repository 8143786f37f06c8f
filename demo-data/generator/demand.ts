/**
 * Weekly demand tables: for every grid week, the cumulative weights from which a group's customer
 * draws an item (within the group) and from which anyone draws a generally popular item. An item's
 * weight is its appeal x its category's season x a short novelty lift after arrival x a lift when
 * promoted, and zero before it arrives or once it is out of stock. Tables are built once, so drawing
 * an item is one binary search.
 */
import type { Rng } from '../../src-main/core/rng.ts';
import type { DemoItem } from './catalogue.ts';
import { GRID_WEEKS, WINDOW_START_S, monthOfWeek, weekOf } from './calendar.ts';
import { searchCumulative } from './sampling.ts';
import { CATEGORIES, GROUPS, SEASON } from './scenario.ts';

/** Extra pull of a new item, fading with a time constant of four weeks. */
const NOVELTY_LIFT = 1.2;
const NOVELTY_WEEKS = 4;
/** Promoted items sit on the homepage, so they are seen more. */
const PROMOTED_LIFT = 1.5;
/** Items featured per group in each week's newsletter. */
export const FEATURED_PER_GROUP = 4;

export interface DemandTables {
  firstWeek: number;
  /** Item indices of each group, in catalogue order. */
  groupItems: Int32Array[];
  /** groupCum[g][(w - firstWeek) * n_g + j]: running sum over groupItems[g][0..j] in week w. */
  groupCum: Float64Array[];
  /** globalCum[(w - firstWeek) * nItems + i]: running sum of general popularity over items 0..i. */
  globalCum: Float64Array;
  nItems: number;
  /** featured[((w - firstWeek) * groups + g) * FEATURED_PER_GROUP + j]: newsletter items, -1 when none. */
  featured: Int32Array;
}

export function itemWeight(item: DemoItem, w: number): number {
  if (w < item.addedWeek || w >= item.outOfStockWeek) return 0;
  const season = SEASON[CATEGORIES[item.category]!][monthOfWeek(w)]!;
  const novelty = 1 + NOVELTY_LIFT * Math.exp(-(w - item.addedWeek) / NOVELTY_WEEKS);
  return item.appeal * season * novelty * (item.promoted ? PROMOTED_LIFT : 1);
}

export function buildDemand(items: readonly DemoItem[], newsletterRng: Rng): DemandTables {
  const firstWeek = weekOf(WINDOW_START_S);
  const weeks = GRID_WEEKS - firstWeek;
  const nGroups = GROUPS.length;
  const nItems = items.length;
  const groupItems: Int32Array[] = [];
  for (let g = 0; g < nGroups; g++) {
    groupItems.push(Int32Array.from(items.flatMap((it, i) => (it.group === g ? [i] : []))));
  }
  const weight = new Float64Array(nItems);
  const groupCum = groupItems.map((m) => new Float64Array(weeks * m.length));
  const globalCum = new Float64Array(weeks * nItems);
  const featured = new Int32Array(weeks * nGroups * FEATURED_PER_GROUP).fill(-1);
  const groupTotal = new Float64Array(nGroups);
  for (let wk = 0; wk < weeks; wk++) {
    const w = firstWeek + wk;
    for (let i = 0; i < nItems; i++) weight[i] = itemWeight(items[i]!, w);
    for (let g = 0; g < nGroups; g++) {
      const members = groupItems[g]!;
      const cum = groupCum[g]!;
      const base = wk * members.length;
      let s = 0;
      for (let j = 0; j < members.length; j++) cum[base + j] = s += weight[members[j]!]!;
      groupTotal[g] = s;
      // The editor's picks for the week: drawn from the group's current demand, so they are items
      // the group would want anyway.
      for (let j = 0; j < FEATURED_PER_GROUP && s > 0; j++) {
        const at = searchCumulative(cum, base, base + members.length, newsletterRng.next() * s);
        featured[(wk * nGroups + g) * FEATURED_PER_GROUP + j] = members[at - base]!;
      }
    }
    // General popularity: the shop-wide share of an item, i.e. its share within its group times the
    // group's share of customers.
    let s = 0;
    const base = wk * nItems;
    for (let i = 0; i < nItems; i++) {
      const g = items[i]!.group;
      const total = groupTotal[g]!;
      globalCum[base + i] = s += total > 0 ? (GROUPS[g]!.customerShare * weight[i]!) / total : 0;
    }
  }
  return { firstWeek, groupItems, groupCum, globalCum, nItems, featured };
}

/** An item of group g drawn from week w's demand, or -1 when the group has nothing in stock. */
export function drawFromGroup(t: DemandTables, g: number, w: number, u: number): number {
  const members = t.groupItems[g]!;
  const n = members.length;
  const base = (w - t.firstWeek) * n;
  const total = n > 0 ? t.groupCum[g]![base + n - 1]! : 0;
  if (!(total > 0)) return -1;
  return members[searchCumulative(t.groupCum[g]!, base, base + n, u * total) - base]!;
}

/** A generally popular item in week w, or -1 when nothing is in stock. */
export function drawPopular(t: DemandTables, w: number, u: number): number {
  const base = (w - t.firstWeek) * t.nItems;
  const total = t.globalCum[base + t.nItems - 1] ?? 0;
  if (!(total > 0)) return -1;
  return searchCumulative(t.globalCum, base, base + t.nItems, u * total) - base;
}
