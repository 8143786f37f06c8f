import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { ModelRepo, modelStatus } from '../../src-main/store/models.ts';
import { handWorkspace, tempDir } from '../holdout/fixture.ts';

/**
 * Issue 10 item 5, one default for every way in: train.start with nothing said about tuning tunes when the data
 * changed since the last tuning and otherwise trains that tuning's settings again; `tune: false` trains plainly.
 * The app's Train button and `shelfwright train` without flags both send such a request (test/renderer, test/cli).
 */
describe('train.start without a word on tuning', () => {
  it('tunes changed data, retrains unchanged data with the last tuning, and trains plainly when told not to tune', async () => {
    const d = tempDir('train-default');
    const { db, file } = await handWorkspace(d);
    db.close();
    const ctx = new AppContext();
    ctx.open(file, { create: false });
    try {
      const table = createHandlerTable(ctx);
      const run = async (payload: unknown) => {
        const started = await invoke(table, 'train.start', payload);
        if (!started.ok) throw new Error(started.error.message);
        const job = await ctx.jobs.settled((started.value as { id: string }).id);
        expect(job.error).toBeNull();
        expect(job.state).toBe('done');
        return job.summary ?? '';
      };
      const tuningOf = () => modelStatus(ctx.db).find((m) => m.kind === 'itemknn')?.evaluation as { tuning?: unknown } | null;

      // New data: tuned (the summary says what was searched; the models carry their grids).
      const first = await run({ ials: { iterations: 3 }, threads: 1 });
      expect(first).toMatch(/random split/);
      expect(tuningOf()?.tuning).toBeDefined();
      const count = new ModelRepo(ctx.db).list().length;

      // Unchanged data: no search, the last tuning's settings trained again.
      const second = await run({ ials: { iterations: 3 }, threads: 1 });
      expect(second).toMatch(/^not tuned: the data is unchanged since the last tuning/);
      expect(new ModelRepo(ctx.db).list().length).toBeGreaterThan(count);

      // Told not to tune: a plain training, whose models carry no tuning.
      const third = await run({ ials: { iterations: 3 }, threads: 1, tune: false });
      expect(third).not.toMatch(/random split|not tuned/);
      expect(tuningOf()?.tuning).toBeUndefined();
    } finally {
      ctx.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  }, 60_000);

  it('refuses a tuning request that is neither false nor a tuning', async () => {
    const d = tempDir('train-default-bad');
    const { db, file } = await handWorkspace(d);
    db.close();
    const ctx = new AppContext();
    ctx.open(file, { create: false });
    try {
      const r = await invoke(createHandlerTable(ctx), 'train.start', { tune: true });
      expect(r.ok).toBe(false);
      expect(new ModelRepo(ctx.db).list()).toHaveLength(0);
    } finally {
      ctx.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  });
});
