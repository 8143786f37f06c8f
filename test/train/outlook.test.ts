import { describe, expect, it } from 'vitest';
import { JobRegistry } from '../../src-main/services/jobs.ts';
import { LONG_CPU_SECONDS, trainingOutlook } from '../../src-main/services/train/outlook.ts';

describe('the training outlook (said before a long training starts)', () => {
  it('predicts EASE as n³ over at most 20,000 items and iALS per sweep from the counts, each fitted twice', () => {
    // Work terms as in Steck (2019) (the inverse) and Hu et al. (2008) / Takács et al. (2011) (per sweep:
    // (m + n)·k² + nnz·k), with services/tune/trial-cost.ts's per-unit costs; worked by hand here.
    const o = trainingOutlook({ items: 160_000, customers: 360_000, signals: 17_000_000 }, { models: ['ease', 'ials'] });
    const ease = o.parts.find((p) => p.part === 'ease')!.cpuSeconds;
    const ials = o.parts.find((p) => p.part === 'ials')!.cpuSeconds;
    expect(ease).toBeCloseTo(2 * 0.035e-9 * 20_000 ** 3, 6); // 560 s: the restricted 20,000 items, not 160,000
    expect(ials).toBeCloseTo(2 * 15 * (1e-9 * 520_000 * 64 * 64 + 22e-9 * 17_000_000 * 64), 6);
    expect(o.cpuSeconds).toBeCloseTo(ease + ials, 6);
    expect(o.notice).toMatch(/^a large workspace \(160,000 items, 360,000 customers, 17,000,000 signals\): this training needs roughly \d+ CPU-min/);
    expect(o.notice).toMatch(/EASE's dense inverse over 20,000 of the 160,000 items 9 CPU-min/);
    expect(o.notice).toMatch(/Quicker: without EASE, iALS with fewer factors/);
  });

  it('adds tuning as its budget in plain fits and offers to skip it', () => {
    const sizes = { items: 16_000, customers: 36_000, signals: 1_700_000 };
    const plain = trainingOutlook(sizes);
    const tuned = trainingOutlook(sizes, { tuneBudget: 3 });
    expect(tuned.parts.find((p) => p.part === 'tuning')!.cpuSeconds).toBeCloseTo((3 * plain.cpuSeconds) / 2, 6);
    expect(tuned.notice).toMatch(/Quicker: without tuning/);
  });

  it('says nothing about a small shop, or without the costly models', () => {
    expect(trainingOutlook({ items: 2_500, customers: 15_000, signals: 400_000 }).cpuSeconds).toBeLessThan(LONG_CPU_SECONDS);
    expect(trainingOutlook({ items: 2_500, customers: 15_000, signals: 400_000 }).notice).toBeNull();
    expect(trainingOutlook({ items: 160_000, customers: 360_000, signals: 17_000_000 }, { models: ['content', 'popularity'] }).notice).toBeNull();
  });

  it('reaches the job as its notice, kept while the progress moves on', async () => {
    const jobs = new JobRegistry();
    let finish!: () => void;
    const gate = new Promise<void>((r) => (finish = r));
    const job = jobs.start('train', async (report) => {
      report({ stage: 'starting', fraction: 0, notice: 'a large workspace' });
      report({ stage: 'fit', fraction: 0.5 });
      await gate;
      return 'done';
    });
    const mid = jobs.status(job.id);
    expect(mid.notice).toBe('a large workspace');
    expect(mid.progress).toEqual({ stage: 'fit', fraction: 0.5 });
    finish();
    expect((await jobs.settled(job.id)).notice).toBe('a large workspace');
  });
});
