import { describe, expect, it } from 'vitest';
import { CancelledError } from '../../src-main/core/errors.ts';
import { JobRegistry } from '../../src-main/services/jobs.ts';

describe('JobRegistry', () => {
  it('reports progress while running and the summary when done', async () => {
    const jobs = new JobRegistry();
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const job = jobs.start('train', async (report) => {
      report({ stage: 'fitting', fraction: 0.5, model: 'ials', iteration: 3, iterations: 6 });
      await gate;
      return 'trained 1 model';
    });
    await Promise.resolve();
    expect(jobs.status(job.id)).toMatchObject({ state: 'running', progress: { stage: 'fitting', fraction: 0.5 } });
    release();
    const end = await jobs.settled(job.id);
    expect(end).toMatchObject({ state: 'done', summary: 'trained 1 model', progress: { fraction: 1 } });
    expect(end.finishedAt).not.toBeNull();
  });

  it('cancels through the abort signal and records it as cancelled, not failed', async () => {
    const jobs = new JobRegistry();
    const job = jobs.start('evaluate', (_report, signal) =>
      new Promise<string>((_, reject) => signal.addEventListener('abort', () => reject(new CancelledError()))),
    );
    jobs.cancel(job.id);
    expect(await jobs.settled(job.id)).toMatchObject({ state: 'cancelled', error: null });
  });

  it('keeps the error message of a failed job', async () => {
    const jobs = new JobRegistry();
    const job = jobs.start('train', async () => {
      throw new Error('factors became NaN at iteration 4');
    });
    expect(await jobs.settled(job.id)).toMatchObject({ state: 'failed', error: 'factors became NaN at iteration 4' });
  });

  it('runs one job of a kind at a time', () => {
    const jobs = new JobRegistry();
    const a = jobs.start('train', () => new Promise(() => {}));
    const b = jobs.start('train', async () => 'second');
    expect(b.id).toBe(a.id);
    jobs.cancelAll();
  });

  it('says which job it does not know', () => {
    expect(() => new JobRegistry().status('nope')).toThrow('no job nope');
  });
});
