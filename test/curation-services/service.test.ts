import { afterEach, describe, expect, it } from 'vitest';
import { CurationService } from '../../src-main/services/curation/service.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

function setup(): CurationService {
  ({ db } = openSeeded());
  let t = Date.parse('2026-03-01T09:00:00Z');
  return new CurationService(db!, undefined, () => (t += 1000));
}

const items = (v: { slots: { item: string | null }[] }) => v.slots.map((s) => s.item);

describe('curation service', () => {
  it('fills a new shelf to its size with named items and a meter', () => {
    const svc = setup();
    svc.newEdition('week 10', '2026-03-02');
    const v = svc.addShelf('week 10', 'Front', parseBriefRequest({ size: 6 }));
    expect(v.slots).toHaveLength(6);
    expect(v.slots.every((s) => s.item?.startsWith('SKU-'))).toBe(true);
    expect(new Set(items(v)).size).toBe(6);
    expect(v.meter.promotedShareCount).toBeGreaterThanOrEqual(0);
    expect(v.canUndo).toBe(false);
  });

  it('pins, bans and boosts, and undoes each back to the earlier shelf', () => {
    const svc = setup();
    svc.newEdition('w', '2026-03-02');
    const v0 = svc.addShelf('w', 'Front', parseBriefRequest({ size: 5 }));
    const v1 = svc.act('w', 'Front', { kind: 'pin', slot: 3, item: 'SKU-040' }, 'launch week');
    expect(v1.slots[2]).toMatchObject({ item: 'SKU-040', pinned: true, promoted: true });
    expect(v1.actions[0]).toMatchObject({ kind: 'pin', reason: 'launch week' });
    const banned = v1.slots[0]!.item!;
    const v2 = svc.act('w', 'Front', { kind: 'ban', item: banned, scope: 'shelf' });
    expect(items(v2)).not.toContain(banned);
    expect(svc.undo('w', 'Front').slots).toEqual(v1.slots);
    expect(svc.undo('w', 'Front').slots).toEqual(v0.slots);
    const redone = svc.redo('w', 'Front');
    expect(redone.slots).toEqual(v1.slots);
    expect(redone.canRedo).toBe(true);
    // A new action drops the redo tail.
    const v3 = svc.act('w', 'Front', { kind: 'lock' });
    expect(v3.canRedo).toBe(false);
    expect(v3.actions.map((a) => a.kind)).toEqual(['pin', 'lock']);
  });

  it('keeps a locked shelf as it is while actions are recorded', () => {
    const svc = setup();
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'Front', parseBriefRequest({ size: 4 }));
    const locked = svc.act('w', 'Front', { kind: 'lock' });
    expect(locked.slots.every((s) => s.percentile !== null)).toBe(true);
    const after = svc.act('w', 'Front', { kind: 'ban', item: locked.slots[0]!.item!, scope: 'shelf' });
    expect(items(after)).toEqual(items(locked));
    // The banned item stays on the locked shelf but is no longer a candidate: it has no score.
    expect(after.slots[0]!.percentile).toBeNull();
    expect(after.slots.slice(1).every((s) => s.percentile !== null)).toBe(true);
    const unlocked = svc.act('w', 'Front', { kind: 'unlock' });
    expect(items(unlocked)).not.toContain(locked.slots[0]!.item);
  });

  it('bans a category by rule across the edition', () => {
    const svc = setup();
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'A', parseBriefRequest({ size: 4 }));
    svc.addShelf('w', 'B', parseBriefRequest({ size: 4 }));
    svc.act('w', 'A', { kind: 'banRule', facet: 'category', value: 'teapots', scope: 'edition' });
    const b = svc.fill('w', 'B');
    expect(b.slots.every((s) => s.category !== 'teapots')).toBe(true);
  });

  it('publishes a read-only edition and rests its items in the next one', () => {
    const svc = setup();
    svc.newEdition('w10', '2026-03-02');
    const front = svc.addShelf('w10', 'Front', parseBriefRequest({ size: 5, rules: { restPeriod: 1 } }));
    const snap = svc.publish('w10');
    expect(snap.shelves[0]!.slots.map((s) => s.externalId)).toEqual(items(front));
    expect(() => svc.act('w10', 'Front', { kind: 'lock' })).toThrow(/published and read-only/);
    expect(() => db!.prepare('UPDATE edition_snapshot SET snapshot = ?').run('{}')).toThrow(/read-only/);
    expect(() => db!.prepare('DELETE FROM slot').run()).toThrow(/read-only/);
    const next = svc.newEdition('w11', '2026-03-09', 'w10');
    const nextFront = next.shelves[0]!;
    expect(nextFront.brief.rules.restPeriod).toBe(1);
    for (const it of items(front)) expect(items(nextFront)).not.toContain(it);
    expect(nextFront.excluded['resting']).toBe(5);
    const { shelves: diff, titles } = svc.compare('w10', 'w11');
    expect(diff[0]!.label).toBe('Front');
    // Every item the comparison names comes with its title, as published.
    for (const id of [...diff[0]!.added, ...diff[0]!.removed]) expect(titles[id]).toMatch(/no\. \d+$/);
    expect(diff[0]!.removed.sort()).toEqual([...items(front)].sort());
    expect(diff[0]!.added).toHaveLength(5);
  });

  it('rejects a bad date, a duplicate label and an unknown item with clear messages', () => {
    const svc = setup();
    expect(() => svc.newEdition('w', '2026-02-30')).toThrow(/date: expected a calendar date/);
    svc.newEdition('w', '2026-03-02');
    expect(() => svc.newEdition('w', '2026-03-03')).toThrow(/already exists/);
    svc.addShelf('w', 'Front', parseBriefRequest({ size: 3 }));
    expect(() => svc.act('w', 'Front', { kind: 'pin', slot: 1, item: 'NOPE' })).toThrow(/no item with id 'NOPE'/);
    expect(() => svc.act('w', 'Front', { kind: 'pin', slot: 4, item: 'SKU-001' })).toThrow(/slot must be between 1 and 3, got 4/);
    // The failed action changed nothing.
    expect(svc.fill('w', 'Front', false).actions).toEqual([]);
  });

  it('refuses a category, supplier or tag no item carries, in a brief or a ban, and changes nothing', () => {
    const svc = setup();
    svc.newEdition('w', '2026-03-02');
    expect(() => svc.addShelf('w', 'Front', parseBriefRequest({ size: 4, include: { categories: ['teapot'] } }))).toThrow(
      "Only these categories, entry 1 (categories): no item has the category 'teapot' (did you mean 'teapots'?)",
    );
    expect(svc.showEdition('w').shelves).toHaveLength(0);
    const v = svc.addShelf('w', 'Front', parseBriefRequest({ size: 4 }));
    expect(() => svc.act('w', 'Front', { kind: 'banRule', facet: 'category', value: 'kite', scope: 'shelf' })).toThrow(/did you mean 'kites'/);
    expect(svc.fill('w', 'Front', false).slots).toEqual(v.slots);
    expect(svc.fill('w', 'Front', false).actions).toHaveLength(0);
  });
});
