import { afterEach, describe, expect, it } from 'vitest';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { curationRepos } from '../../src-main/services/curation/repos.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';

let db: Db | undefined;
afterEach(() => db?.close());

/**
 * The publish snapshot is built from the same one read of each shelf that the edition view is built from
 * (CurationService.readEdition), so it says exactly what the editor saw: the same items in the same slots,
 * the same shelf and edition meters, and each slot's row id is the stored row's.
 */
describe('publish snapshot', () => {
  it('holds what the edition view shows and the rows the store keeps', () => {
    ({ db } = openSeeded());
    let t = Date.parse('2026-03-01T09:00:00Z');
    const svc = new CurationService(db!, undefined, () => (t += 1000));
    svc.newEdition('w10', '2026-03-02');
    svc.addShelf('w10', 'Front', parseBriefRequest({ size: 5, rules: { promoted: { maxCount: 0.4 } } }));
    svc.addShelf('w10', 'Side', parseBriefRequest({ size: 4 }));
    const onShelves = new Set(svc.showEdition('w10').shelves.flatMap((s) => s.slots.map((x) => x.item)));
    const other = svc.items.all().find((it) => it.available && !onShelves.has(it.externalId))!;
    svc.act('w10', 'Side', { kind: 'pin', slot: 2, item: other.externalId });
    const seen = svc.showEdition('w10');

    const snap = svc.publish('w10');
    expect(snap.editionMeter).toEqual(seen.meter);
    expect(snap.shelves.map((s) => s.label)).toEqual(seen.shelves.map((s) => s.label));
    const { shelves, editions } = curationRepos(db!);
    const e = editions.byLabel('w10');
    snap.shelves.forEach((s, k) => {
      const view = seen.shelves[k]!;
      expect(s.meter).toEqual(view.meter);
      expect(s.slots.map((x) => [x.slot + 1, x.externalId, x.pinned, x.score])).toEqual(view.slots.map((x) => [x.slot, x.item, x.pinned, x.score]));
      const rows = shelves.slots(shelves.byLabel(e.id, s.label).id);
      expect(s.slots.map((x) => x.itemId)).toEqual(rows.map((r) => r.itemId));
    });
    expect(snap.shelves[1]!.slots[1]).toMatchObject({ externalId: other.externalId, pinned: true });
  });
});
