// @vitest-environment happy-dom
import { cleanup, render, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ApiResult } from '../../src-main/api/define.ts';
import { createClient } from '../../src-renderer/client/client.ts';
import { Models } from '../../src-renderer/screens/Models.tsx';
import { createAppStore, StoreContext } from '../../src-renderer/state/store.ts';
import { modelWords } from '../../src-main/core/models/model-words.ts';

// uPlot draws on a canvas, which happy-dom lacks (notes/toolchain.md).
vi.mock('uplot', () => ({ default: class { static paths = { bars: () => () => null }; destroy() {} } }));
vi.mock('uplot/dist/uPlot.min.css', () => ({}));

afterEach(cleanup);

const origin = {
  source: 'cluster', engine: 'Spark ALS', importedAt: Date.UTC(2026, 11, 4), savedAt: Date.UTC(2026, 11, 3), sparkVersion: '3.5.1', rank: 128,
  regParam: 0.05, alpha: 10, maxIter: 10, exportedAt: Date.UTC(2026, 11, 2), customersFoldedIn: 0, itemsWithoutFactors: 0,
  description: 'trained on a cluster (Spark 3.5.1 ALS), imported 2026-12-04, rank 128',
};
const model = (kind: string, stale: boolean, from: typeof origin | null) => ({
  id: kind.length, kind, params: {}, trainedAt: Date.UTC(2026, 11, 3), trainMs: 1200, iterations: null, losses: [], notes: [], stale,
  sizeBytes: 10, evaluation: null, tuning: null, tuningNotes: [], origin: from,
});

function renderWith(models: unknown[]) {
  const client = createClient(async (method): Promise<ApiResult<unknown>> => {
    if (method === 'models.list') return { ok: true, value: { models, hybrid: null } };
    if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
    return { ok: false, error: { code: 'input', message: method } };
  });
  render(
    <StoreContext.Provider value={createAppStore(client)}>
      <Models />
    </StoreContext.Provider>,
  );
}

describe('models screen, a model imported from a cluster', () => {
  it('says where it came from, and that it is out of date once the data moved on', async () => {
    renderWith([model('ials', true, origin), model('content', false, null)]);
    const region = await screen.findByRole('region', { name: 'Trained models' });
    const rows = await within(region).findAllByRole('row');
    const ials = rows.find((r) => r.textContent?.startsWith(modelWords('ials')))!;
    expect(ials.textContent).toContain('Trained on a cluster (Spark 3.5.1 ALS), imported 2026-12-04, rank 128');
    expect(ials.textContent).toContain('Out of date: the data changed since the signals were exported; export and fit again');
    const content = rows.find((r) => r.textContent?.startsWith(modelWords('content')))!;
    expect(content.textContent).toContain('Current');
    expect(content.textContent).not.toContain('cluster');
  });
});
