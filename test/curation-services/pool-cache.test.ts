import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seededRng } from '../../src-main/core/rng.ts';
import { curationModelSource } from '../../src-main/services/curation/model-source.ts';
import { poolKey } from '../../src-main/services/curation/pool-cache.ts';
import { CurationService, type ActionRequest } from '../../src-main/services/curation/service.ts';
import type { ModelSource } from '../../src-main/services/curation/world.ts';
import { trainAndSave } from '../../src-main/services/train/train-job.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { brief, state } from '../curation/helpers.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db;
let file: string;
beforeAll(async () => {
  ({ db, file } = openSeeded());
  await trainAndSave(db, file, { models: ['content', 'itemknn', 'ials'], params: { ials: { factors: 8, iterations: 4, seed: 3 } }, threads: 1 });
});
afterAll(() => {
  db.close();
  fs.rmSync(path.dirname(file), { recursive: true, force: true });
});

/** A service whose world is built afresh: a new source function has no cached world, pools or scores. */
const fresh = () => {
  const source: ModelSource = (d, ds) => curationModelSource(d, ds);
  return new CurationService(db, source);
};

describe('remembered pools and scores (issue 4)', () => {
  it('leave every shelf exactly as a fresh world fills it, through 60 actions, undos and redos', () => {
    let t = Date.parse('2026-03-01T09:00:00Z');
    const svc = new CurationService(db, curationModelSource, () => (t += 1000));
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'Front', parseBriefRequest({ size: 8 }));
    svc.addShelf('w', 'Group', parseBriefRequest({ size: 5, audience: { kind: 'group', group: 1 } }));
    svc.addShelf('w', 'Related', parseBriefRequest({ size: 4, anchors: [3, 5] }));
    const rng = seededRng(11);
    const sku = (i: number) => `SKU-${String(i).padStart(3, '0')}`;
    for (let step = 0; step < 60; step++) {
      const shelf = ['Front', 'Group', 'Related'][rng.int(3)]!;
      const r = rng.int(8);
      const size = shelf === 'Front' ? 8 : shelf === 'Group' ? 5 : 4;
      const actions: ActionRequest[] = [
        { kind: 'pin', slot: 1 + rng.int(size), item: sku(1 + rng.int(40)) },
        { kind: 'ban', item: sku(1 + rng.int(40)), scope: rng.int(2) === 0 ? 'shelf' : 'edition' },
        { kind: 'boost', item: sku(1 + rng.int(40)), factor: 1 + rng.int(4) },
        { kind: 'move', from: 1, to: 1 + rng.int(size) },
      ];
      try {
        if (r < 4) svc.act('w', shelf, actions[r]!);
        else if (r < 6) svc.undo('w', shelf);
        else if (r < 7) svc.redo('w', shelf);
        else svc.act('w', shelf, { kind: 'unpin', slot: 1 + rng.int(size) });
      } catch {
        continue; // nothing to undo or redo, or a pin on two slots: refused, nothing changed
      }
      // A list now depends on the lists before it (the stable fill), so both worlds start over the same
      // way: Refill with the remembered world, then with a new one over what it stored.
      svc.fill('w', 'Front');
      const cached = svc.showEdition('w');
      const again = fresh();
      again.fill('w', 'Front'); // refills with a new world, keeping the other shelves' lists, and stores it
      const rebuilt = again.showEdition('w');
      expect(rebuilt.shelves.map((s) => s.slots)).toEqual(cached.shelves.map((s) => s.slots));
      expect(rebuilt.shelves.map((s) => s.meter)).toEqual(cached.shelves.map((s) => s.meter));
    }
  });

  it('keys a pool by every input that shapes it, in any order', () => {
    const b = brief();
    const a = poolKey(b, state({ bans: new Set([3, 1]), usedInEdition: new Set([9, 4]) }), 1);
    expect(poolKey(b, state({ bans: new Set([1, 3]), usedInEdition: new Set([4, 9]) }), 1)).toBe(a);
    expect(poolKey(b, state({ bans: new Set([1, 3]), usedInEdition: new Set([4]) }), 1)).not.toBe(a);
    expect(poolKey(b, state({ bans: new Set([1, 3]), usedInEdition: new Set([4, 9]) }), 2)).not.toBe(a);
    expect(poolKey(b, state({ bans: new Set([1, 3]), usedInEdition: new Set([4, 9]), pins: new Map([[0, 7]]) }), 1)).not.toBe(a);
    expect(poolKey({ ...b, maxAgeDays: 30 }, state({ bans: new Set([1, 3]), usedInEdition: new Set([4, 9]) }), 1)).not.toBe(a);
  });
});
