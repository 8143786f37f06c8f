import { afterEach, describe, expect, it } from 'vitest';
import { CurationService } from '../../src-main/services/curation/service.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { DAY, openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

function setup(): CurationService {
  ({ db } = openSeeded());
  let t = Date.parse('2026-03-01T09:00:00Z');
  return new CurationService(db!, undefined, () => (t += 1000));
}

const only = (part: string) => ({ content: 0, collaborative: 0, audience: 0, popularity: 0, trend: 0, freshness: 0, [part]: 1 });
const EDITION = '2026-03-02';

/** Signals of an item in [from, to) (unix ms), straight from the store. */
function signalsIn(externalId: string, from: number, to: number): number {
  return (
    db!.prepare('SELECT count(*) AS n FROM signal s JOIN item i ON i.id = s.item_id WHERE i.external_id = ? AND s.at >= ? AND s.at < ?').get(externalId, from, to) as {
      n: number;
    }
  ).n;
}

describe("each slot's rank and main reason", () => {
  it('ranks each slot in its pool so that different scores never share a rank', () => {
    const svc = setup();
    svc.newEdition('w', EDITION);
    const v = svc.addShelf('w', 'Front', parseBriefRequest({ size: 8 }));
    const ranks = v.slots.map((s) => s.rank!);
    expect(ranks.every((r) => Number.isInteger(r) && r >= 1 && r <= v.poolSize)).toBe(true);
    for (const a of v.slots) for (const b of v.slots) if (a.score !== b.score) expect(a.rank).not.toBe(b.rank);
    // Higher score, better (smaller) rank.
    for (const a of v.slots) for (const b of v.slots) if (a.score! > b.score!) expect(a.rank!).toBeLessThan(b.rank!);
  });

  it("says 'popular' with the item's distinct customers as the store counts them", () => {
    const svc = setup();
    svc.newEdition('w', EDITION);
    const v = svc.addShelf('w', 'Popular', parseBriefRequest({ size: 5, weights: only('popularity') }));
    const customers = (db!.prepare('SELECT count(*) AS n FROM customer').get() as { n: number }).n;
    for (const s of v.slots) {
      const held = (
        db!.prepare('SELECT count(DISTINCT customer_id) AS n FROM signal s JOIN item i ON i.id = s.item_id WHERE i.external_id = ?').get(s.item) as { n: number }
      ).n;
      expect(s.reason).toEqual({ kind: 'popular', customers: held, customerCount: customers });
    }
  });

  it("says 'new' with the days since the item was added, and 'rising' with the two windows' counts", () => {
    const svc = setup();
    svc.newEdition('w', EDITION);
    const fresh = svc.addShelf('w', 'New', parseBriefRequest({ size: 4, weights: only('freshness') }));
    for (const s of fresh.slots) {
      const added = (db!.prepare('SELECT added_at AS a FROM item WHERE external_id = ?').get(s.item) as { a: number }).a;
      expect(s.reason).toEqual({ kind: 'new', ageDays: Math.floor((Date.parse(EDITION) - added) / DAY) });
    }
    const rising = svc.addShelf('w', 'Rising', parseBriefRequest({ size: 4, weights: only('trend') }));
    // The edition is dated after the last signal: the windows end just after it (world.ts trendFor).
    const last = (db!.prepare('SELECT max(at) AS t FROM signal').get() as { t: number }).t;
    const now = last + 1;
    let said = 0;
    for (const s of rising.slots) {
      const recent = signalsIn(s.item!, now - 14 * DAY, now);
      const previous = signalsIn(s.item!, now - 28 * DAY, now - 14 * DAY);
      if (s.reason === null) {
        expect(recent).toBeLessThanOrEqual(previous); // no rise to speak of, and nothing else weighed
        continue;
      }
      expect(s.reason).toMatchObject({ kind: 'rising', recent, previous, windowDays: 14 });
      expect(recent).toBeGreaterThan(previous);
      said++;
    }
    expect(said).toBeGreaterThan(0);
  });
});
