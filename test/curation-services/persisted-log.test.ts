import { afterEach, describe, expect, it } from 'vitest';
import { seededRng } from '../../src-main/core/rng.ts';
import { CurationService, type ActionRequest } from '../../src-main/services/curation/service.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

/** Everything editorial about the workspace's shelves, as stored: the full state to compare. */
function editorialState(d: Db): unknown {
  const all = (sql: string) => d.prepare(sql).all();
  return {
    shelves: all('SELECT id, label, size, brief, locked, violations FROM shelf ORDER BY id'),
    slots: all('SELECT * FROM slot ORDER BY shelf_id, slot'),
    bans: all('SELECT shelf_id, edition_id, scope, item_id, facet, value FROM ban ORDER BY shelf_id, scope, item_id, facet, value'),
    boosts: all('SELECT * FROM boost ORDER BY shelf_id, item_id'),
  };
}

describe('the stored action log', () => {
  // The same property as test/editing/undo-redo.test.ts, through the store and the re-fill: 150 seeded
  // random actions over two shelves, undone to the exact starting workspace and redone to the exact end.
  it('undoes seeded random actions to the exact stored start and redoes them to the exact stored end', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db, undefined, () => 1_772_000_000_000);
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'A', parseBriefRequest({ size: 5 }));
    svc.addShelf('w', 'B', parseBriefRequest({ size: 4, rules: { quotas: [{ facet: 'category', max: 2 }] } }));
    const start = editorialState(db);
    const rng = seededRng(42);
    const sku = () => `SKU-${String(1 + rng.int(40)).padStart(3, '0')}`;
    const scopes = ['shelf', 'edition', 'always'] as const;
    const done: string[] = [];
    for (let k = 0; k < 150; k++) {
      const shelf = rng.int(2) === 0 ? 'A' : 'B';
      const size = shelf === 'A' ? 5 : 4;
      const r = rng.int(8);
      const a: ActionRequest =
        r === 0 ? { kind: 'pin', slot: 1 + rng.int(size), item: sku() }
        : r === 1 ? { kind: 'unpin', slot: 1 + rng.int(size) }
        : r === 2 ? { kind: 'ban', item: sku(), scope: scopes[rng.int(3)]! }
        : r === 3 ? { kind: 'banRule', facet: 'tag', value: rng.int(2) ? 'gift' : 'small', scope: scopes[rng.int(2)]! }
        : r === 4 ? { kind: 'boost', item: sku(), factor: [0.25, 2, 4][rng.int(3)]! }
        : r === 5 ? { kind: rng.int(3) === 0 ? 'lock' : 'unlock' }
        : { kind: 'move', from: 1 + rng.int(size), to: 1 + rng.int(size) };
      try {
        svc.act('w', shelf, a);
        done.push(shelf);
      } catch (e) {
        // A move from an empty slot is refused and must change nothing.
        expect((e as Error).message).toMatch(/is empty; nothing to move/);
      }
    }
    expect(done.length).toBeGreaterThan(100);
    const end = editorialState(db);
    expect(end).not.toEqual(start);
    // Undo shelf by shelf in reverse order of the actions (each shelf has its own log).
    for (const shelf of [...done].reverse()) svc.undo('w', shelf);
    expect(editorialState(db)).toEqual(start);
    for (const shelf of done) svc.redo('w', shelf);
    expect(editorialState(db)).toEqual(end);
  });
});

describe('what-if', () => {
  it('reports +1/size promoted share for a sponsored candidate replacing an organic item', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    svc.newEdition('w', '2026-03-02');
    const v = svc.addShelf('w', 'A', parseBriefRequest({ size: 5, rules: { promoted: { maxCount: 0 } } }));
    expect(v.slots.every((s) => !s.promoted)).toBe(true);
    const r = svc.whatIf('w', 'A', 2, 40);
    const onShelf = new Set(v.slots.map((s) => s.item));
    expect(r.candidates.every((c) => !onShelf.has(c.item))).toBe(true);
    const sponsored = r.candidates.find((c) => c.promoted)!;
    const organic = r.candidates.find((c) => !c.promoted)!;
    // Promoted share by count (DESIGN.md): promoted slots / filled slots.
    expect(sponsored.delta.promotedShareCount).toBeCloseTo(1 / 5, 12);
    expect(organic.delta.promotedShareCount).toBe(0);
    expect(r.before.promotedShareCount).toBe(0);
  });
});
