import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { tunedOverrides } from '../../src-main/services/tune/train-tuned.ts';
import { capture } from '../cli/capture.ts';
import { handWorkspace, tempDir } from '../holdout/fixture.ts';

/**
 * `train --tune` with hyper-parameter flags of the user's own: the flags win over the grid's best, and the
 * summary (the job's line and the "tuned" column) says so instead of showing the grid's best as trained.
 * The hand-worked workspace is the smallest the tune tests use.
 */
let dir: string;
let ws: string;

beforeAll(async () => {
  dir = tempDir('tune-overrides');
  const { db, file } = await handWorkspace(dir);
  db.close();
  ws = file;
}, 30_000);
afterAll(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

async function run(...argv: string[]) {
  const io = capture();
  const code = await main([...argv, '-w', ws], io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

describe('train --tune with flags of the user', () => {
  it('shows the values trained, and the grid best beside each one a flag overrode', async () => {
    // 3 factors and 2 neighbours are in no grid (factors 32/64, neighbours 20/50/100): always overrides.
    const r = await run('train', '--tune', '--k', '3', '--iterations', '2', '--threads', '1', '--factors', '3', '--neighbours', '2');
    expect(r.code, r.err).toBe(0);
    const line = (kind: string) => r.out.split('\n').find((l) => l.startsWith(`${kind} `)) ?? '';
    expect(line('ials')).toMatch(/factors=3 \(your flag; the grid's best was (32|64)\)/);
    expect(line('ials')).not.toMatch(/factors=(32|64)/);
    expect(line('ials')).toMatch(/the grid's best scored NDCG@3/);
    expect(line('itemknn')).toMatch(/k=2 \(your flag; the grid's best was (20|50|100)\)/);
    // Settings without a flag are the grid's best, shown as before.
    expect(line('ease')).toMatch(/lambda=\d+ \(NDCG@3 /);
    expect(line('ease')).not.toMatch(/your flag/);
    // The job's summary line says which of the user's settings were trained instead of the grid's best.
    const summary = r.out.split('\n')[0]!;
    expect(summary).toMatch(/^tuned \(random split; .*\) and trained 5 models/);
    expect(summary).toMatch(/trained with your own itemknn k=2 \(the grid's best was (20|50|100)\), ials factors=3 \(the grid's best was (32|64)\)/);

    // What the column shows is what was stored and trained.
    const ctx = new AppContext();
    ctx.open(ws, { create: false });
    try {
      const list = await invoke(createHandlerTable(ctx), 'models.list', {});
      if (!list.ok) throw new Error(list.error.message);
      const models = (list.value as { models: { kind: string; params: Record<string, unknown> }[] }).models;
      expect(models.find((m) => m.kind === 'ials')!.params['factors']).toBe(3);
      expect(models.find((m) => m.kind === 'itemknn')!.params['k']).toBe(2);
    } finally {
      ctx.close();
    }
  }, 60_000);

  it('a flag equal to the grid best, or for a parameter no grid searches, overrides nothing', () => {
    const tuning = {
      models: [
        { model: 'ials' as const, trials: [], best: { factors: 64, regularization: 0.01, alpha: 1, scaling: 'linear' }, ndcg: 0.5 },
        { model: 'hybrid' as const, trials: [], best: { content: 0.3 }, ndcg: 0.6 },
      ],
    };
    expect(tunedOverrides({ ials: { factors: 64, iterations: 3, seed: 2 } }, tuning)).toEqual([]);
    expect(tunedOverrides({ ials: { factors: 32, scaling: 'log' } }, tuning)).toEqual([
      { model: 'ials', param: 'factors', used: 32, best: 64 },
      { model: 'ials', param: 'scaling', used: 'log', best: 'linear' },
    ]);
    expect(tunedOverrides(undefined, tuning)).toEqual([]);
  });
});
