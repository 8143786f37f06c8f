import { describe, expect, it } from 'vitest';
import type { ApiResult } from '../../src-main/api/define.ts';
import { createClient } from '../../src-renderer/client/client.ts';
import { createAppStore } from '../../src-renderer/state/store.ts';

type JobPhase = 'running' | 'done' | 'failed' | 'cancelled';
const job = (state: JobPhase, fraction: number, extra: Record<string, unknown> = {}) => ({
  id: 'j1',
  kind: 'train' as const,
  state,
  progress: { stage: state === 'running' ? 'ials' : 'done', fraction },
  startedAt: 1,
  finishedAt: state === 'running' ? null : 2,
  error: null,
  summary: state === 'done' ? 'trained 5 models in 1.0 s' : null,
  ...extra,
});

/** A scripted main side: each job.status call returns the next state; every call is recorded. */
function scripted(statuses: ReturnType<typeof job>[]) {
  const calls: string[] = [];
  const client = createClient(async (method): Promise<ApiResult<unknown>> => {
    calls.push(method);
    if (method === 'train.start') return { ok: true, value: job('running', 0) };
    if (method === 'job.status') return { ok: true, value: statuses.shift() ?? job('done', 1) };
    if (method === 'job.cancel') return { ok: true, value: job('cancelled', 0.4) };
    if (method === 'models.list') return { ok: true, value: { models: [] } };
    if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
    return { ok: false, error: { code: 'input', message: `unexpected ${method}` } };
  });
  return { client, calls };
}

describe('models slice', () => {
  it('polls a training job until it ends, keeping each progress step, then reloads the models', async () => {
    const { client, calls } = scripted([job('running', 0.3), job('running', 0.7), job('done', 1)]);
    const seen: number[] = [];
    const store = createAppStore(client, Date.now, async () => {
      seen.push(store.getState().models.job?.progress.fraction ?? -1);
    });
    await store.getState().startTraining();
    expect(seen).toEqual([0, 0.3, 0.7]);
    expect(store.getState().models.job?.state).toBe('done');
    expect(store.getState().models.job?.summary).toBe('trained 5 models in 1.0 s');
    expect(calls.filter((c) => c === 'job.status')).toHaveLength(3);
    expect(calls.slice(-2).sort()).toEqual(['evaluate.latest', 'models.list']);
  });

  it('reports a failed job in words with what to do next', async () => {
    const { client } = scripted([job('failed', 0.5, { error: 'no signals to train on' })]);
    const store = createAppStore(client, Date.now, async () => {});
    await store.getState().startTraining();
    expect(store.getState().models.errors.train).toBe('no signals to train on. Check the data on the Overview screen, then try again.');
  });

  it('cancels the running job', async () => {
    const { client, calls } = scripted([job('running', 0.4), job('cancelled', 0.4)]);
    let cancelled = false;
    const store = createAppStore(client, Date.now, async () => {
      if (!cancelled) {
        cancelled = true;
        await store.getState().cancelJob();
      }
    });
    await store.getState().startTraining();
    expect(calls).toContain('job.cancel');
    expect(store.getState().models.job?.state).toBe('cancelled');
  });
});
