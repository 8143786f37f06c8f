import { afterEach, describe, expect, it } from 'vitest';
import { IalsModel } from '../../src-main/core/models/ials.ts';
import { IALS_DEFAULTS } from '../../src-main/core/models/ials-params.ts';
import { curationModelSource } from '../../src-main/services/curation/model-source.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { audienceReadings } from '../../src-main/services/curation/shelf-fill.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import { dateMs } from '../../src-main/store/editions.ts';
import { forgetTasteGroupName, nameTasteGroup, setTasteGroupSettings, tasteGroupsView } from '../../src-main/services/curation/taste-groups.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { dataFingerprint } from '../../src-main/store/models.ts';
import { readGroupSettings } from '../../src-main/store/taste-groups.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

/**
 * An iALS model with planted factors: customer u's factor points along axis `axisOf(camp)` of its camp
 * (u % 3 of the fixture, which shops mostly in category u % 3), at lengths that differ by customer (as
 * iALS vectors do), item i's the unit vector of its category. So the taste groups must follow the camps.
 */
function plantedIals(customers: number, items: number, axisOf: (camp: number) => number = (c) => c): IalsModel {
  const k = 4;
  const x = new Float32Array(customers * k);
  for (let u = 0; u < customers; u++) x[u * k + axisOf((u + 1) % 3)] = 0.2 + (u % 5) * 0.4;
  const y = new Float32Array(items * k);
  for (let i = 0; i < items; i++) y[i * k + (i % 4)] = 1;
  return new IalsModel({ ...IALS_DEFAULTS, factors: k }, x, y);
}

function store(d: Db, m: IalsModel, at: number): void {
  d.prepare('UPDATE model SET current = 0').run();
  d.prepare("INSERT INTO model (kind, fingerprint, trained_at, train_ms, bytes) VALUES ('ials', ?, ?, 1, ?)").run(dataFingerprint(d), at, Buffer.from(m.serialize()));
}

const world = (d: Db) => new CurationService(d, curationModelSource).world();

describe('taste-group audiences', () => {
  it('finds the three planted camps (k chosen by silhouette), each named by its category', () => {
    ({ db } = openSeeded());
    store(db, plantedIals(30, 40), 1);
    const w = world(db);
    expect(w.groups).toBeDefined();
    // Dense customer index d is customer id d + 1, camp (d + 1) % 3.
    const campOfGroup = new Map<number, number>();
    w.groups!.forEach((g, d) => {
      const camp = (d + 1) % 3;
      if (!campOfGroup.has(g)) campOfGroup.set(g, camp);
      expect(campOfGroup.get(g)).toBe(camp);
    });
    const view = tasteGroupsView(db, w.ds);
    expect(view.k).toBe(3);
    // Identical directions within a camp, orthogonal across: every silhouette is 1 and cohesion is 1.
    expect(view.silhouette).toBeCloseTo(1, 6);
    const cats = ['teapots', 'lanterns', 'notebooks'];
    for (const g of view.groups) {
      expect(g.customers).toBe(10);
      expect(g.cohesion).toBeCloseTo(1, 6);
      expect(g.separation).toBeCloseTo(1, 6); // orthogonal: cosine distance 1
      expect(g.categories[0]!.value).toBe(cats[campOfGroup.get(g.group)!]);
      expect(g.examples.length).toBeGreaterThan(0);
      expect(g.examples.every((e) => e.category === cats[campOfGroup.get(g.group)!])).toBe(true);
    }
    // A shelf for one group.
    const svc = new CurationService(db, curationModelSource);
    svc.newEdition('w', '2026-03-02');
    const v = svc.addShelf('w', 'For one group', parseBriefRequest({ size: 4, audience: { kind: 'group', group: 0 } }));
    expect(v.slots).toHaveLength(4);
  });

  it('keeps a name across a retraining that renumbers the groups, and drops it when the group dissolves', () => {
    ({ db } = openSeeded());
    store(db, plantedIals(30, 40), 1);
    let view = tasteGroupsView(db, world(db).ds);
    const g = view.groups.findIndex((x) => x.examples[0]?.category === 'lanterns');
    view = nameTasteGroup(db, world(db).ds, g, '  Lantern people ');
    expect(view.groups[g]!.name).toBe('Lantern people');
    // Retrain: the same camps on other axes, one customer of another camp moved in.
    store(db, plantedIals(30, 40, (c) => (c + 1) % 3), 2);
    const w = world(db);
    view = tasteGroupsView(db, w.ds);
    const named = view.groups.filter((x) => x.name !== null);
    expect(named).toHaveLength(1);
    expect(named[0]!.categories[0]!.value).toBe('lanterns');
    expect(named[0]!.nameOverlap).toBe(1);
    // Every camp on one axis: one direction, no camp structure; the name finds no group of its own.
    const flat = plantedIals(30, 40, () => 0);
    for (let u = 0; u < 30; u++) flat.customerFactors[u * 4 + 1 + (u % 3)] = 0.3 * ((u * 7) % 5);
    store(db, flat, 3);
    view = tasteGroupsView(db, world(db).ds);
    expect(view.unmatchedNames).toEqual(['Lantern people']);
    expect(() => nameTasteGroup(db!, world(db!).ds, 99, 'x')).toThrow(/no group 99/);
    expect(() => forgetTasteGroupName(db!, world(db!).ds, 'nobody')).toThrow(/no group is named 'nobody'/);
    expect(forgetTasteGroupName(db, world(db).ds, 'Lantern people').unmatchedNames).toEqual([]);
  });

  it('aims a shelf at a group by its name: it follows the name across a renumbering retraining, and says so when the name is lost', () => {
    ({ db } = openSeeded());
    store(db, plantedIals(30, 40), 1);
    const svc = new CurationService(db, curationModelSource);
    // Dense customer d is id d + 1, of camp (d + 1) % 3; camp 1 shops mostly in lanterns (fixture).
    const lanternCustomers = Array.from({ length: 30 }, (_, d) => d).filter((d) => (d + 1) % 3 === 1);
    const lanternGroup = () => tasteGroupsView(db!, world(db!).ds).groups.findIndex((x) => x.categories[0]?.value === 'lanterns');
    const before = lanternGroup();
    nameTasteGroup(db, world(db).ds, before, 'Lantern people');
    svc.newEdition('w', '2026-03-02');
    const v = svc.addShelf('w', 'Lanterns', parseBriefRequest({ size: 4, audience: { kind: 'group', group: before, name: 'Lantern people' } }));
    expect(v.violations.filter((x) => x.rule === 'audience')).toEqual([]);
    // Aimed by number at a group that has a name, the brief keeps the name; aimed by name, it gets the number.
    const byNumber = svc.addShelf('w', 'By number', parseBriefRequest({ size: 4, audience: { kind: 'group', group: before } }));
    expect(byNumber.brief.audience).toEqual({ kind: 'group', group: before, name: 'Lantern people' });
    const byName = svc.addShelf('w', 'By name', parseBriefRequest({ size: 4, audience: { kind: 'group', group: 0, name: 'Lantern people' } }));
    expect(byName.brief.audience).toEqual({ kind: 'group', group: before, name: 'Lantern people' });
    const reached = () => Array.from(audienceReadings(world(db!), svc.showEdition('w').shelves.find((s) => s.label === 'Lanterns')!.brief, dateMs('2026-03-02')).audience);
    expect(reached()).toEqual(lanternCustomers);
    // Retrain: three customers of the notebooks camp (2) move to the lanterns' direction, so the lantern group
    // is the largest (13) and takes number 0; the name still fits it (Jaccard 10/13 ≥ 0.5).
    expect(before).not.toBe(0);
    const moved = plantedIals(30, 40);
    const movers = [1, 4, 7]; // dense customers of camp (d + 1) % 3 = 2
    for (const d of movers) {
      moved.customerFactors[d * 4 + 2] = 0;
      moved.customerFactors[d * 4 + 1] = 0.5;
    }
    store(db, moved, 2);
    expect(lanternGroup()).toBe(0);
    expect(lanternGroup()).not.toBe(before);
    const after = svc.fill('w', 'Lanterns');
    expect(after.violations.filter((x) => x.rule === 'audience')).toEqual([]);
    expect(reached()).toEqual([...lanternCustomers, ...movers].sort((a, b) => a - b));
    // A training with no camp structure: no group keeps the name, and the shelf says so instead of using group `before`.
    const flat = plantedIals(30, 40, () => 0);
    for (let u = 0; u < 30; u++) flat.customerFactors[u * 4 + 1 + (u % 3)] = 0.3 * ((u * 7) % 5);
    store(db, flat, 3);
    expect(tasteGroupsView(db, world(db).ds).unmatchedNames).toEqual(['Lantern people']);
    const lost = svc.fill('w', 'Lanterns');
    expect(lost.violations).toContainEqual({
      rule: 'audience',
      title: 'The audience (audience)',
      reason: "the taste group 'Lantern people' was not found after the last training: choose another audience",
    });
    expect(reached()).toEqual([]);
  });

  it('still reads a brief stored with only a group number, and keeps that number for an unnamed group', () => {
    // The brief as stored before names could be given (schema of issue 15's first version).
    const old = parseBrief(JSON.parse('{"size":4,"audience":{"kind":"group","group":2}}'));
    expect(old.audience).toEqual({ kind: 'group', group: 2 });
    ({ db } = openSeeded());
    store(db, plantedIals(30, 40), 1);
    const svc = new CurationService(db, curationModelSource);
    svc.newEdition('w', '2026-03-02');
    const v = svc.addShelf('w', 'Numbered', parseBriefRequest({ size: 4, audience: { kind: 'group', group: 2 } }));
    expect(v.violations.filter((x) => x.rule === 'audience')).toEqual([]);
    const w = world(db);
    const members = Array.from(w.groups!.entries()).filter(([, g]) => g === 2).map(([d]) => d);
    expect(Array.from(audienceReadings(w, parseBrief({ size: 4, audience: { kind: 'group', group: 2 } }), dateMs('2026-03-02')).audience)).toEqual(members);
    expect(() => parseBrief({ size: 4, audience: { kind: 'group', group: 2, name: '  ' } })).toThrow(/name/);
  });

  it('erases a forgotten customer from the members a name was given to', async () => {
    ({ db } = openSeeded());
    store(db, plantedIals(30, 40), 1);
    nameTasteGroup(db, world(db).ds, 0, 'First');
    const count = () => (db!.prepare('SELECT count(*) FROM taste_group_member').pluck().get() as number);
    expect(count()).toBe(10);
    const member = db.prepare('SELECT c.external_id FROM taste_group_member m JOIN customer c ON c.id = m.customer_id LIMIT 1').pluck().get() as string;
    await forgetCustomer(db, member);
    expect(count()).toBe(9);
  });

  it('saves the range k is chosen in, and refuses a bad one changing nothing', () => {
    ({ db } = openSeeded());
    store(db, plantedIals(30, 40), 1);
    const view = setTasteGroupSettings(db, world(db).ds, { minK: 4, maxK: 5 });
    // Only three directions exist: the groups k-means leaves empty are dropped, never listed with no one.
    expect(view.k).toBe(3);
    expect(view.groups.every((g) => g.customers > 0)).toBe(true);
    expect(view.tried.map((t) => t.k)).toEqual([4, 5]);
    // The world's groups follow the new settings.
    expect(Math.max(...world(db).groups!)).toBe(view.k - 1);
    expect(() => setTasteGroupSettings(db!, world(db!).ds, { minK: 6 })).toThrow(/largest number of groups must be a whole number >= the smallest \(6\), got 5/);
    expect(readGroupSettings(db)).toEqual({ minK: 4, maxK: 5, minHistory: 3 });
    expect(() => setTasteGroupSettings(db!, world(db!).ds, { minHistory: 100 })).toThrow(/only 0 customers have 100 or more items/);
  });

  it('says to train first when there is no iALS model', () => {
    ({ db } = openSeeded());
    expect(() => tasteGroupsView(db!, world(db!).ds)).toThrow(/train the models first/);
  });
});
