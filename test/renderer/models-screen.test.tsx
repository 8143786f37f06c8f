// @vitest-environment happy-dom
import { cleanup, render, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ApiResult } from '../../src-main/api/define.ts';
import { createClient } from '../../src-renderer/client/client.ts';
import { Models } from '../../src-renderer/screens/Models.tsx';
import { createAppStore, StoreContext } from '../../src-renderer/state/store.ts';

// uPlot draws on a canvas, which happy-dom lacks (notes/toolchain.md): record what it is given instead.
const plots: { opts: { title?: string; series: { label?: string }[] }; data: unknown[][] }[] = [];
vi.mock('uplot', () => {
  class FakePlot {
    static paths = { bars: () => () => null };
    constructor(opts: (typeof plots)[number]['opts'], data: unknown[][]) {
      plots.push({ opts, data });
    }
    destroy() {}
  }
  return { default: FakePlot };
});
vi.mock('uplot/dist/uPlot.min.css', () => ({}));

const row = (model: string, ndcg: number | null, recall: number | null) => ({
  model, k: 10, ndcg, recall, precision: 0.1, map: 0.05, hitRate: 0.3, coverage: 0.4, novelty: 9, customers: 120,
});

const evaluation = {
  k: 10,
  evaluatedAt: Date.UTC(2026, 11, 1),
  stale: false,
  split: { validationFrom: 1, testFrom: 2, train: 1000, validation: 100, test: 250 },
  weights: {},
  rows: [row('hybrid', 0.31, 0.42), row('ials', 0.28, 0.4), row('popularity', 0.12, null)],
  notes: [],
};

afterEach(() => {
  cleanup();
  plots.length = 0;
});

describe('models screen', () => {
  it('shows the evaluation as a table and hands the same numbers to the chart', async () => {
    const client = createClient(async (method): Promise<ApiResult<unknown>> => {
      if (method === 'models.list') return { ok: true, value: { models: [] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation } };
      return { ok: false, error: { code: 'input', message: method } };
    });
    const store = createAppStore(client);
    render(
      <StoreContext.Provider value={store}>
        <Models />
      </StoreContext.Provider>,
    );
    const region = await screen.findByRole('region', { name: 'Evaluation: models against baselines' });
    const cells = await within(region).findAllByRole('rowheader');
    expect(cells.map((c) => c.textContent)).toEqual(['hybrid', 'ials', 'popularity']);
    expect(within(region).getAllByRole('row')[3]?.textContent).toContain('—');
    const last = plots.at(-1);
    expect(last?.data).toEqual([[0, 1, 2], [0.31, 0.28, 0.12], [0.42, 0.4, null]]);
    expect(last?.opts.series.slice(1).map((s) => s.label)).toEqual(['NDCG@10', 'Recall@10']);
  });
});
