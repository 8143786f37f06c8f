import { afterEach, describe, expect, it } from 'vitest';
import { trendRatios } from '../../src-main/core/models/popularity.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { loadWorld, noModels, trendFor } from '../../src-main/services/curation/world.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { DAY, openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

describe('the trend an edition is scored with', () => {
  it('is the end-of-history reading for an edition after the last signal, and its own date for a back-dated one', () => {
    ({ db } = openSeeded());
    const world = loadWorld(db, noModels);
    const s = world.ds.signals;
    let last = -Infinity;
    for (let k = 0; k < s.length; k++) last = Math.max(last, s.at[k]!);
    expect(trendFor(world, last + 7 * DAY)).toBeUndefined(); // the world's own, measured just after `last`
    const back = last - 20 * DAY;
    const atBack = trendFor(world, back)!;
    // The reference is trendRatios' definition at that time: windows [back - 14 d, back) and the 14 days before.
    expect(Array.from(atBack)).toEqual(Array.from(Float32Array.from(trendRatios(world.ds, { now: back }))));
    expect(Array.from(atBack)).not.toEqual(Array.from(world.hybrid.data.trend!));
    expect(trendFor(world, back)).toBe(atBack); // kept for the next shelf of that edition
  });

  it('fills a shelf of a back-dated edition as its date allows, and differently from one dated after the data', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    const brief = parseBriefRequest({ size: 5, weights: { content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 1, freshness: 0 } });
    // Every fixture item exists by 26 February (the newest is added four days before 1 March), so only the
    // trend can tell the two editions apart (checked: with the end-of-history trend for both, they match).
    svc.newEdition('back', '2026-02-26');
    svc.newEdition('ahead', '2026-03-09');
    const back = svc.addShelf('back', 'Rising', brief).slots.map((x) => x.item);
    const ahead = svc.addShelf('ahead', 'Rising', brief).slots.map((x) => x.item);
    expect(back).not.toEqual(ahead);
  });
});
