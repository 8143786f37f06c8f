/**
 * Issue 12 through the service: an action changes only what it must (DESIGN.md "Data flow"), reports what
 * changed for the screen to highlight, and undo puts the list back exactly; only Refill starts over.
 */
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
  const svc = new CurationService(db!, undefined, () => (t += 1000));
  svc.newEdition('w', '2026-03-02');
  return svc;
}

const items = (v: { slots: { item: string | null }[] }) => v.slots.map((s) => s.item);
const changedOthers = (a: (string | null)[], b: (string | null)[], self: string) =>
  [...a.filter((i) => !b.includes(i)), ...b.filter((i) => !a.includes(i))].filter((i) => i !== self && i !== null).length;

describe('the editor\'s desk (issue 12)', () => {
  it('a pin puts its item in its slot, shifts the rest down by one, and only the last item leaves', () => {
    const svc = setup();
    const v0 = svc.addShelf('w', 'Front', parseBriefRequest({ size: 8 }));
    const before = items(v0);
    const off = Array.from({ length: 40 }, (_, k) => `SKU-${String(k + 1).padStart(3, '0')}`).find((s) => !before.includes(s))!;
    const v1 = svc.act('w', 'Front', { kind: 'pin', slot: 2, item: off });
    expect(items(v1)).toEqual([before[0], off, ...before.slice(1, 7)]);
    expect(v1.changes!.entered).toEqual([expect.objectContaining({ item: off, slot: 2 })]);
    expect(v1.changes!.left).toEqual([expect.objectContaining({ item: before[7], slot: 8 })]);
    expect(v1.changes!.moved.map((m) => [m.from, m.to])).toEqual([[2, 3], [3, 4], [4, 5], [5, 6], [6, 7], [7, 8]]);
    // A full refill would rank differently; what the kept list gives up is reported, never hidden.
    expect(typeof v1.relevanceGivenUp).toBe('number');
    expect(items(svc.undo('w', 'Front'))).toEqual(before);
  });

  it('a ban brings exactly one replacement into the banned slot; boost and sink keep the membership', () => {
    const svc = setup();
    const v0 = svc.addShelf('w', 'Front', parseBriefRequest({ size: 8 }));
    const before = items(v0);
    const v1 = svc.act('w', 'Front', { kind: 'ban', item: before[3]!, scope: 'shelf' });
    expect(changedOthers(before, items(v1), before[3]!)).toBe(1);
    items(v1).forEach((it, s) => {
      if (s !== 3) expect(it).toBe(before[s]);
    });
    const sunk = before[1]!;
    const v2 = svc.act('w', 'Front', { kind: 'boost', item: sunk, factor: 0.1 });
    expect(new Set(items(v2))).toEqual(new Set(items(v1)));
    expect(items(v2).indexOf(sunk)).toBeGreaterThan(1);
    expect(v2.changes!.moved.find((m) => m.item === sunk)).toMatchObject({ from: 2 });
    const v3 = svc.act('w', 'Front', { kind: 'boost', item: sunk, factor: 10 });
    expect(new Set(items(v3))).toEqual(new Set(items(v1)));
    expect(items(v3).indexOf(sunk)).toBeLessThan(items(v2).indexOf(sunk));
    // Undo walks back through the exact lists.
    expect(items(svc.undo('w', 'Front'))).toEqual(items(v2));
    expect(items(svc.undo('w', 'Front'))).toEqual(items(v1));
    expect(items(svc.undo('w', 'Front'))).toEqual(before);
    // Redo replays the same minimal changes.
    expect(items(svc.redo('w', 'Front'))).toEqual(items(v1));
    expect(items(svc.redo('w', 'Front'))).toEqual(items(v2));
  });

  it('only Refill starts over: after it the list is what a new shelf of the same brief and edits gets', () => {
    const svc = setup();
    const v0 = svc.addShelf('w', 'Front', parseBriefRequest({ size: 6 }));
    const off = Array.from({ length: 40 }, (_, k) => `SKU-${String(k + 1).padStart(3, '0')}`).find((s) => !items(v0).includes(s))!;
    svc.act('w', 'Front', { kind: 'pin', slot: 1, item: off });
    const kept = svc.act('w', 'Front', { kind: 'unpin', slot: 1 });
    // Unpinning keeps the item where it is: nothing forces it off.
    expect(items(kept)[0]).toBe(off);
    expect(kept.changes).toEqual({ entered: [], left: [], moved: [] });
    const refilled = svc.fill('w', 'Front');
    expect(refilled.relevanceGivenUp ?? null).toBeNull();
    expect(items(refilled)).toEqual(items(v0));
    expect(refilled.changes!.left).toEqual([expect.objectContaining({ item: off, slot: 1 })]);
  });
});

describe('each verb does what its name says (issue 12)', () => {
  it('the log names verb, item, slots and factor', () => {
    const svc = setup();
    const v0 = svc.addShelf('w', 'Front', parseBriefRequest({ size: 8 }));
    const second = v0.slots[1]!;
    const v1 = svc.act('w', 'Front', { kind: 'boost', item: second.item!, factor: 0.01 });
    const to = items(v1).indexOf(second.item) + 1;
    expect(to).toBeGreaterThan(2);
    expect(v1.actions.at(-1)!.summary).toBe(`Sank ${second.title} ×0.01, slot 2 → ${to}`);
    const v2 = svc.act('w', 'Front', { kind: 'ban', item: items(v1)[0]!, scope: 'shelf' });
    const replacement = v2.slots[0]!;
    expect(v2.actions.at(-1)!.summary).toBe(`Banned ${v1.slots[0]!.title} (this shelf), left slot 1; ${replacement.title} came in`);
  });

  it('a ban is listed and lifted; refill and fill-from-anchors undo like any action; a new action clears redo', () => {
    const svc = setup();
    const v0 = svc.addShelf('w', 'Front', parseBriefRequest({ size: 5 }));
    const banned = v0.slots[2]!;
    const v1 = svc.act('w', 'Front', { kind: 'ban', item: banned.item!, scope: 'shelf' });
    expect(v1.bans).toEqual([{ item: banned.item, title: banned.title, scope: 'shelf', reach: 'this shelf' }]);
    const v2 = svc.act('w', 'Front', { kind: 'unban', item: banned.item! });
    expect(v2.bans).toEqual([]);
    expect(v2.actions.at(-1)!.summary).toBe(`Lifted the ban on ${banned.title}`);
    expect(() => svc.act('w', 'Front', { kind: 'unban', item: banned.item! })).toThrow(/is not banned on this shelf/);

    const anchored = svc.act('w', 'Front', { kind: 'anchors', anchors: [7] });
    expect(anchored.brief.anchors).toEqual([7]);
    expect(anchored.actions.at(-1)!.kind).toBe('anchors');
    const back = svc.undo('w', 'Front');
    expect(back.brief.anchors).toEqual([]);
    expect(items(back)).toEqual(items(v2));
    expect(back.canRedo).toBe(true);
    // A new action (here Refill) drops the redo tail: the anchors cannot be redone any more.
    const refilled = svc.fill('w', 'Front');
    expect(refilled.canRedo).toBe(false);
    expect(refilled.actions.map((a) => a.kind)).toEqual(['ban', 'unban', 'refill']);
    expect(items(svc.undo('w', 'Front'))).toEqual(items(v2));
  });
});
