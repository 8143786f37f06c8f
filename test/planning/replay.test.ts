import { describe, expect, it } from 'vitest';
import { replayPlan } from '../../src-main/core/planning/replay.ts';
import { DAY_MS } from '../../src-main/core/types.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { PlanService } from '../../src-main/services/planning/service.ts';
import { openSeeded } from '../curation-services/fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

describe('replaying a plan on history', () => {
  it('counts, per week, the active audience and who touched a planned item (hand-counted)', () => {
    // Week 1: customers 0 and 1 active, 0 touched planned item 5. Week 2: customer 1 touched item 6 twice,
    // customer 2 is not in the audience. Pooled: (1 + 1) engaged of (2 + 1) active = 2/3.
    const t = (d: number) => d * DAY_MS;
    const signals = {
      length: 5,
      customer: Int32Array.from([0, 1, 1, 1, 2]),
      item: Int32Array.from([5, 3, 6, 6, 6]),
      kind: new Uint8Array(5),
      value: new Float32Array(5),
      at: Float64Array.from([t(1), t(2), t(8), t(9), t(8)]),
    };
    const member = Uint8Array.from([1, 1, 0]);
    const r = replayPlan(signals, 3, member, [0, t(7)], [Int32Array.from([5]), Int32Array.from([6])], 10);
    expect(r.weeks.map((w) => [w.active, w.engaged])).toEqual([
      [2, 1],
      [1, 1],
    ]);
    expect(r.share).toBeCloseTo(2 / 3, 12);
  });

  it('backtests a shelf plan beside a popularity plan over the same audience and weeks', async () => {
    const { db } = openSeeded();
    const cur = new CurationService(db);
    cur.newEdition('week 9', '2026-02-23');
    cur.addShelf('week 9', 'Front', parseBriefRequest({ size: 4 }));
    const b = await new PlanService(db).backtest({ shelf: 'Front', weeks: 3, horizon: { restWeeks: 0, maxAppearances: 3 } });
    expect(b.weeks.map((w) => w.date)).toEqual(['2026-02-08', '2026-02-15', '2026-02-22']);
    for (const w of b.weeks) {
      expect(w.plan).toBeLessThanOrEqual(w.active);
      expect(w.popularity).toBeLessThanOrEqual(w.active);
    }
    const active = b.weeks.reduce((a, w) => a + w.active, 0);
    expect(active).toBeGreaterThan(0);
    expect(b.share.plan).toBeCloseTo(b.weeks.reduce((a, w) => a + w.plan, 0) / active, 12);
    expect(b.share.popularity).toBeCloseTo(b.weeks.reduce((a, w) => a + w.popularity, 0) / active, 12);
  });
});
