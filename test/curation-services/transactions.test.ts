import { afterEach, describe, expect, it } from 'vitest';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { ShelfRepo } from '../../src-main/store/shelves.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

const dump = (d: Db) => ({
  shelves: d.prepare('SELECT * FROM shelf ORDER BY id').all(),
  slots: d.prepare('SELECT * FROM slot ORDER BY shelf_id, slot').all(),
  actions: d.prepare('SELECT * FROM editorial_action ORDER BY id').all(),
});

describe('curation writes', () => {
  it('leave the workspace as it was when the fill fails half-way through a brief change', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'Front', parseBriefRequest({ size: 4 }));
    svc.act('w', 'Front', { kind: 'pin', slot: 1, item: 'SKU-003' });
    const before = dump(db);
    // All-zero weights pass the schema (each is >= 0) but leave the scorer nothing to blend: the error is
    // thrown by the fill, after the new brief was written inside the transaction.
    const zero = { content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 0, freshness: 0 };
    expect(() => svc.setBrief('w', 'Front', parseBriefRequest({ size: 6, weights: zero }))).toThrow(/blend weights leave nothing to score with/);
    expect(dump(db)).toEqual(before);
  });

  it('parse the stored brief on read and name the bad field of a hand-edited one', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'Front', parseBriefRequest({ size: 4 }));
    db.prepare(`UPDATE shelf SET brief = json_set(brief, '$.lambda', 7)`).run();
    expect(() => new ShelfRepo(db!).byLabel(1, 'Front')).toThrow(/lambda/);
  });

  it('refuse a shelf action on a shelf of another edition and an unknown shelf', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    svc.newEdition('w', '2026-03-02');
    expect(() => svc.act('w', 'Nope', { kind: 'lock' })).toThrow(/no shelf called 'Nope' in this edition/);
    expect(() => svc.undo('w', 'Nope')).toThrow(/no shelf called 'Nope'/);
  });
});
