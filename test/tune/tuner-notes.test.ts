import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import type { ResponseOf } from '../../src-main/api/contract.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { importFile } from '../../src-main/services/import.ts';
import { handWorkspace, tempDir } from '../holdout/fixture.ts';

/**
 * The tuner's notes reach models.list as each model's `tuningNotes`, including for a model the search left out:
 * above 5,000 items EASE is not tuned (services/tune/tune.ts EASE_TUNE_MAX_ITEMS; each trial would be a dense
 * n × n inverse), so it has no tuning of its own, only the note saying why. Carried over while the data is
 * unchanged (the last tuning's settings are trained again), as the tuning records are.
 */
async function trainJob(ctx: AppContext, payload: unknown) {
  const started = await invoke(createHandlerTable(ctx), 'train.start', payload);
  if (!started.ok) throw new Error(started.error.message);
  return ctx.jobs.settled((started.value as { id: string }).id);
}

async function listed(ctx: AppContext): Promise<ResponseOf<'models.list'>['models']> {
  const r = await invoke(createHandlerTable(ctx), 'models.list', {});
  if (!r.ok) throw new Error(r.error.message);
  return (r.value as ResponseOf<'models.list'>).models;
}

describe('the tuner notes in models.list', () => {
  it('say why EASE was not tuned on a large catalogue, beside its untuned row, and survive a retrain on unchanged data', async () => {
    const d = tempDir('tuner-notes');
    const { db, file } = await handWorkspace(d);
    // 5,000 more items, never bought: the catalogue passes the tuner's EASE limit, the signals stay the hand shop's.
    const extra = path.join(d, 'more-items.csv');
    fs.writeFileSync(extra, ['id,title,category', ...Array.from({ length: 5000 }, (_, q) => `x${q},Spare part ${q},spares`)].join('\n'));
    const r = await importFile(db, { target: 'items', file: extra });
    expect(r.committed).toBe(true);
    db.close();
    const ctx = new AppContext();
    ctx.open(file, { create: false });
    try {
      const request = { models: ['itemknn', 'ials', 'ease'], ials: { iterations: 2, factors: 8 }, threads: 2 };
      const first = await trainJob(ctx, request);
      expect(first.error).toBeNull();
      expect(first.summary).toMatch(/^tuned \(/);
      const note = 'EASE not tuned: 5007 items, above 5000 (each fit would take minutes); it trains with the default lambda';
      const ease = (await listed(ctx)).find((m) => m.kind === 'ease')!;
      expect(ease.tuning).toBeNull();
      expect(ease.tuningNotes).toEqual([note]);
      const knn = (await listed(ctx)).find((m) => m.kind === 'itemknn')!;
      expect(knn.tuning).not.toBeNull();
      // The log here has no times, so item-kNN's recency half-lives were not searched (and EASE, untuned, has no such note).
      expect(knn.tuningNotes).toEqual(['recency half-lives not searched: no signal is older than another (the log has no times)']);

      const second = await trainJob(ctx, request);
      expect(second.summary).toMatch(/^not tuned: the data is unchanged since the last tuning/);
      expect((await listed(ctx)).find((m) => m.kind === 'ease')!.tuningNotes).toEqual([note]);
    } finally {
      ctx.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  }, 180_000);
});
