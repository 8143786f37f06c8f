/**
 * Naming a taste group for an editor: the categories and tags its members interact with more than
 * everyone does. Lift = P(value | group) / P(value), over signals (the "interest" measure of Brin,
 * Motwani, Ullman & Tsur 1997; lift in later association-rule literature). A value needs some support in
 * the group (`minShare` of its signals, default 2%) so a single stray signal cannot top the list
 * (threshold: common practice, no source).
 */
import type { Dataset } from '../types.ts';

export interface LiftEntry {
  value: string;
  /** Share of the group's signals on items with this value. */
  share: number;
  lift: number;
}

export interface GroupDescription {
  group: number;
  customers: number;
  signals: number;
  categories: LiftEntry[];
  tags: LiftEntry[];
  /** Dense indices of the items the group engages with most among those it over-uses (lift > 1), most signals first. */
  examples: number[];
}

export interface DescribeOptions {
  top?: number;
  minShare?: number;
  /** Example items per group (default 5). */
  examples?: number;
}

/** The `n` items with most group signals among those with lift > 1 (more of the group's signals than everyone's). */
function exampleItems(counts: Int32Array, all: Int32Array, gTotal: number, total: number, n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < counts.length; i++) if ((counts[i] as number) > 0 && (counts[i] as number) / gTotal > (all[i] as number) / total) out.push(i);
  return out.sort((a, b) => (counts[b] as number) - (counts[a] as number) || a - b).slice(0, n);
}

function topByLift(groupCounts: Map<string, number>, allCounts: Map<string, number>, gTotal: number, total: number, top: number, minShare: number): LiftEntry[] {
  const out: LiftEntry[] = [];
  for (const [value, g] of groupCounts) {
    const share = g / gTotal;
    if (share < minShare) continue;
    const base = (allCounts.get(value) ?? 0) / total;
    out.push({ value, share, lift: share / base });
  }
  return out.sort((a, b) => b.lift - a.lift || b.share - a.share || (a.value < b.value ? -1 : 1)).slice(0, top);
}

/** Describes each of k groups given each dense customer's group (-1 = none). */
export function describeGroups(ds: Dataset, assignment: Int32Array, k: number, options: DescribeOptions = {}): GroupDescription[] {
  const top = options.top ?? 3;
  const minShare = options.minShare ?? 0.02;
  const catAll = new Map<string, number>();
  const tagAll = new Map<string, number>();
  const cat = Array.from({ length: k }, () => new Map<string, number>());
  const tag = Array.from({ length: k }, () => new Map<string, number>());
  const nExamples = options.examples ?? 5;
  const itemAll = new Int32Array(ds.items.length);
  const itemIn = Array.from({ length: k }, () => new Int32Array(ds.items.length));
  const sig = new Int32Array(k);
  const members = new Int32Array(k);
  for (const g of assignment) if (g >= 0 && g < k) members[g]!++;
  const inc = (m: Map<string, number>, v: string) => m.set(v, (m.get(v) ?? 0) + 1);
  const s = ds.signals;
  for (let q = 0; q < s.length; q++) {
    const it = ds.items[s.item[q]!]!;
    itemAll[s.item[q]!]!++;
    inc(catAll, it.category);
    for (const t of it.tags) inc(tagAll, t);
    const g = assignment[s.customer[q]!]!;
    if (g < 0 || g >= k) continue;
    sig[g]!++;
    itemIn[g]![s.item[q]!]!++;
    inc(cat[g]!, it.category);
    for (const t of it.tags) inc(tag[g]!, t);
  }
  return Array.from({ length: k }, (_, g) => ({
    group: g,
    customers: members[g]!,
    signals: sig[g]!,
    categories: sig[g]! === 0 ? [] : topByLift(cat[g]!, catAll, sig[g]!, s.length, top, minShare),
    tags: sig[g]! === 0 ? [] : topByLift(tag[g]!, tagAll, sig[g]!, s.length, top, minShare),
    examples: sig[g]! === 0 ? [] : exampleItems(itemIn[g]!, itemAll, sig[g]!, s.length, nExamples),
  }));
}
