import { afterEach, describe, expect, it } from 'vitest';
import { backtestShelf } from '../../src-main/services/curation/backtest.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { DAY, openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let db: Db | undefined;
afterEach(() => db?.close());

describe('backtest', () => {
  // The slow reference is plain SQL over the signal table, written from the definition: of the audience
  // active in [end − 28 d, end), the share with a signal on one of the list's items.
  it('matches a SQL count of engaged audience members, for the shelf and for the popularity list', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'Front', parseBriefRequest({ size: 5, include: { categories: ['teapots', 'lanterns'] } }));
    const e = svc.editions.byLabel('w');
    const shelf = svc.shelves.byLabel(e.id, 'Front');
    const r = backtestShelf(svc.world(), shelf, svc.shelves.slots(shelf.id), 28);

    const end = (db.prepare('SELECT max(at) FROM signal').pluck().get() as number) + 1;
    const start = end - 28 * DAY;
    const q = (sql: string, ...p: unknown[]) => db!.prepare(sql).pluck().get(...p) as number;
    const active = q('SELECT count(DISTINCT customer_id) FROM signal WHERE at >= ? AND at < ?', start, end);
    const engaged = (ext: string[]) =>
      q(
        `SELECT count(DISTINCT s.customer_id) FROM signal s JOIN item i ON i.id = s.item_id
         WHERE s.at >= ? AND s.at < ? AND i.external_id IN (${ext.map(() => '?').join(',')})`,
        start,
        end,
        ...ext,
      );
    const popular = db
      .prepare(
        `SELECT i.external_id FROM item i LEFT JOIN signal s ON s.item_id = i.id AND s.at >= ? AND s.at < ?
         WHERE i.category IN ('teapots', 'lanterns') AND (i.added_at IS NULL OR i.added_at <= ?)
         GROUP BY i.id ORDER BY count(DISTINCT s.customer_id) DESC, i.id LIMIT 5`,
      )
      .pluck()
      .all(start - 28 * DAY, start, start) as string[]; // only items that existed when the window opened

    expect(r.audienceActive).toBe(active);
    expect(r.shelf.items).toHaveLength(5);
    expect(r.shelf.engaged).toBe(engaged(r.shelf.items));
    expect(r.shelf.share).toBeCloseTo(engaged(r.shelf.items) / active, 12);
    expect(r.popularity.items).toEqual(popular);
    expect(r.popularity.engaged).toBe(engaged(popular));
    expect(r.windowDays).toBe(28);
  });

  it('counts only a rule audience, resolved at the window start', () => {
    ({ db } = openSeeded());
    const svc = new CurationService(db);
    svc.newEdition('w', '2026-03-02');
    svc.addShelf('w', 'Teapot buyers', parseBriefRequest({ size: 4, audience: { kind: 'rule', category: 'teapots', signalKinds: ['purchase'], withinDays: 90 } }));
    const e = svc.editions.byLabel('w');
    const shelf = svc.shelves.byLabel(e.id, 'Teapot buyers');
    const r = backtestShelf(svc.world(), shelf, svc.shelves.slots(shelf.id), 28);
    const end = (db.prepare('SELECT max(at) FROM signal').pluck().get() as number) + 1;
    const start = end - 28 * DAY;
    const members = db
      .prepare(
        `SELECT count(DISTINCT s.customer_id) FROM signal s JOIN item i ON i.id = s.item_id
         WHERE i.category = 'teapots' AND s.kind = (SELECT code FROM signal_kind WHERE name = 'purchase') AND s.at >= ? AND s.at < ?
           AND s.customer_id IN (SELECT customer_id FROM signal WHERE at >= ? AND at < ?)`,
      )
      .pluck()
      .get(start - 90 * DAY, start, start, end) as number;
    expect(r.audienceActive).toBe(members);
    expect(r.audienceActive).toBeGreaterThan(0);
  });
});
