import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { loadIals } from '../../src-main/core/models/ials.ts';
import { JobRegistry } from '../../src-main/services/jobs.ts';
import { trainAll, trainJob } from '../../src-main/services/train/train-job.ts';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { fitEase } from '../../src-main/core/models/ease.ts';
import { TRAIN_EASE_DEFAULTS, type TrainProgress } from '../../src-main/services/train/train-models.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { BlendRepo } from '../../src-main/store/blends.ts';
import { dataFingerprint, ModelRepo, modelStatus } from '../../src-main/store/models.ts';
import { smallWorkspace } from '../store/models-fixture.ts';

const ws = smallWorkspace({ items: 30, customers: 60 });
afterAll(() => {
  ws.db.close();
  fs.rmSync(ws.dir, { recursive: true, force: true });
});
const options = { params: { ials: { factors: 8, iterations: 4, seed: 2 } }, threads: 2 };

describe('trainAll (worker thread)', () => {
  it('trains every model off-thread, reporting progress, and writes nothing', async () => {
    const seen: TrainProgress[] = [];
    const before = new ModelRepo(ws.db).list().length;
    const out = await trainAll(ws.file, options, { onProgress: (p) => seen.push(p) });
    expect(out.records.map((r) => r.kind)).toEqual(['content', 'itemknn', 'ials', 'ease', 'popularity']);
    expect(out.fingerprint).toBe(dataFingerprint(ws.db));
    expect(new ModelRepo(ws.db).list().length).toBe(before);
    // progress: stages in order, fractions never falling, iALS iterations reported, ends at 1
    for (let q = 1; q < seen.length; q++) expect(seen[q]!.fraction).toBeGreaterThanOrEqual(seen[q - 1]!.fraction);
    expect(seen[0]!.stage).toBe('load');
    expect(seen.at(-1)).toEqual({ stage: 'done', fraction: 1 });
    expect(seen.filter((p) => p.model === 'ials' && p.iteration !== undefined).map((p) => p.iteration)).toEqual([1, 2, 3, 4]);
    const ials = loadIals(out.records.find((r) => r.kind === 'ials')!.bytes);
    expect(ials.itemCount).toBe(30);
    expect(ials.customerCount).toBe(60);
    expect(out.records.find((r) => r.kind === 'ials')!.report.losses).toHaveLength(4);
  });

  it('fits EASE in its own thread to exactly the model fitted on this thread, and passes its errors back by kind', async () => {
    // The same fitEase on the same matrix, in another thread: the bytes must not differ.
    const out = await trainAll(ws.file, { ...options, models: ['ease'] });
    expect(out.timings.find((t) => t.stage === 'ease')?.inThread).toBe(true);
    const here = fitEase(buildInteractionMatrix(loadDataset(ws.db)), { ...TRAIN_EASE_DEFAULTS });
    expect(Buffer.from(out.records[0]!.bytes).equals(Buffer.from(here.model.serialize()))).toBe(true);
    const failed: unknown = await trainAll(ws.file, { ...options, models: ['ease'], params: { ease: { lambda: 0 } } }).catch((e: unknown) => e);
    expect(failed).toBeInstanceOf(InputError);
    expect((failed as Error).message).toMatch(/lambda must be > 0/);
  });

  it('passes a bad workspace path back as an InputError', async () => {
    await expect(trainAll(`${ws.dir}/missing.sqlite`, options)).rejects.toBeInstanceOf(InputError);
  });
});

describe('training as a background job', () => {
  it('stores all models in one go; a new signal makes them stale', async () => {
    const jobs = new JobRegistry();
    const job = jobs.start('train', trainJob(ws.db, ws.file, options));
    expect(jobs.status(job.id).progress.fraction).toBeGreaterThanOrEqual(0);
    const end = await jobs.settled(job.id);
    expect(end.summary).toMatch(/^trained 5 models/);
    expect(end.progress).toMatchObject({ stage: 'done', fraction: 1 });
    const status = modelStatus(ws.db);
    expect(status.map((m) => m.kind).sort()).toEqual(['content', 'ease', 'ials', 'itemknn', 'popularity']);
    expect(status.every((m) => !m.stale)).toBe(true);
    // The validated blend is stored with them, learned over the five models it may use.
    const blend = new BlendRepo(ws.db).current()!;
    expect(blend.modelIds.sort()).toEqual(status.map((m) => m.id).sort());
    expect(blend.blend.validation.singles.map((s) => s.model)).toEqual(['content', 'itemknn', 'ials', 'ease', 'popularity']);
    expect(end.summary).toContain(`; hybrid: ${blend.blend.reason}`);
    ws.db.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (1, 1, (SELECT code FROM signal_kind WHERE name = 'click'), 1, 1)").run();
    expect(modelStatus(ws.db).every((m) => m.stale)).toBe(true);
  });

  it('cancel stops the thread and writes nothing', async () => {
    const before = new ModelRepo(ws.db).list();
    const jobs = new JobRegistry();
    const job = jobs.start('train', trainJob(ws.db, ws.file, { ...options, params: { ials: { factors: 8, iterations: 200, seed: 2 } } }));
    while (jobs.status(job.id).progress.model !== 'ials') await new Promise((r) => setTimeout(r, 5));
    jobs.cancel(job.id);
    expect((await jobs.settled(job.id)).state).toBe('cancelled');
    expect(new ModelRepo(ws.db).list()).toEqual(before);
  });
});

describe('trainJob (JobRegistry body)', () => {
  it('runs as a background job that the registry reports as done, with a summary line', async () => {
    const jobs = new JobRegistry();
    const started = jobs.start('train', trainJob(ws.db, ws.file, { ...options, models: ['popularity', 'ials'] }));
    const end = await jobs.settled(started.id);
    expect(end.state).toBe('done');
    expect(end.summary).toMatch(/^trained 2 models in \d+\.\d s/);
    expect(new ModelRepo(ws.db).loadCurrent('popularity')!.fingerprint).toBe(dataFingerprint(ws.db));
  });
});
