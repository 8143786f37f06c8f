/**
 * The main reason an item was proposed, in the editor's words and from the data itself: the items this
 * shelf's audience holds that lead to it, the anchor it resembles and what they share, the counts behind
 * a rise, the day it was added, how many customers chose it. The contribution bars say how much each
 * part weighed; this says why, with the evidence behind the part that weighed most. A reason is
 * structured (the api carries it, the words are built where it is shown, with that place's number
 * format); when the part that weighed most has no evidence to show (an item that is not rising, an
 * audience that holds nothing like it), the next part is tried, and with none there is no reason at all:
 * never words the data does not back.
 */
import type { Component } from '../scoring/components.ts';
import { SIGNAL_KINDS, DAY_MS, type Item, type SignalKind } from '../types.ts';
import type { TrendWindows } from '../models/popularity.ts';

export interface NamedItem {
  item: string;
  title: string;
}

/** An item the audience holds that leads to the candidate: how many of the audience did what with it. */
export interface AudienceHeld extends NamedItem {
  people: number;
  did: SignalKind;
}

export type Reason =
  | { kind: 'audience'; audienceSize: number; everyone: boolean; held: AudienceHeld[] }
  | { kind: 'anchor'; via: 'content' | 'collaborative'; anchor: NamedItem; sharedTags: string[]; sameCategory: string | null; sameSupplier: string | null }
  | { kind: 'rising'; recent: number; previous: number; windowDays: number; noun: SignalKind | null }
  | { kind: 'new'; ageDays: number }
  | { kind: 'popular'; customers: number; customerCount: number };

export type ReasonKind = Reason['kind'];

/** What a candidate's score was made of (a PoolScores explanation carries these). */
export interface ScoreParts {
  index: number;
  coldStart: boolean;
  contributions: Record<Component, number>;
  /** Anchors behind the content and collaborative parts, strongest first (dense items). */
  evidence: { content: { item: number }[]; collaborative: { item: number }[] };
  /**
   * Whether content stood in for a cold item's collaborative and audience parts: the scorer does so only
   * when content was available (anchors and a content model; PoolScores.available.content). Absent: taken
   * to be so when there is content evidence.
   */
  contentStandsIn?: boolean;
}

/** The data reasons are drawn from. Items are dense indices into `items`. */
export interface ReasonFacts {
  items: readonly Item[];
  editionDate: number;
  customersPerItem: Int32Array;
  customerCount: number;
  /** The trend's two windows as the shelf measured them; null when there are no signals. */
  trend: TrendWindows | null;
  /** The audience's held items leading to item i, strongest first; null when no audience part was scored. */
  audience: { size: number; heldFor(i: number): AudienceHeld[] } | null;
}

/** Items the audience holds that lead to a candidate: at most this many are named. */
export const AUDIENCE_ITEMS_NAMED = 2;
/** Shared tags named beside an anchor. */
export const TAGS_NAMED = 3;

const named = (it: Item): NamedItem => ({ item: it.externalId, title: it.title });

function anchorReason(facts: ReasonFacts, i: number, anchor: number | undefined, via: 'content' | 'collaborative'): Reason | null {
  if (anchor === undefined) return null;
  const a = facts.items[anchor];
  const it = facts.items[i];
  if (!a || !it) return null;
  const mine = new Set(it.tags);
  const sharedTags = a.tags.filter((t, k) => mine.has(t) && a.tags.indexOf(t) === k).slice(0, TAGS_NAMED);
  return {
    kind: 'anchor',
    via,
    anchor: named(a),
    sharedTags,
    sameCategory: a.category !== '' && a.category === it.category ? a.category : null,
    sameSupplier: a.supplier !== '' && a.supplier === it.supplier ? a.supplier : null,
  };
}

function risingReason(facts: ReasonFacts, i: number): Reason | null {
  const t = facts.trend;
  if (!t) return null;
  const recent = t.recent[i]!;
  const previous = t.previous[i]!;
  if (!(recent > previous)) return null; // the trend part may weigh much and still show no rise
  const k = t.kind[i]!;
  return { kind: 'rising', recent, previous, windowDays: t.windowDays, noun: k >= 0 ? SIGNAL_KINDS[k]! : null };
}

function newReason(facts: ReasonFacts, i: number): Reason | null {
  const at = facts.items[i]?.addedAt;
  if (at === null || at === undefined || !Number.isFinite(at)) return null;
  const ageDays = Math.floor((facts.editionDate - at) / DAY_MS);
  return ageDays >= 0 ? { kind: 'new', ageDays } : null;
}

function popularReason(facts: ReasonFacts, i: number): Reason | null {
  const customers = facts.customersPerItem[i] ?? 0;
  return customers > 0 ? { kind: 'popular', customers, customerCount: facts.customerCount } : null;
}

function audienceReason(facts: ReasonFacts, i: number): Reason | null {
  if (!facts.audience) return null;
  const held = facts.audience.heldFor(i).slice(0, AUDIENCE_ITEMS_NAMED);
  const size = facts.audience.size;
  return held.length > 0 ? { kind: 'audience', audienceSize: size, everyone: size === facts.customerCount, held } : null;
}

/**
 * The main reason for a candidate: the evidence behind its largest contribution, else the next one's.
 * A cold item's collaborative and audience parts are its content similarity standing in (scoring/
 * hybrid.ts), so their evidence is the content anchor's.
 */
export function mainReason(x: ScoreParts, facts: ReasonFacts): Reason | null {
  const parts = (Object.entries(x.contributions) as [Component, number][])
    .filter(([, v]) => v > 0)
    .sort((a, b) => b[1] - a[1]);
  const i = x.index;
  for (const [part] of parts) {
    let r: Reason | null = null;
    const stand = x.coldStart && (x.contentStandsIn ?? x.evidence.content.length > 0) && (part === 'collaborative' || part === 'audience');
    if (part === 'content' || stand) r = anchorReason(facts, i, x.evidence.content[0]?.item ?? x.evidence.collaborative[0]?.item, 'content');
    else if (part === 'collaborative') r = anchorReason(facts, i, x.evidence.collaborative[0]?.item, 'collaborative');
    else if (part === 'audience') r = audienceReason(facts, i);
    else if (part === 'trend') r = risingReason(facts, i);
    else if (part === 'freshness') r = newReason(facts, i);
    else if (part === 'popularity') r = popularReason(facts, i);
    if (r) return r;
  }
  return null;
}

/**
 * Distinct audience members per item and per item and signal kind, from the audience's own signals
 * (`ptr`/`signal`: the signals of customer u are signal[ptr[u] .. ptr[u + 1]), as world.byCustomer).
 */
export interface AudienceHoldings {
  size: number;
  people: Int32Array;
  /** people by kind: [i * SIGNAL_KINDS.length + kind]. */
  peopleByKind: Int32Array;
}

export function audienceHoldings(
  audience: Int32Array,
  byCustomer: { ptr: Int32Array; signal: Int32Array },
  signals: { item: Int32Array; kind: Uint8Array },
  itemCount: number,
): AudienceHoldings {
  const K = SIGNAL_KINDS.length;
  const people = new Int32Array(itemCount);
  const peopleByKind = new Int32Array(itemCount * K);
  const last = new Int32Array(itemCount).fill(-1);
  const lastKind = new Int32Array(itemCount * K).fill(-1);
  const { ptr, signal } = byCustomer;
  for (const u of audience) {
    for (let p = ptr[u]!, end = ptr[u + 1]!; p < end; p++) {
      const s = signal[p]!;
      const i = signals.item[s]!;
      const ik = i * K + signals.kind[s]!;
      if (last[i] !== u) {
        last[i] = u;
        people[i]!++;
      }
      if (lastKind[ik] !== u) {
        lastKind[ik] = u;
        peopleByKind[ik]!++;
      }
    }
  }
  return { size: audience.length, people, peopleByKind };
}

/**
 * The items the audience holds that contribute most to its score for item i, under an item-based model:
 * a customer's score for i sums the similarities of i to the items the customer has (Sarwar, Karypis,
 * Konstan & Riedl 2001, the item-based prediction), so over the audience item j contributes
 * people(j) × sim(j, i). `similarity` is the model's similarity of every item to i. Each named item is
 * said with the signal kind most of its holders share (ties: the kind listed first, views before
 * purchases, as SIGNAL_KINDS orders them — a purchase is then said only where at least as many bought).
 */
export function heldLeadingTo(h: AudienceHoldings, similarity: Float32Array, i: number, items: readonly Item[], count = AUDIENCE_ITEMS_NAMED): AudienceHeld[] {
  const K = SIGNAL_KINDS.length;
  const best: { j: number; w: number }[] = [];
  for (let j = 0; j < h.people.length; j++) {
    if (j === i) continue;
    const w = h.people[j]! * similarity[j]!;
    if (!(w > 0)) continue;
    if (best.length < count || w > best[best.length - 1]!.w) {
      best.push({ j, w });
      best.sort((a, b) => b.w - a.w || a.j - b.j);
      if (best.length > count) best.pop();
    }
  }
  return best.map(({ j }) => {
    let k = 0;
    for (let q = 1; q < K; q++) if (h.peopleByKind[j * K + q]! > h.peopleByKind[j * K + k]!) k = q;
    const it = items[j]!;
    return { ...named(it), people: h.peopleByKind[j * K + k]!, did: SIGNAL_KINDS[k]! };
  });
}
