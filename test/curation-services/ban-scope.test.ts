/**
 * Issue 12 item 3: bans by category, supplier or tag with their scope, carried to a copied edition as the
 * scope says ("this edition only" stays behind, "this edition and later" comes along, "until a date" only
 * up to that date), and a brief edit as an undoable action that keeps the list where the new brief allows.
 * The expected behaviour is the scope's own definition (core/editing/ban-scope.ts); no outside source.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { CurationService } from '../../src-main/services/curation/service.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded, SUPPLIERS } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

function setup(): CurationService {
  ({ db } = openSeeded());
  let t = Date.parse('2026-03-01T09:00:00Z');
  const svc = new CurationService(db!, undefined, () => (t += 1000));
  svc.newEdition('w10', '2026-03-02');
  svc.addShelf('w10', 'Front', parseBriefRequest({ size: 6 }));
  svc.addShelf('w10', 'Side', parseBriefRequest({ size: 4 }));
  return svc;
}

type View = ReturnType<CurationService['fill']>;
const suppliersOn = (v: View) => new Set(v.slots.map((s) => s.supplier));
const categoriesOn = (v: View) => new Set(v.slots.map((s) => s.category));
const shelf = (svc: CurationService, e: string, s: string) => svc.fill(e, s, false);

describe('ban scopes across editions', () => {
  it('a ban on this edition only stays behind; this edition and later comes along into the copy', () => {
    const svc = setup();
    const supplier = [...suppliersOn(shelf(svc, 'w10', 'Front'))].find((s): s is string => s !== null)!;
    svc.act('w10', 'Front', { kind: 'banRule', facet: 'supplier', value: supplier, scope: 'edition' });
    svc.act('w10', 'Front', { kind: 'banRule', facet: 'category', value: 'kites', scope: 'later' });
    // Both reach every shelf of their own edition.
    for (const s of ['Front', 'Side']) {
      expect(suppliersOn(shelf(svc, 'w10', s))).not.toContain(supplier);
      expect(categoriesOn(shelf(svc, 'w10', s))).not.toContain('kites');
    }
    const copy = svc.newEdition('w11', '2026-03-09', 'w10');
    const front = copy.shelves.find((s) => s.label === 'Front')!;
    expect(front.ruleBans).toEqual([{ facet: 'category', value: 'kites', scope: 'later', reach: 'this edition and later' }]);
    expect(front.actions.map((a) => a.summary)).toEqual(['Carried 1 ban from w10: category kites']);
    for (const s of copy.shelves) expect(categoriesOn(s)).not.toContain('kites');
    // The edition-only ban did not come back: its supplier is on the copied shelves again.
    expect(copy.shelves.some((s) => suppliersOn(s).has(supplier))).toBe(true);
    // The carried ban is the copy's own: lifting it there leaves the earlier edition's ban in place.
    const lifted = svc.act('w11', 'Front', { kind: 'unbanRule', facet: 'category', value: 'kites' });
    expect(lifted.ruleBans).toEqual([]);
    expect(shelf(svc, 'w10', 'Front').ruleBans.map((b) => b.value).sort()).toEqual([supplier, 'kites'].sort());
  });

  it('a ban until a date comes along into copies dated up to that date, and not after', () => {
    const svc = setup();
    svc.act('w10', 'Front', { kind: 'banRule', facet: 'tag', value: 'gift', scope: 'until:2026-03-09' });
    const within = svc.newEdition('w11', '2026-03-09', 'w10').shelves.find((s) => s.label === 'Front')!;
    expect(within.ruleBans).toEqual([{ facet: 'tag', value: 'gift', scope: 'until:2026-03-09', reach: 'this edition and later, until 2026-03-09' }]);
    // It carries again from the copy while the date allows, and stops after it.
    const past = svc.newEdition('w12', '2026-03-16', 'w11').shelves.find((s) => s.label === 'Front')!;
    expect(past.ruleBans).toEqual([]);
    expect(past.actions).toEqual([]);
    // A later ban does not go back in time: a copy dated before its edition does not get it.
    svc.act('w10', 'Side', { kind: 'ban', item: shelf(svc, 'w10', 'Side').slots[0]!.item!, scope: 'later' });
    const earlier = svc.newEdition('w09', '2026-02-23', 'w10').shelves.find((s) => s.label === 'Side')!;
    expect(earlier.bans).toEqual([]);
  });

  it('refuses an until date before the edition and an unknown scope, and changes nothing', () => {
    const svc = setup();
    const before = shelf(svc, 'w10', 'Front');
    expect(() => svc.act('w10', 'Front', { kind: 'banRule', facet: 'tag', value: 'gift', scope: 'until:2026-03-01' })).toThrow(
      "Where the ban holds (scope): 2026-03-01 is before this edition's date 2026-03-02; choose a date on or after it",
    );
    expect(() => svc.act('w10', 'Front', { kind: 'banRule', facet: 'tag', value: 'gift', scope: 'until:2026-02-30' })).toThrow(/with a real date/);
    expect(shelf(svc, 'w10', 'Front')).toEqual(before);
  });
});

describe('a brief edit is an undoable action that keeps the list', () => {
  it('keeps every item the new brief admits in its slot, and undo puts back the old brief and list', () => {
    const svc = setup();
    const v0 = shelf(svc, 'w10', 'Front');
    const items0 = v0.slots.map((s) => s.item);
    const supplier = v0.slots[2]!.supplier!;
    const leaving = new Set(v0.slots.filter((s) => s.supplier === supplier).map((s) => s.item));
    const others = SUPPLIERS.filter((s) => s !== supplier);
    const v1 = svc.setBrief('w10', 'Front', { ...v0.brief, include: { ...v0.brief.include, suppliers: others } });
    v1.slots.forEach((s, k) => {
      expect(s.supplier).not.toBe(supplier);
      // Every slot whose item the new brief still admits keeps it.
      if (!leaving.has(items0[k]!)) expect(s.item).toBe(items0[k]);
    });
    expect(v1.changes!.left.map((l) => l.item).sort()).toEqual([...leaving].sort());
    for (const l of v1.changes!.left) expect(l.why).toBe('outside the supplier filter');
    expect(v1.actions.at(-1)!.summary).toMatch(/^Changed the brief: only suppliers: /);
    expect(v1.canUndo).toBe(true);

    const back = svc.undo('w10', 'Front');
    expect(back.brief.include.suppliers).toEqual([]);
    expect(back.slots.map((s) => s.item)).toEqual(items0);
    const again = svc.redo('w10', 'Front');
    expect(again.brief.include.suppliers).toEqual(others);
    expect(again.slots.map((s) => s.item)).toEqual(v1.slots.map((s) => s.item));
  });

  it('grows and shrinks a shelf keeping its list, and an unchanged brief is no action', () => {
    const svc = setup();
    const v0 = shelf(svc, 'w10', 'Front');
    const items0 = v0.slots.map((s) => s.item);
    const grown = svc.setBrief('w10', 'Front', { ...v0.brief, size: 8 });
    expect(grown.slots.map((s) => s.item).slice(0, 6)).toEqual(items0);
    expect(grown.slots.filter((s) => s.item !== null)).toHaveLength(8);
    expect(grown.actions.at(-1)!.summary).toMatch(/^Changed the brief: slots 6 → 8/);
    const shrunk = svc.setBrief('w10', 'Front', { ...v0.brief, size: 4 });
    expect(shrunk.slots.map((s) => s.item)).toEqual(items0.slice(0, 4));
    const same = svc.setBrief('w10', 'Front', shrunk.brief);
    expect(same.actions).toHaveLength(shrunk.actions.length);
    expect(same.slots).toEqual(shrunk.slots);
  });
});
