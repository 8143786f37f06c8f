import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { SMALL, neighbourAgreement, readDemo, type DemoFiles } from './reference.ts';

const root = mkdtempSync(join(tmpdir(), 'demo-shape-'));
let f: DemoFiles;
beforeAll(async () => {
  await generateDemoShop({ seed: 5, ...SMALL, outDir: root });
  f = readDemo(root);
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

/**
 * Share of all signals in the given months (1 = January) that fall on items of `category`. A share,
 * not a count, so that the shop's growth over the window does not pass for a season.
 */
function seasonShare(category: string, months: number[]): number {
  const cat = new Map(f.items.map((r) => [r.id!, r.category!]));
  const inMonths = f.signals.filter((s) => months.includes(Number(s.at!.slice(5, 7))));
  return inMonths.filter((s) => cat.get(s.item!) === category).length / inMonths.length;
}

describe('demo shop behaviour', () => {
  it('has a long tail: the top 20% of items take most signals', () => {
    const counts = new Map<string, number>();
    for (const s of f.signals) counts.set(s.item!, (counts.get(s.item!) ?? 0) + 1);
    const sorted = f.items.map((r) => counts.get(r.id!) ?? 0).sort((a, b) => b - a);
    const top = sorted.slice(0, Math.ceil(sorted.length * 0.2)).reduce((a, b) => a + b, 0);
    // Common practice, no source: in retail interaction logs the top fifth of items draws well over
    // half of the activity (the "80/20" rule of thumb, from memory). Uniform demand would give 20%.
    expect(top / f.signals.length).toBeGreaterThan(0.5);
  });

  it('makes taste groups recoverable from co-interactions (item-kNN cosine, top 10)', () => {
    // Item-based CF, Sarwar et al. (2001): cosine between items' customer vectors. The other engineers'
    // model tests require >= 80% of an item's 10 nearest neighbours to share its group.
    const { mean, items } = neighbourAgreement(f, 10);
    expect(items).toBeGreaterThan(0.95 * f.items.length);
    expect(mean).toBeGreaterThanOrEqual(0.8);
  });

  it('does not make groups equal to categories', () => {
    // Guessing an item's group from its category alone (the majority group of that category) must
    // fall well short, and most categories must serve several groups.
    const byCategory = new Map<string, Map<string, number>>();
    for (const r of f.items) {
      const m = byCategory.get(r.category!) ?? new Map<string, number>();
      const g = f.truth.itemGroup[r.id!]!;
      m.set(g, (m.get(g) ?? 0) + 1);
      byCategory.set(r.category!, m);
    }
    let guessed = 0;
    for (const m of byCategory.values()) guessed += Math.max(...m.values());
    expect(guessed / f.items.length).toBeLessThan(0.7);
    const shared = [...byCategory.values()].filter((m) => m.size >= 2).length;
    expect(shared).toBeGreaterThanOrEqual(9);
  });

  it('keeps customers mostly within their own group (about 85-90% of interactions)', () => {
    const own = f.signals.filter((s) => f.truth.itemGroup[s.item!] === f.truth.customerGroup[s.customer!]).length;
    const ownShare = own / f.signals.length;
    expect(ownShare).toBeGreaterThan(0.83);
    expect(ownShare).toBeLessThan(0.93);
  });

  it('follows the seasons: seeds in spring, bulbs in spring and autumn, indoor plants in winter', () => {
    expect(seasonShare('seeds', [3, 4])).toBeGreaterThan(1.5 * seasonShare('seeds', [9, 10]));
    expect(seasonShare('bulbs', [3, 4])).toBeGreaterThan(1.5 * seasonShare('bulbs', [6, 7]));
    expect(seasonShare('bulbs', [9, 10])).toBeGreaterThan(1.5 * seasonShare('bulbs', [6, 7]));
    expect(seasonShare('indoor plants', [12, 1])).toBeGreaterThan(1.5 * seasonShare('indoor plants', [6, 7]));
  });

  it('has repeat purchases, mostly of consumables (compost, seeds)', () => {
    const cat = new Map(f.items.map((r) => [r.id!, r.category!]));
    const bought = new Map<string, number>();
    for (const s of f.signals) if (s.kind === 'purchase') bought.set(`${s.customer} ${s.item}`, (bought.get(`${s.customer} ${s.item}`) ?? 0) + 1);
    const repeated = [...bought.entries()].filter(([, n]) => n > 1).map(([key]) => cat.get(key.split(' ')[1]!)!);
    expect(repeated.length).toBeGreaterThan(30);
    expect(repeated.filter((c) => c === 'compost' || c === 'seeds').length / repeated.length).toBeGreaterThan(0.9);
  });

  it('leaves the newest items with few signals (cold start)', () => {
    const counts = new Map<string, number>();
    for (const s of f.signals) counts.set(s.item!, (counts.get(s.item!) ?? 0) + 1);
    const median = (xs: number[]): number => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? 0;
    const recent = f.items.filter((r) => r.added_at! >= '2026-11-01').map((r) => counts.get(r.id!) ?? 0);
    const older = f.items.filter((r) => r.added_at! < '2026-06-01').map((r) => counts.get(r.id!) ?? 0);
    expect(recent.length).toBeGreaterThan(0);
    expect(median(recent)).toBeLessThan(median(older) / 3);
  });
});
