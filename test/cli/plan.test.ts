import { describe, expect, it } from 'vitest';
import { seededCli } from './seeded-cli.ts';

/** `shelfwright plan` on the seeded workspace (40 items, 4 categories, 5 suppliers). */
async function withShelves() {
  const cli = seededCli('plan.sqlite');
  expect((await cli.run('edition', 'new', 'week 9', '--date', '2026-02-23')).code).toBe(0);
  expect((await cli.run('shelf', 'add', 'week 9', 'Front', '--size', '4', '--quota', 'category:2', '--rest', '1')).code).toBe(0);
  expect((await cli.run('shelf', 'add', 'week 9', 'More', '--size', '3')).code).toBe(0);
  return cli;
}

describe('shelfwright plan', () => {
  it('plans the weeks as a calendar with the meter, then re-solves after a pin and makes a draft', async () => {
    const cli = await withShelves();
    const r = await cli.run('plan', 'Front', '--shelves', 'More', '--from', '2026-03-02', '--weeks', '3', '--name', 'spring');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toContain("plan 'spring': Front, More from edition 'week 9', 3 weeks from 2026-03-02");
    expect(r.out).toMatch(/slot\s+week 1 2026-03-02\s+week 2 2026-03-09\s+week 3 2026-03-16/);
    expect(r.out).toMatch(/horizon\s+\d+/);
    // 120 days of history: too short for a held-out year, and the command says so rather than print a number.
    expect(r.out).toContain('seasonal fit: no forecast error measured (that needs a year of dated history plus held-out weeks)');
    const plan = await cli.json('plan', 'show', 'spring');
    const unused = Array.from({ length: 40 }, (_, k) => `SKU-${String(k + 1).padStart(3, '0')}`).find(
      (x) => !plan.weeks.some((w: { shelves: { slots: { item: string }[] }[] }) => w.shelves.some((s) => s.slots.some((t) => t.item === x))),
    )!;
    const again = await cli.json('plan', 'Front', '--name', 'spring', '--pin', `${unused}@2`, '--lock', '1', '--draft', '2');
    expect(again.plan.weeks[1].shelves[0].slots.map((s: { item: string }) => s.item)).toContain(unused);
    expect(again.plan.edits.locks).toEqual([{ week: 1, shelf: 'Front' }]);
    expect(again.draft.edition).toBe('spring · week 2');
    expect(again.draft.shelves[0].items).toEqual(again.plan.weeks[1].shelves[0].slots.map((s: { item: string }) => s.item));
    expect((await cli.run('plan', 'list')).out).toMatch(/spring\s+week 9\s+Front, More\s+2026-03-02\s+3/);
  });

  it('exits 2 and names the conflicting rules with their least relaxation when no plan exists', async () => {
    const cli = await withShelves();
    // 40 items, 4 slots × 12 weeks = 48 placements, each item at most one week.
    const r = await cli.run('plan', 'Front', '--from', '2026-03-02', '--weeks', '12', '--max-appearances', '1', '--rest-weeks', '0');
    expect(r.code).toBe(2);
    expect(r.out).toContain('the rules cannot all hold; the plan above breaks some and was not stored.');
    expect(r.out).toContain('maxAppearances: at most 1 → 2 weeks per item');
  });

  it('refuses bad flags with a usage error naming them', async () => {
    const cli = await withShelves();
    expect((await cli.run('plan', 'Front', '--from', '2026-03-02', '--pin', 'SKU-001')).err).toContain("--pin must be ITEM@WEEK[@SHELF], got 'SKU-001'");
    expect((await cli.run('plan', 'Front', '--from', '2026-03-02', '--commit', 'Mossgate')).err).toContain("--commit must be SUPPLIER=N with N a whole number >= 1, got 'Mossgate'");
    expect((await cli.run('plan', 'Front', '--from', '2026-03-02', '--supplier-max-share', '2')).err).toContain("--supplier-max-share must be a share between 0 and 1, got '2'");
    expect((await cli.run('plan', 'Front', '--from', '2026-03-02', '--lock', '1')).err).toContain('lock: there is no stored plan to lock a week of; plan first');
  });

  it('backtests the planner against a popularity plan on the last weeks', async () => {
    const cli = await withShelves();
    const r = await cli.run('plan', 'backtest', 'Front', '--weeks', '3', '--rest-weeks', '0');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/share of the active audience engaged with planned items: plan \d+\.\d%, popularity plan \d+\.\d%/);
  });
});
