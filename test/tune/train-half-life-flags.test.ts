import { describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { PopularityModel, RECENT_POPULARITY } from '../../src-main/core/models/popularity.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { loadTrainedModels } from '../../src-main/services/holdout/trained.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { capture } from '../cli/capture.ts';
import { handWorkspaceForFile } from '../holdout/fixture.ts';

/**
 * `train --popularity-half-life N --content-profile-half-life off`: the values given are trained and stored as
 * given (not searched), and a recent popularity leaves the "popularity" row all-time counts, serving the blend and
 * a row of its own (services/holdout/trained.ts).
 */
const hand = handWorkspaceForFile('half-life-flags');

describe('train with the popularity and content half-lives given', () => {
  it('trains and stores them as given; the popularity row stays all-time counts, recent popularity has its own', async () => {
    const io = capture();
    const code = await main(['train', '--tune', '--k', '3', '--iterations', '2', '--threads', '1', '--popularity-half-life', '30', '--content-profile-half-life', 'off', '-w', hand.file()], io, {});
    expect(code, io.stderr.join('\n')).toBe(0);
    const ctx = new AppContext();
    ctx.open(hand.file(), { create: false });
    try {
      const list = await invoke(createHandlerTable(ctx), 'models.list', {});
      if (!list.ok) throw new Error(list.error.message);
      const models = (list.value as { models: { kind: string; params: Record<string, unknown> }[] }).models;
      expect(models.find((m) => m.kind === 'popularity')!.params).toEqual({ fitHalfLifeDays: 30 });
      expect(models.find((m) => m.kind === 'content')!.params).toMatchObject({ profileHalfLifeDays: null });

      const t = loadTrainedModels(ctx.db, loadDataset(ctx.db));
      const allTime = t.scorers.get('popularity') as PopularityModel;
      const recent = t.scorers.get(RECENT_POPULARITY) as PopularityModel;
      expect(allTime.fitHalfLifeDays).toBeNull();
      expect(recent.fitHalfLifeDays).toBe(30);
      // All-time: the number of customers with an entry for each item (columnCounts of the presence matrix).
      const counts = new Float32Array(t.matrix.cols);
      for (let p = 0; p < t.matrix.indptr[t.matrix.rows]!; p++) counts[t.matrix.indices[p]!]!++;
      expect(Array.from(allTime.scores)).toEqual(Array.from(counts));
    } finally {
      ctx.close();
    }
  }, 60_000);

  it('refuses a half-life that is not days > 0 or off, naming the flag', async () => {
    const io = capture();
    const code = await main(['train', '--popularity-half-life', '-3', '-w', hand.file()], io, {});
    expect(code).not.toBe(0);
    expect(io.stderr.join('\n')).toMatch(/popularity-half-life/);
  });
});
