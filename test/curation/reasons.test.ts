import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { reasonWords } from '../../src-main/core/curation/reason-words.ts';
import { audienceHoldings, heldLeadingTo, mainReason, type ReasonFacts, type ScoreParts } from '../../src-main/core/curation/reasons.ts';
import { trendRatios, trendWindows } from '../../src-main/core/models/popularity.ts';
import type { Component } from '../../src-main/core/scoring/components.ts';
import { competitionRanksInto, topShare } from '../../src-main/core/scoring/rank.ts';
import { DAY_MS, SIGNAL_KIND_CODE, type Dataset, type Item, type SignalKind } from '../../src-main/core/types.ts';
import { EDITION, item } from './helpers.ts';

const ZERO: Record<Component, number> = { content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 0, freshness: 0 };
const parts = (index: number, c: Partial<Record<Component, number>>, over: Partial<ScoreParts> = {}): ScoreParts => ({
  index,
  coldStart: false,
  contributions: { ...ZERO, ...c },
  evidence: { content: [], collaborative: [] },
  ...over,
});

/** Signals as columns; times in days before EDITION. */
function dataset(items: Item[], rows: [customer: number, item: number, kind: SignalKind, daysBefore: number][]): Dataset {
  const customers = 1 + Math.max(0, ...rows.map((r) => r[0]));
  return {
    items,
    customerIds: Int32Array.from({ length: customers }, (_, u) => u + 1),
    customerExternalIds: Array.from({ length: customers }, (_, u) => `C-${u + 1}`),
    signals: {
      length: rows.length,
      customer: Int32Array.from(rows, (r) => r[0]),
      item: Int32Array.from(rows, (r) => r[1]),
      kind: Uint8Array.from(rows, (r) => SIGNAL_KIND_CODE[r[2]]),
      value: new Float32Array(rows.length).fill(1),
      at: Float64Array.from(rows, (r) => EDITION - r[3] * DAY_MS),
    },
  };
}

function byCustomer(ds: Dataset): { ptr: Int32Array; signal: Int32Array } {
  const n = ds.customerIds.length;
  const ptr = new Int32Array(n + 1);
  for (let k = 0; k < ds.signals.length; k++) ptr[ds.signals.customer[k]! + 1]!++;
  for (let u = 0; u < n; u++) ptr[u + 1]! += ptr[u]!;
  const fill = ptr.slice(0, n);
  const signal = new Int32Array(ds.signals.length);
  for (let k = 0; k < ds.signals.length; k++) signal[fill[ds.signals.customer[k]!]!++] = k;
  return { ptr, signal };
}

const facts = (items: Item[], over: Partial<ReasonFacts> = {}): ReasonFacts => ({
  items,
  editionDate: EDITION,
  customersPerItem: new Int32Array(items.length),
  customerCount: 0,
  trend: null,
  audience: null,
  ...over,
});

describe('rank within the pool', () => {
  // External check: scipy.stats.rankdata's documented example, rankdata([0, 2, 3, 2], method='min') =
  // [1, 2, 4, 2] (SciPy reference page for scipy.stats.rankdata). Our ranks are by score descending, so the
  // negated values must give the same ranks: standard competition ("1224") ranking.
  it("matches scipy's rankdata(method='min') on the negated scores", () => {
    const out = new Int32Array(4);
    competitionRanksInto(Float32Array.of(-0, -2, -3, -2), 4, out, new Float64Array(4));
    expect(Array.from(out)).toEqual([1, 2, 4, 2]);
  });

  it('gives distinct scores distinct ranks and distinct top shares, each rank being 1 + the number scoring higher', () => {
    fc.assert(
      fc.property(fc.array(fc.float({ noNaN: true, min: -5, max: 5 }), { minLength: 1, maxLength: 60 }), (xs) => {
        const v = Float32Array.from(xs);
        const n = v.length;
        const r = new Int32Array(n);
        competitionRanksInto(v, n, r, new Float64Array(n));
        for (let p = 0; p < n; p++) {
          expect(r[p]).toBe(1 + xs.filter((x) => Math.fround(x) > v[p]!).length);
          for (let q = 0; q < n; q++) {
            if (v[p]! > v[q]!) expect(topShare(r[p]!, n)).toBeLessThan(topShare(r[q]!, n));
            if (v[p] === v[q]) expect(r[p]).toBe(r[q]);
          }
        }
      }),
    );
  });

  it('tells the eight best of a thousand apart, where the mid-rank percentile says "top 1%" for all of them', () => {
    const n = 1000;
    const v = Float32Array.from({ length: n }, (_, p) => 1 - p / n);
    const r = new Int32Array(n);
    competitionRanksInto(v, n, r, new Float64Array(n));
    expect(Array.from(r.subarray(0, 8))).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(() => topShare(0, n)).toThrow('rank 0 is outside 1..1000');
  });
});

describe('trend windows', () => {
  const items = [item(1), item(2), item(3)];
  // item 0: 4 views in the recent window and 3 in the previous (the view 14 days before the edition falls 1 ms before the recent window opens); item 1: a purchase and a view recently; item 2 none.
  const ds = dataset(items, [
    [0, 0, 'view', 20], [1, 0, 'view', 15],
    [0, 0, 'view', 1], [1, 0, 'view', 2], [2, 0, 'view', 3], [3, 0, 'view', 13], [4, 0, 'view', 14],
    [0, 1, 'purchase', 5], [1, 1, 'view', 6],
    [2, 2, 'view', 40],
  ]);
  const now = EDITION + 1;

  it('counts each window by the documented bounds, [now − 14 d, now) and [now − 28 d, now − 14 d), and names the one kind', () => {
    const t = trendWindows(ds, { now });
    expect(Array.from(t.recent)).toEqual([4, 2, 0]);
    expect(Array.from(t.previous)).toEqual([3, 0, 0]);
    expect(Array.from(t.kind)).toEqual([SIGNAL_KIND_CODE.view, -2, -1]);
  });

  it('gives the smoothed ratio (recent + 5) / (previous + 5) from the same counts', () => {
    expect(Array.from(trendRatios(ds, { now }))).toEqual([9 / 8, 7 / 5, 1]);
  });
});

describe('the main reason', () => {
  const items = [
    item(1, { title: 'Oak Lamp', tags: ['oak', 'linen', 'brass'], category: 'Lamps' }),
    item(2, { title: 'Oak Shade', tags: ['brass', 'oak', 'wool'], category: 'Lamps', supplier: 'Pebble & Pine' }),
    item(3, { title: 'Clay Mug', tags: ['clay'], category: 'Mugs', addedAt: EDITION - 12 * DAY_MS }),
    item(4, { title: 'Wool Rug', tags: [], category: 'Rugs', addedAt: null }),
  ];

  it('names the anchor and the tags, category and supplier they share, for the content part', () => {
    const x = parts(1, { content: 0.6, popularity: 0.2 }, { evidence: { content: [{ item: 0 }], collaborative: [] } });
    const r = mainReason(x, facts(items, { customersPerItem: Int32Array.of(0, 9, 0, 0) }));
    expect(r).toEqual({ kind: 'anchor', via: 'content', anchor: { item: 'sku-1', title: 'Oak Lamp' }, sharedTags: ['oak', 'brass'], sameCategory: 'Lamps', sameSupplier: null });
    expect(reasonWords(r!)).toBe('Like anchor “Oak Lamp”: shared tags oak, brass; same category, Lamps');
  });

  it("says the collaborative part is the same customers' choice, and a cold item's stands on its content anchor", () => {
    const ev = { content: [{ item: 2 }], collaborative: [{ item: 0 }] };
    const warm = mainReason(parts(1, { collaborative: 0.5 }, { evidence: ev }), facts(items));
    expect(reasonWords(warm!)).toBe('Like anchor “Oak Lamp”: chosen by the same customers; shared tags oak, brass; same category, Lamps');
    const cold = mainReason(parts(1, { collaborative: 0.5 }, { coldStart: true, evidence: ev }), facts(items));
    expect(cold).toMatchObject({ kind: 'anchor', via: 'content', anchor: { title: 'Clay Mug' } });
    expect(reasonWords(cold!)).toBe('Like anchor “Clay Mug”: similar in title, description or attributes');
    // Without anchors the scorer keeps a cold item's own audience part (hybrid.ts): the audience speaks for it.
    const held = [{ item: 'sku-1', title: 'Oak Lamp', people: 3, did: 'purchase' as const }];
    const audience = facts(items, { audience: { size: 9, heldFor: () => held }, customerCount: 20 });
    const own = mainReason(parts(1, { audience: 0.5 }, { coldStart: true, contentStandsIn: false }), audience);
    expect(reasonWords(own!)).toBe('People in this audience bought “Oak Lamp” (3 of 9 people)');
  });

  it('says an item is rising only when its recent window holds more than the one before, else the next part speaks', () => {
    const ds = dataset(items, [
      [0, 2, 'view', 20], [1, 2, 'view', 16], [2, 2, 'view', 15], [3, 2, 'view', 18], [4, 2, 'view', 19],
      [0, 2, 'view', 1], [1, 2, 'view', 2], [2, 2, 'view', 3], [3, 2, 'view', 4], [4, 2, 'view', 5], [5, 2, 'view', 6], [6, 2, 'view', 7],
      [0, 3, 'view', 2], [1, 3, 'view', 20],
    ]);
    const f = facts(items, { trend: trendWindows(ds, { now: EDITION + 1 }), customersPerItem: Int32Array.of(0, 0, 7, 2), customerCount: 7 });
    const rising = mainReason(parts(2, { trend: 0.5, freshness: 0.1 }), f);
    expect(rising).toEqual({ kind: 'rising', recent: 7, previous: 5, windowDays: 14, noun: 'view' });
    expect(reasonWords(rising!)).toBe('Rising: views up 40% in two weeks (5 → 7)');
    // Item 3 has as many signals in each window: its trend part cannot say "rising"; popularity speaks.
    const flat = mainReason(parts(3, { trend: 0.5, popularity: 0.1 }), f);
    expect(reasonWords(flat!)).toBe('Popular: chosen by 2 customers, 29% of all customers');
    // A new item's first window: "none before", never a division by zero.
    const fresh = facts(items, { trend: trendWindows(dataset(items, [[0, 1, 'purchase', 1], [1, 1, 'purchase', 2]]), { now: EDITION + 1 }) });
    expect(reasonWords(mainReason(parts(1, { trend: 1 }), fresh)!)).toBe('Rising: 2 purchases in the last two weeks, none in the two weeks before');
    const many = { kind: 'rising', recent: 68, previous: 4, windowDays: 14, noun: null } as const;
    expect(reasonWords(many)).toBe('Rising: 17 times as many interactions in the last two weeks as in the two weeks before (4 → 68)');
  });

  it('says how new an item is from the day it was added, and nothing when that day is unknown', () => {
    const r = mainReason(parts(2, { freshness: 0.4 }), facts(items));
    expect(r).toEqual({ kind: 'new', ageDays: 12 });
    expect(reasonWords(r!)).toBe('New this month: added 12 days before the edition date');
    expect(mainReason(parts(3, { freshness: 0.4 }), facts(items))).toBeNull();
  });

  it("formats every count with the caller's thousands separators", () => {
    const r = { kind: 'popular', customers: 12345, customerCount: 2_000_000 } as const;
    expect(reasonWords(r, { count: (n) => n.toLocaleString('en-GB') })).toBe('Popular: chosen by 12,345 customers, 0.6% of all customers');
  });
});

describe('what the audience holds that leads to an item', () => {
  const items = [item(1, { title: 'Oak Lamp' }), item(2, { title: 'Oak Shade' }), item(3, { title: 'Clay Mug' }), item(4, { title: 'Wool Rug' })];
  // Customers 0-3 are the audience; customer 4 is not (its signals must not count).
  const ds = dataset(items, [
    [0, 0, 'purchase', 3], [0, 0, 'view', 4], [1, 0, 'purchase', 5], [2, 0, 'view', 2],
    [1, 1, 'view', 3], [2, 1, 'view', 3], [3, 1, 'view', 3],
    [3, 2, 'purchase', 1],
    [4, 2, 'purchase', 1], [4, 0, 'view', 1],
  ]);
  const audience = Int32Array.of(0, 1, 2, 3);
  const h = audienceHoldings(audience, byCustomer(ds), ds.signals, items.length);
  // A symmetric item-item similarity (what item-kNN's cosine is before each item keeps its top neighbours).
  const S = [
    [0, 0.2, 0.1, 0.9],
    [0.2, 0, 0.3, 0.5],
    [0.1, 0.3, 0, 0.4],
    [0.9, 0.5, 0.4, 0],
  ];

  it('counts distinct audience members per item and per kind, leaving others out', () => {
    expect(Array.from(h.people)).toEqual([3, 3, 1, 0]);
    const K = 7;
    expect(h.peopleByKind[0 * K + SIGNAL_KIND_CODE.purchase]).toBe(2);
    expect(h.peopleByKind[0 * K + SIGNAL_KIND_CODE.view]).toBe(2);
  });

  // External check: the item-based prediction of Sarwar, Karypis, Konstan & Riedl (2001, §3.2.1) scores item i
  // for customer u by summing sim(i, j) over the items j that u has (with presence ratings); summed over the
  // audience, item j contributes people(j) × sim(j, i). Hand-computed for item 3 (Wool Rug): Oak Lamp 3 × 0.9 =
  // 2.7, Oak Shade 3 × 0.5 = 1.5, Clay Mug 1 × 0.4 = 0.4; together the audience's summed prediction 4.6.
  it('names the held items that add most to the summed item-based prediction, each with what most of its holders did', () => {
    const row = Float32Array.from(S[3]!);
    const held = heldLeadingTo(h, row, 3, items, 3);
    expect(held.map((x) => x.title)).toEqual(['Oak Lamp', 'Oak Shade', 'Clay Mug']);
    let summed = 0;
    const hist = [...audience].map((u) => new Set(Array.from({ length: ds.signals.length }, (_, k) => k).filter((k) => ds.signals.customer[k] === u).map((k) => ds.signals.item[k]!)));
    for (const has of hist) for (const j of has) summed += S[j]![3]!;
    expect(summed).toBeCloseTo(2.7 + 1.5 + 0.4, 6);
    // Oak Lamp: two bought it and two viewed it: the tie goes to the kind listed first (view).
    expect(held[0]).toMatchObject({ people: 2, did: 'view' });
    expect(held[2]).toMatchObject({ people: 1, did: 'purchase' });
    const aud = { size: 4, heldFor: (i: number) => heldLeadingTo(h, Float32Array.from(S[i]!), i, items) };
    const r = mainReason(parts(3, { audience: 0.7 }), facts(items, { audience: aud, customerCount: 5 }));
    expect(reasonWords(r!, { count: (n) => n.toLocaleString('en-GB') })).toBe('People in this audience viewed “Oak Lamp” and “Oak Shade” (2 and 3 of 4 people)');
    // An audience of every customer is said as customers.
    const all = mainReason(parts(3, { audience: 0.7 }), facts(items, { audience: aud, customerCount: 4 }));
    expect(reasonWords(all!)).toBe('Customers viewed “Oak Lamp” and “Oak Shade” (2 and 3 of 4 customers)');
  });

  it('gives no audience reason when the audience holds nothing like the item, and the next part speaks', () => {
    const none = facts(items, { audience: { size: 4, heldFor: () => [] }, customersPerItem: Int32Array.of(4, 3, 2, 1), customerCount: 5 });
    expect(mainReason(parts(3, { audience: 0.7, popularity: 0.1 }), none)).toEqual({ kind: 'popular', customers: 1, customerCount: 5 });
    expect(mainReason(parts(3, { audience: 0.7 }), facts(items))).toBeNull();
  });
});
