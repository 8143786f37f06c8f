import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  CUSTOMERS_HEADER,
  ITEMS_HEADER,
  SIGNALS_HEADER,
  generateDemoShop,
  type DemoSummary,
} from '../../demo-data/generator/index.ts';
import { SIGNAL_KINDS } from '../../src-main/core/types.ts';
import { SMALL, readDemo, type DemoFiles } from './reference.ts';

const root = mkdtempSync(join(tmpdir(), 'demo-files-'));
let summary: DemoSummary;
let f: DemoFiles;
beforeAll(async () => {
  summary = await generateDemoShop({ seed: 3, ...SMALL, outDir: root });
  // csv-parse, an independent RFC 4180 reader, must read back every quoted title and description.
  f = readDemo(root);
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

const share = (rows: Record<string, string>[], test: (r: Record<string, string>) => boolean): number =>
  rows.filter(test).length / rows.length;

describe('demo shop files', () => {
  it('have exactly the headers the importer detects', () => {
    expect(f.header.items.join(',')).toBe('id,title,description,category,tags,supplier,price,added_at,promoted,available,image');
    expect(f.header.customers.join(',')).toBe('id,region,joined_at');
    expect(f.header.signals.join(',')).toBe('customer,item,kind,value,at');
    expect([ITEMS_HEADER, CUSTOMERS_HEADER, SIGNALS_HEADER]).toEqual([
      f.header.items.join(','),
      f.header.customers.join(','),
      f.header.signals.join(','),
    ]);
  });

  it("name a picture of the item's own category for nearly every item, each a 96 × 96 PNG beside items.csv", () => {
    const named = f.items.filter((r) => r.image !== '');
    // NO_PICTURE_SHARE (3%) of items are left without, so the demo shows the placeholder too.
    expect(named.length / f.items.length).toBeGreaterThan(0.9);
    expect(named.length).toBeLessThan(f.items.length);
    for (const r of named) expect(r.image).toBe(`pictures/${r.category!.replace(/\s+/g, '-')}-${r.image!.match(/-(\d)\.png$/)![1]}.png`);
    expect(summary.pictures).toHaveLength(72);
    for (const file of summary.pictures) {
      const png = readFileSync(file);
      // PNG specification (W3C / ISO/IEC 15948): 8-byte signature, then IHDR with width and height.
      expect(png.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))).toBe(true);
      expect(png.toString('latin1', 12, 16)).toBe('IHDR');
      expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([96, 96]);
    }
  });

  it('hold the requested number of rows, with unique ids', () => {
    expect(f.items).toHaveLength(SMALL.items);
    expect(f.customers).toHaveLength(SMALL.customers);
    expect(summary.signals).toBe(f.signals.length);
    expect(Math.abs(f.signals.length - SMALL.signals) / SMALL.signals).toBeLessThan(0.1);
    expect(new Set(f.items.map((r) => r.id)).size).toBe(SMALL.items);
    expect(new Set(f.customers.map((r) => r.id)).size).toBe(SMALL.customers);
    for (const r of f.items) expect(r.id).toMatch(/^I\d{5}$/);
    for (const r of f.customers) expect(r.id).toMatch(/^C\d{6}$/);
  });

  it('describe items with a catalogue-like spread of categories, suppliers and tags', () => {
    const categories = new Set(f.items.map((r) => r.category));
    const suppliers = new Set(f.items.map((r) => r.supplier));
    const tags = new Set(f.items.flatMap((r) => r.tags!.split('|')));
    expect(categories.size).toBe(12);
    expect(suppliers.size).toBeGreaterThanOrEqual(25);
    expect(tags.size).toBeGreaterThanOrEqual(50);
    for (const r of f.items) {
      expect(r.price).toMatch(/^\d+\.\d{2}$/);
      expect(Number(r.price)).toBeGreaterThan(0);
      expect(r.title!.length).toBeGreaterThan(3);
      const sentences = r.description!.split(/(?<=\.) /);
      expect(sentences.length).toBeGreaterThanOrEqual(1);
      expect(sentences.length).toBeLessThanOrEqual(3);
      expect(['true', 'false']).toContain(r.promoted);
      expect(['true', 'false']).toContain(r.available);
    }
  });

  it('mark about 8% of items promoted and about 5% out of stock', () => {
    expect(share(f.items, (r) => r.promoted === 'true')).toBeCloseTo(0.08, 2);
    expect(share(f.items, (r) => r.available === 'false')).toBeCloseTo(0.05, 2);
  });

  it('add items every week over two years, up to the last weeks', () => {
    const added = f.items.map((r) => r.added_at!).sort();
    for (const d of added) expect(d).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(added[0]).toBe('2024-12-02');
    expect(added.at(-1)! >= '2026-11-09').toBe(true);
    // Arrivals are on Mondays (ECMAScript Date: getUTCDay 1 = Monday).
    for (const d of new Set(added)) expect(new Date(d + 'T00:00:00Z').getUTCDay()).toBe(1);
    expect(new Set(added).size).toBeGreaterThan(60);
  });

  it('log signals with valid kinds and values, sorted by time inside the 18-month window', () => {
    const items = new Map(f.items.map((r) => [r.id!, r]));
    const customers = new Map(f.customers.map((r) => [r.id!, r]));
    const kinds = new Set<string>(SIGNAL_KINDS);
    const problems: string[] = [];
    let previous = '';
    f.signals.forEach((s, k) => {
      const at = s.at!;
      const item = items.get(s.item!);
      const customer = customers.get(s.customer!);
      const value = Number(s.value);
      const why = [
        !item && 'unknown item',
        !customer && 'unknown customer',
        !kinds.has(s.kind!) && 'unknown kind',
        !Number.isInteger(value) && 'value not whole',
        s.kind === 'rating' ? (value < 1 || value > 5) && 'rating outside 1..5' : value < 1 && 'value below 1',
        // ISO 8601 UTC, whole seconds; Date (ECMAScript date-time string format) must round-trip it.
        !/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/.test(at) && 'time format',
        new Date(at).toISOString() !== at.replace('Z', '.000Z') && 'time not a real instant',
        (at < '2025-05-30T00:00:00Z' || at >= '2026-11-30T00:00:00Z') && 'outside the window',
        at < previous && 'out of time order',
        // Nobody interacts with an item before it arrives, or before they joined.
        item && at.slice(0, 10) < item.added_at! && 'before the item arrived',
        customer && at.slice(0, 10) < customer.joined_at! && 'before the customer joined',
      ].filter(Boolean);
      if (why.length) problems.push(`row ${k + 2}: ${why.join(', ')}`);
      previous = at;
    });
    expect(problems.slice(0, 5)).toEqual([]);
    expect(summary.window).toEqual({ start: '2025-05-30', end: '2026-11-29' });
  });

  it('has far more views than purchases, and every kind the scenario uses', () => {
    const count = (k: string): number => f.signals.filter((s) => s.kind === k).length;
    for (const k of ['view', 'basket', 'purchase', 'rating', 'click', 'read']) expect(count(k), k).toBeGreaterThan(0);
    expect(count('view')).toBeGreaterThan(5 * count('purchase'));
    expect(count('basket')).toBeGreaterThan(count('purchase'));
  });

  it('uses invented, generic names for customers and regions', () => {
    const regions = new Set(f.customers.map((r) => r.region));
    for (const r of regions) expect(['north', 'south', 'east', 'west', 'coast', 'city', 'uplands', 'islands']).toContain(r);
    for (const r of f.customers) expect(r.joined_at! <= '2026-11-29').toBe(true);
  });

  it('writes a truth file naming a group for every item and customer', () => {
    expect(f.truth.seed).toBe(3);
    expect(f.truth.groups.length).toBe(8);
    const ids = new Set(f.truth.groups.map((g) => g.id));
    for (const g of f.truth.groups) {
      expect(g.name.length).toBeGreaterThan(0);
      expect(g.description.length).toBeGreaterThan(0);
      expect(g.topCategories.length).toBeGreaterThan(0);
    }
    expect(Object.keys(f.truth.itemGroup).sort()).toEqual(f.items.map((r) => r.id).sort());
    expect(Object.keys(f.truth.customerGroup).sort()).toEqual(f.customers.map((r) => r.id).sort());
    for (const g of [...Object.values(f.truth.itemGroup), ...Object.values(f.truth.customerGroup)]) expect(ids.has(g)).toBe(true);
  });
});
