import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { ModelRepo, modelStatus } from '../../src-main/store/models.ts';
import path from 'node:path';
import { importFile } from '../../src-main/services/import.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';
import { handWorkspace, tempDir } from '../holdout/fixture.ts';

/**
 * Issue 10 item 5, one default for every way in: train.start with nothing said about tuning tunes when the data
 * changed since the last tuning and otherwise trains that tuning's settings again; `tune: false` trains plainly.
 * The app's Train button and `shelfwright train` without flags both send such a request (test/renderer, test/cli).
 */
/** Starts train.start through the handler table and waits for the job to settle. */
async function trainJob(ctx: AppContext, payload: unknown) {
  const started = await invoke(createHandlerTable(ctx), 'train.start', payload);
  if (!started.ok) throw new Error(started.error.message);
  return ctx.jobs.settled((started.value as { id: string }).id);
}

describe('train.start without a word on tuning', () => {
  it('tunes changed data, retrains unchanged data with the last tuning, and trains plainly when told not to tune', async () => {
    const d = tempDir('train-default');
    const { db, file } = await handWorkspace(d);
    db.close();
    const ctx = new AppContext();
    ctx.open(file, { create: false });
    try {
      const run = async (payload: unknown) => {
        const job = await trainJob(ctx, payload);
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

  it('trains a shop too small to tune with the default settings, and says so; asked to tune outright, it refuses', async () => {
    // Two customers with one signal each: no customer keeps history on both sides of a validation split.
    const d = tempDir('train-default-tiny');
    const file = path.join(d, 'tiny.sqlite');
    fs.writeFileSync(path.join(d, 'items.csv'), 'id,title,category\ni1,Moss lantern,garden\ni2,Copper kettle,kitchen\ni3,Paper notebook,stationery\n');
    fs.writeFileSync(path.join(d, 'customers.csv'), 'id\nu1\nu2\n');
    fs.writeFileSync(path.join(d, 'signals.csv'), 'customer,item,kind\nu1,i1,purchase\nu2,i2,view\n');
    const db = openWorkspace(file);
    for (const target of ['items', 'customers', 'signals'] as const) {
      const r = await importFile(db, { target, file: path.join(d, `${target}.csv`) });
      if (!r.committed) throw new Error(`import of ${target} failed: ${JSON.stringify(r.errors)}`);
    }
    db.close();
    const ctx = new AppContext();
    ctx.open(file, { create: false });
    try {
      const run = (payload: unknown) => trainJob(ctx, payload);
      const plain = await run({ models: ['content', 'itemknn', 'popularity'], threads: 1 });
      expect(plain.error).toBeNull();
      expect(plain.summary).toMatch(/^not tuned \(no customer has two or more items: nothing can be held out for tuning\): trained 3 models with the default settings/);
      expect(modelStatus(ctx.db).map((m) => m.kind).sort()).toEqual(['content', 'itemknn', 'popularity']);
      const asked = await run({ models: ['content', 'itemknn', 'popularity'], threads: 1, tune: { k: 10 } });
      expect(asked.state).toBe('failed');
      expect(asked.error).toMatch(/nothing can be held out for tuning/);
    } finally {
      ctx.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  }, 60_000);
});
