import { describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { fixedParams, fullyFixed } from '../../src-main/services/tune/grid.ts';
import { tunedSummary } from '../../src-main/services/tune/train-tuned.ts';
import type { ModelTuning } from '../../src-main/services/tune/tune.ts';
import { capture } from '../cli/capture.ts';
import { handWorkspaceForFile } from '../holdout/fixture.ts';

/**
 * `train --tune` with hyper-parameter flags of the user's own: each flag's value is held fixed while the rest
 * of that model's grid is searched, a model whose whole grid is fixed is not searched, and the summary (the
 * job's line and the "tuned" column) shows the fixed values as fixed by the user. The hand-worked workspace
 * is the smallest the tune tests use.
 */
const hand = handWorkspaceForFile('tune-overrides');

async function run(...argv: string[]) {
  const io = capture();
  const code = await main([...argv, '-w', hand.file()], io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

type Stored = { kind: string; params: Record<string, unknown>; tuning: { grid: { best: Record<string, unknown>; ndcg: number | null; trials: { params: Record<string, unknown> }[] } } | null };

describe('train --tune with flags of the user', () => {
  it('searches only the settings not given: every trial holds the flags, fewer trials, the flag trained', async () => {
    // 3 factors and 2 neighbours are in no grid; --lambda and --ease-values are EASE's whole grid. The widest
    // budget, so that more than one setting of each searched model fits in it however the machine is loaded.
    const r = await run('train', '--tune', '--k', '3', '--iterations', '2', '--threads', '1', '--factors', '3', '--neighbours', '2', '--lambda', '300', '--ease-values', 'presence', '--budget', '20');
    expect(r.code, r.err).toBe(0);

    const ctx = new AppContext();
    ctx.open(hand.file(), { create: false });
    let models: Stored[];
    try {
      const list = await invoke(createHandlerTable(ctx), 'models.list', {});
      if (!list.ok) throw new Error(list.error.message);
      models = (list.value as { models: Stored[] }).models;
    } finally {
      ctx.close();
    }
    const model = (kind: string) => models.find((m) => m.kind === kind)!;

    // iALS: the stored search tried factors 3 only; the other settings were still searched; 3 was trained.
    const ials = model('ials');
    const ialsTrials = ials.tuning!.grid.trials;
    expect(ialsTrials.length).toBeGreaterThan(1);
    for (const t of ialsTrials) expect(t.params['factors']).toBe(3);
    expect(new Set(ialsTrials.map((t) => JSON.stringify(t.params))).size).toBe(ialsTrials.length);
    expect(ials.params['factors']).toBe(3);
    expect(ials.params).toMatchObject(ials.tuning!.grid.best);

    // item-kNN: neighbours 2 in every trial, the rest varied; no point tried twice.
    const knnTrials = model('itemknn').tuning!.grid.trials;
    expect(knnTrials.length).toBeGreaterThan(1);
    for (const t of knnTrials) expect(t.params['k']).toBe(2);
    expect(new Set(knnTrials.map((t) => JSON.stringify(t.params))).size).toBe(knnTrials.length);
    expect(model('itemknn').params['k']).toBe(2);

    // EASE: its only grid parameter was given, so it was not searched at all.
    const ease = model('ease');
    expect(ease.tuning!.grid.trials).toEqual([]);
    expect(ease.tuning!.grid.ndcg).toBeNull();
    expect(ease.tuning!.grid.best).toEqual({ lambda: 300, values: 'presence' });
    expect(ease.params['lambda']).toBe(300);
    // The api says so too (models.list, hence --json): what was fixed, and whether anything was searched.
    expect(ease.tuning!.grid).toMatchObject({ fixed: { lambda: 300, values: 'presence' }, searched: false });
    expect(ials.tuning!.grid).toMatchObject({ fixed: { factors: 3 }, searched: true });

    // The column: flags shown as fixed by the user; no "your flag replaced the grid's best" wording any more.
    const line = (kind: string) => r.out.split('\n').find((l) => l.startsWith(`${kind} `)) ?? '';
    expect(line('ials')).toMatch(/factors=3 \(fixed by you\)/);
    expect(line('ials')).toMatch(/regularization=[\d.]+ alpha=[\d.]+ scaling=(linear|log) factors=3 \(fixed by you\) \(NDCG@3 /);
    expect(line('itemknn')).toMatch(/k=2 \(fixed by you\) shrink=\d+ values=(presence|log|linear) normalize=(none|sum) \(NDCG@3 /);
    expect(line('ease')).toMatch(/lambda=300 values=presence \(fixed by you: not searched\)/);
    expect(r.out).not.toMatch(/your flag|grid's best was/);
    // The job's summary line.
    const summary = r.out.split('\n')[0]!;
    expect(summary).toMatch(
      /^tuned \(random split; itemknn NDCG@3 [\d.]+, ease not searched, ials NDCG@3 [\d.]+; \d+ settings tried for [\d.]+ of 20 plain fits\) and trained 5 models/,
    );
    expect(summary).toMatch(/; fixed by you: itemknn k=2, ease lambda=300 values=presence \(every setting of its grid, so not searched\), ials factors=3(; hybrid: .+)?$/);
  }, 60_000);

  it('without flags nothing is fixed and the summary says nothing of it', () => {
    const tuning = {
      k: 10,
      split: { method: 'time' as const, train: 1, validation: 1, customers: 1, from: 0 },
      elapsedMs: 1000,
      models: [
        { model: 'ials', trials: [], best: { factors: 64, regularization: 0.01, alpha: 1, scaling: 'linear' }, ndcg: 0.5, fixed: {}, searched: true },
        { model: 'ease', trials: [], best: { lambda: 300, values: 'presence' }, ndcg: 0.6, fixed: {}, searched: true },
      ] satisfies ModelTuning[],
    };
    expect(tunedSummary({ models: ['ials', 'content'], elapsedMs: 500 }, tuning)).toBe(
      'tuned (time split; ials NDCG@10 0.500, ease NDCG@10 0.600) and trained 2 models in 1.5 s',
    );
  });
});

describe('fixing grid parameters', () => {
  it('keeps only grid parameters of the training parameters', () => {
    expect(fixedParams({ ials: { factors: 32, iterations: 3, seed: 2 }, itemknn: {}, ease: { lambda: 300 } })).toEqual({ ials: { factors: 32 }, ease: { lambda: 300 } });
    expect(fixedParams(undefined)).toEqual({});
    expect(fullyFixed('ease', { ease: { lambda: 300 } })).toBe(false);
    // With times the recency half-lives are grid parameters too; without times they are not searched.
    expect(fullyFixed('ease', { ease: { lambda: 300, values: 'log' } })).toBe(false);
    expect(fullyFixed('ease', { ease: { lambda: 300, values: 'log' } }, false)).toBe(true);
    expect(fullyFixed('ease', { ease: { lambda: 300, values: 'log', fitHalfLifeDays: 'off', profileHalfLifeDays: 90 } })).toBe(true);
    expect(fixedParams({ ease: { lambda: 300, fitHalfLifeDays: null, profileHalfLifeDays: 90 } })).toEqual({ ease: { lambda: 300, fitHalfLifeDays: 'off', profileHalfLifeDays: 90 } });
    expect(fullyFixed('ials', { ials: { factors: 3, regularization: 0.1, alpha: 1 } })).toBe(false);
    expect(fullyFixed('ials', { ials: { factors: 3, regularization: 0.1, alpha: 1, scaling: 'log' } })).toBe(true);
  });
});
