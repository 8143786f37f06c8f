import { describe, expect, it } from 'vitest';
import { checkPlan } from '../../src-main/core/planning/check.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { curationRepos } from '../../src-main/services/curation/repos.ts';
import { buildPlan } from '../../src-main/services/planning/build.ts';
import { PlanService } from '../../src-main/services/planning/service.ts';
import { openSeeded } from '../curation-services/fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

function shop() {
  const { db } = openSeeded();
  const cur = new CurationService(db);
  cur.newEdition('week 9', '2026-02-23');
  cur.addShelf('week 9', 'Front', parseBriefRequest({ size: 4, rules: { restPeriod: 1, quotas: [{ facet: 'category', max: 2 }] } }));
  cur.addShelf('week 9', 'Gifts', parseBriefRequest({ size: 3, include: { tags: ['gift'] } }));
  return { db, svc: new PlanService(db) };
}

describe('the plan service', () => {
  it('plans several shelves over the weeks under the rules and stores the plan', async () => {
    const { svc } = shop();
    const v = await svc.plan({ name: 'spring', shelf: 'Front', shelves: ['Gifts'], start: '2026-03-02', weeks: 4 });
    expect(v.status).not.toBe('infeasible');
    expect(v.weeks).toHaveLength(4);
    expect(v.weeks[1]!.date).toBe('2026-03-09');
    expect(v.weeks[0]!.shelves.map((s) => s.label)).toEqual(['Front', 'Gifts']);
    for (const w of v.weeks) {
      expect(w.shelves[0]!.slots.every((s) => s.item !== null)).toBe(true);
      // The Gifts brief includes only items tagged 'gift' (every third SKU in the fixture).
      for (const s of w.shelves[1]!.slots) expect(Number(s.item!.slice(4)) % 3).toBe(0);
    }
    // Rest one week and at most ceil(4 / 3) = 2 weeks per item: no item in two consecutive weeks.
    const weeksOf = new Map<string, number[]>();
    for (const w of v.weeks) for (const sh of w.shelves) for (const s of sh.slots) weeksOf.set(s.item!, [...(weeksOf.get(s.item!) ?? []), w.week]);
    for (const ws of weeksOf.values()) {
      expect(ws.length).toBeLessThanOrEqual(2);
      for (let k = 1; k < ws.length; k++) expect(ws[k]! - ws[k - 1]!).toBeGreaterThan(1);
    }
    expect(svc.list().map((p) => p.name)).toEqual(['spring']);
    expect(v.horizon!.distinctItems).toBe(weeksOf.size);
    // The stored plan, read back as the solver's instance sees it, passes the independent checker.
    const { editions, shelves, items } = curationRepos(svc.db);
    const e = editions.byLabel('week 9');
    const id = (ext: string | null) => (ext === null ? null : items.byExternalId(ext)!.id);
    const built = buildPlan(svc.db, svc.curation.world(), {
      shelves: [shelves.byLabel(e.id, 'Front'), shelves.byLabel(e.id, 'Gifts')],
      start: '2026-03-02',
      weeks: 4,
      horizon: { restWeeks: 1, maxAppearances: 2, supplierMinShare: 0, supplierMaxShare: 1, commitments: [], sponsoredMaxShare: 1 },
      objective: { minWeekWeight: 0.3, keepWeight: 0 },
      pins: [],
      bans: [],
      locks: [],
      previous: [0, 1].map((s) => v.weeks.map((w) => w.shelves[s]!.slots.map((x) => id(x.item)))),
    });
    expect(checkPlan(built.inst, built.inst.previous!)).toEqual([]);
  });

  it('re-solving after a pin changes little, and a lock keeps its week', async () => {
    const { svc } = shop();
    const first = await svc.plan({ name: 'p', shelf: 'Front', start: '2026-03-02', weeks: 4 });
    const week2 = first.weeks[1]!.shelves[0]!.slots.map((s) => s.item);
    const unused = ['SKU-001', 'SKU-002', 'SKU-003', 'SKU-004', 'SKU-005', 'SKU-006', 'SKU-007', 'SKU-008'].find((x) => !first.weeks.some((w) => w.shelves[0]!.slots.some((s) => s.item === x)))!;
    const again = await svc.plan({ name: 'p', shelf: 'Front', pins: [{ item: unused, week: 3 }], locks: [{ week: 2 }] });
    expect(again.weeks[2]!.shelves[0]!.slots.map((s) => s.item)).toContain(unused);
    expect(again.weeks[1]!.shelves[0]!.slots.map((s) => s.item).sort()).toEqual([...week2].sort());
    // One pin forces one placement in; a few more may move to keep the rules (rest, quotas), never most of the plan.
    expect(again.changed).toBeGreaterThanOrEqual(1);
    expect(again.changed).toBeLessThanOrEqual(4);
    expect(again.edits).toEqual({ pins: [{ item: unused, week: 3, shelf: 'Front' }], bans: [], locks: [{ week: 2, shelf: 'Front' }] });
  });

  it('turns a planned week into a draft edition with the planned items pinned', async () => {
    const { svc } = shop();
    const v = await svc.plan({ name: 'p', shelf: 'Front', shelves: ['Gifts'], start: '2026-03-02', weeks: 3 });
    const e = svc.draft('p', 2);
    expect(e.label).toBe('p · week 2');
    expect(e.date).toBe('2026-03-09');
    expect(e.shelves.map((s) => s.slots.map((x) => x.item))).toEqual(v.weeks[1]!.shelves.map((s) => s.slots.map((x) => x.item)));
    expect(e.shelves.every((s) => s.slots.every((x) => x.pinned))).toBe(true);
    expect(svc.show('p').drafts).toEqual([{ week: 2, edition: 'p · week 2' }]);
  });

  it('says which rules conflict when no plan exists, and stores nothing', async () => {
    const { svc } = shop();
    // Gifts: 10 gift items, 3 slots × 6 weeks = 18 placements, at most one week per item: 10 < 18.
    const v = await svc.plan({ name: 'tight', shelf: 'Gifts', start: '2026-03-02', weeks: 6, horizon: { maxAppearances: 1, restWeeks: 0 } });
    expect(v.status).toBe('infeasible');
    expect(v.diagnosis!.relaxations.map((r) => r.family)).toContain('maxAppearances');
    expect(v.diagnosis!.relaxations.find((r) => r.family === 'maxAppearances')!.description).toBe('at most 1 → 2 weeks per item');
    expect(svc.list()).toEqual([]);
  });

  it('refuses bad input and changes nothing', async () => {
    const { svc } = shop();
    await expect(svc.plan({ shelf: 'Front', start: '2026-03-02', weeks: 0 })).rejects.toThrow('weeks: must be a whole number from 1 to 52, got 0');
    await expect(svc.plan({ shelf: 'Front', start: '2026-03-02', bans: ['NOPE'] })).rejects.toThrow("ban: no item with id 'NOPE'");
    await expect(svc.plan({ shelf: 'Nowhere', start: '2026-03-02' })).rejects.toThrow("no edition has a shelf labelled 'Nowhere'");
    await expect(svc.plan({ shelf: 'Front' })).rejects.toThrow('from: give the date of the first planned week');
    expect(svc.list()).toEqual([]);
  });
});
