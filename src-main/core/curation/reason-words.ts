/**
 * A reason (reasons.ts) in words, one sentence an editor reads before any bar. Numbers go through the
 * caller's formatter (the screen's locale, or plain digits for the command line), so the words live once
 * and every place shows the same sentence.
 */
import type { SignalKind } from '../types.ts';
import type { Reason } from './reasons.ts';

export interface NumberWords {
  /** A whole count, with the place's thousands separators. */
  count(n: number): string;
}

export const plainNumbers: NumberWords = { count: (n) => String(n) };

/** What a person did with an item, as a past-tense verb phrase. */
const DID: Readonly<Record<SignalKind, string>> = {
  view: 'viewed',
  basket: 'put in a basket',
  purchase: 'bought',
  rating: 'rated',
  read: 'read',
  click: 'clicked on',
  other: 'chose',
};

/** Signals of one kind, as a plural noun. */
const SIGNALS: Readonly<Record<SignalKind, string>> = {
  view: 'views',
  basket: 'basket adds',
  purchase: 'purchases',
  rating: 'ratings',
  read: 'reads',
  click: 'clicks',
  other: 'interactions',
};

function list(words: string[]): string {
  if (words.length <= 1) return words[0] ?? '';
  return `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}

function period(days: number): string {
  if (days % 7 === 0) {
    const weeks = days / 7;
    return weeks === 1 ? 'a week' : weeks === 2 ? 'two weeks' : `${weeks} weeks`;
  }
  return days === 1 ? 'a day' : `${days} days`;
}

const quoted = (s: string) => `“${s}”`;

function daysBefore(n: number, c: NumberWords): string {
  if (n === 0) return 'added on the edition date';
  return `added ${c.count(n)} day${n === 1 ? '' : 's'} before the edition date`;
}

export function reasonWords(r: Reason, c: NumberWords = plainNumbers): string {
  switch (r.kind) {
    case 'audience': {
      const verbs = new Set(r.held.map((h) => h.did));
      const what =
        verbs.size === 1 ? `${DID[r.held[0]!.did]} ${list(r.held.map((h) => quoted(h.title)))}` : list(r.held.map((h) => `${DID[h.did]} ${quoted(h.title)}`));
      // A shelf for everyone says "customers": "people in this audience" would suggest a narrower group.
      const [who, unit] = r.everyone ? ['Customers', 'customers'] : ['People in this audience', 'people'];
      return `${who} ${what} (${list(r.held.map((h) => c.count(h.people)))} of ${c.count(r.audienceSize)} ${unit})`;
    }
    case 'anchor': {
      const shared: string[] = [];
      if (r.sharedTags.length > 0) shared.push(`shared tag${r.sharedTags.length === 1 ? '' : 's'} ${r.sharedTags.join(', ')}`);
      if (r.sameCategory !== null) shared.push(`same category, ${r.sameCategory}`);
      if (r.sameSupplier !== null) shared.push(`same supplier, ${r.sameSupplier}`);
      const why = r.via === 'collaborative' ? ['chosen by the same customers', ...shared] : shared.length > 0 ? shared : ['similar in title, description or attributes'];
      return `Like anchor ${quoted(r.anchor.title)}: ${why.join('; ')}`;
    }
    case 'rising': {
      const noun = r.noun === null ? 'interactions' : SIGNALS[r.noun];
      const span = period(r.windowDays);
      if (r.previous === 0) return `Rising: ${c.count(r.recent)} ${noun} in the last ${span}, none in the ${span} before`;
      const ratio = r.recent / r.previous;
      // "up 1,600%" reads worse than "17 times as many"; below three times a percentage says it better.
      const counts = `(${c.count(r.previous)} → ${c.count(r.recent)})`;
      if (ratio >= 3) return `Rising: ${c.count(Math.round(ratio))} times as many ${noun} in the last ${span} as in the ${span} before ${counts}`;
      return `Rising: ${noun} up ${c.count(Math.round((ratio - 1) * 100))}% in ${span} ${counts}`;
    }
    case 'new': {
      const when = r.ageDays <= 7 ? 'New this week' : r.ageDays <= 31 ? 'New this month' : 'Recently added';
      return `${when}: ${daysBefore(r.ageDays, c)}`;
    }
    case 'popular': {
      const share = r.customerCount > 0 ? `, ${shareWords(r.customers / r.customerCount)} of all customers` : '';
      return `Popular: chosen by ${c.count(r.customers)} customer${r.customers === 1 ? '' : 's'}${share}`;
    }
  }
}

/** A share as a percentage that never reads 0% for a non-zero share. */
function shareWords(s: number): string {
  const p = s * 100;
  if (p >= 1) return `${Math.round(p)}%`;
  return p >= 0.1 ? `${p.toFixed(1)}%` : 'under 0.1%';
}
