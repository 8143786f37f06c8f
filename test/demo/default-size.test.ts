import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_DEFAULTS, generateDemoShop, type DemoSummary } from '../../demo-data/generator/index.ts';

// One full-size generation (a few seconds); the other demo tests use a small shop.
const root = mkdtempSync(join(tmpdir(), 'demo-default-'));
let summary: DemoSummary;
let items: Record<string, string>[];
beforeAll(async () => {
  summary = await generateDemoShop({ outDir: root });
  items = parse(readFileSync(join(root, 'items.csv'), 'utf8'), { columns: true }) as Record<string, string>[];
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

const near = (actual: number, target: number): boolean => Math.abs(actual - target) <= 0.1 * target;

describe('the default demo shop', () => {
  it('has about 2,500 items, 15,000 customers and 400,000 signals', () => {
    expect(DEMO_DEFAULTS).toEqual({ seed: 7, items: 2500, customers: 15_000, signals: 400_000 });
    expect(near(summary.items, 2500)).toBe(true);
    expect(near(summary.customers, 15_000)).toBe(true);
    expect(near(summary.signals, 400_000)).toBe(true);
    // The files agree with the summary: one line per row plus the header (no line breaks inside signal rows).
    const signalLines = readFileSync(join(root, 'signals.csv'), 'utf8').trimEnd().split('\n');
    expect(signalLines.length - 1).toBe(summary.signals);
    expect(items).toHaveLength(summary.items);
  });

  it('adds new items in every one of the 104 arrival weeks', () => {
    const weeks = new Set(items.map((r) => r.added_at));
    expect(weeks.size).toBe(104);
    expect(weeks.has('2026-11-23')).toBe(true);
  });
});
