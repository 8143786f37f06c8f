// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
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
  staleReason: null,
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
    // Models named in words, the method's name kept beside them.
    expect(cells.map((c) => c.textContent)).toEqual(['The blend the shelves use (validated hybrid)', 'Taste patterns across all customers (iALS matrix factorisation)', 'Most customers first (popularity baseline)']);
    // Each metric explained in one line, visible without a pointer.
    const help = within(region).getByLabelText('What each figure measures');
    expect(within(help).getAllByRole('term').map((t) => t.textContent)).toEqual(['NDCG@10', 'Recall@10', 'Precision@10', 'MAP', 'Coverage', 'Customers']);
    expect(within(region).queryByText(/^Out of date/)).toBeNull();
    expect(within(region).getAllByRole('row')[3]?.textContent).toContain('—');
    const last = plots.at(-1);
    // Grouped bars: each model's two bars stand either side of its label, 0.4 apart (0.8 of a group / 2 series).
    const [xs, ndcg, recall] = last?.data ?? [];
    expect((xs as number[]).map((x) => Math.round(x * 10) / 10)).toEqual([-0.2, 0.2, 0.8, 1.2, 1.8, 2.2]);
    expect(ndcg).toEqual([0.31, null, 0.28, null, 0.12, null]);
    expect(recall).toEqual([null, 0.42, null, 0.4, null, null]);
    expect(last?.opts.series.slice(1).map((s) => s.label)).toEqual(['NDCG@10', 'Recall@10']);
  });
});

describe('an evaluation kept after retraining', () => {
  it('stays on screen, marked out of date with the reason in words', async () => {
    const stale = { ...evaluation, stale: true, staleReason: 'the models were retrained since: these figures measure the models before; evaluate again' };
    const client = createClient(async (method): Promise<ApiResult<unknown>> => {
      if (method === 'models.list') return { ok: true, value: { models: [] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: stale } };
      return { ok: false, error: { code: 'input', message: method } };
    });
    render(
      <StoreContext.Provider value={createAppStore(client)}>
        <Models />
      </StoreContext.Provider>,
    );
    const region = await screen.findByRole('region', { name: 'Evaluation: models against baselines' });
    expect((await within(region).findByText(/^Out of date/)).textContent).toBe(
      'Out of date: the models were retrained since: these figures measure the models before; evaluate again.',
    );
    expect(within(region).getAllByRole('rowheader')).toHaveLength(3);
  });
});

describe('evaluate against a file', () => {
  it('sends the picked file and shows every model, the unknown counts and the chart', async () => {
    const sent: unknown[] = [];
    const holdout = {
      file: 'week.csv', k: 5, rows: 40, usableRows: 37, pairs: 30, customers: 12,
      unknownCustomers: { distinct: 2, rows: 2, examples: ['x1', 'x2'] },
      unknownItems: { distinct: 1, rows: 1, examples: ['zz'] },
      alreadyInWorkspace: 3, duplicateRows: 0, customersWithoutNewItems: 0, coldCustomers: 0,
      models: [{ ...row('ials', 0.25, 0.5), k: 5, stale: false }, { ...row('random', 0.01, null), k: 5, stale: null }],
      weightsFrom: 'defaults', mapping: { customer: 'customer', item: 'item' }, notes: [],
    };
    const client = createClient(async (method, payload): Promise<ApiResult<unknown>> => {
      if (method === 'models.list') return { ok: true, value: { models: [] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
      if (method === 'evaluate.holdout') {
        sent.push(payload);
        return { ok: true, value: holdout };
      }
      return { ok: false, error: { code: 'input', message: method } };
    });
    render(
      <StoreContext.Provider value={createAppStore(client)}>
        <Models />
      </StoreContext.Provider>,
    );
    const region = await screen.findByRole('region', { name: 'Evaluate against a file' });
    const file = new File(['customer,item\nc1,i1\n'], 'week.csv', { type: 'text/csv' });
    fireEvent.change(within(region).getByLabelText('Held-out file'), { target: { files: [file] } });
    fireEvent.change(within(region).getByLabelText('List length K'), { target: { value: '5' } });
    await waitFor(() => expect(within(region).getByRole('button', { name: 'Evaluate against this file' }).hasAttribute('disabled')).toBe(false));
    fireEvent.click(within(region).getByRole('button', { name: 'Evaluate against this file' }));
    const table = await within(region).findByRole('table', { name: 'Models scored on the file' });
    expect(sent).toEqual([{ source: { fileName: 'week.csv', content: 'customer,item\nc1,i1\n' }, k: 5 }]);
    expect(within(table).getAllByRole('rowheader').map((c) => c.textContent)).toEqual(['Taste patterns across all customers (iALS matrix factorisation)', 'Random order (baseline)']);
    expect(within(table).getAllByRole('row')[2]?.textContent).toContain('baseline or blend');
    expect(within(region).getByLabelText('Holdout summary').textContent).toContain('2 unknown customers (2 rows) · 1 unknown item (1 row)');
    expect(plots.at(-1)?.opts.series.slice(1).map((s) => s.label)).toEqual(['NDCG@5', 'Recall@5', 'HitRate@5']);
  });
});

describe('the Train button', () => {
  it('asks the api for its default training (no tuning said), shows the tuning search and cancels it', async () => {
    // The main side, scripted: training tunes first (stage 'tune', trial after trial) until cancelled.
    const sent: { method: string; payload: unknown }[] = [];
    let cancelled = false;
    let trial = 0;
    const running = () => ({
      id: 'j1', kind: 'train', state: 'running', startedAt: 1, finishedAt: null, error: null, summary: null,
      progress: { stage: 'tune', model: 'ials', iteration: Math.min(++trial, 12), iterations: 12, fraction: 0.2 },
    });
    const client = createClient(async (method, payload): Promise<ApiResult<unknown>> => {
      sent.push({ method, payload });
      if (method === 'models.list') return { ok: true, value: { models: [] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
      if (method === 'train.start') return { ok: true, value: running() };
      if (method === 'job.cancel') {
        cancelled = true;
        return { ok: true, value: { ...running(), state: 'cancelled', finishedAt: 2 } };
      }
      if (method === 'job.status') return { ok: true, value: cancelled ? { ...running(), state: 'cancelled', finishedAt: 2 } : running() };
      return { ok: false, error: { code: 'input', message: method } };
    });
    // Polls yield to the page between calls; the test waits on what the screen shows, never on time.
    const store = createAppStore(client, Date.now, () => new Promise((r) => setTimeout(r, 0)));
    render(
      <StoreContext.Provider value={store}>
        <Models />
      </StoreContext.Provider>,
    );
    const panel = await screen.findByRole('region', { name: 'Training' });
    expect(within(panel).getByRole('button', { name: 'Cancel' })).toHaveProperty('disabled', true);
    fireEvent.click(within(panel).getByRole('button', { name: 'Train models' }));
    // One request, and it says nothing about tuning: the api's default decides, as for `shelfwright train`.
    await waitFor(() => expect(sent.filter((c) => c.method === 'train.start')).toHaveLength(1));
    expect(sent.find((c) => c.method === 'train.start')!.payload).toEqual({});
    // The search shows as such, trial by trial.
    await within(panel).findByText(/^Tuning: searching ials's settings on held-out signals · trial \d+ of 12$/);
    expect(within(panel).getByRole('button', { name: 'Train models' })).toHaveProperty('disabled', true);
    fireEvent.click(within(panel).getByRole('button', { name: 'Cancel' }));
    await within(panel).findByText('Cancelled: nothing was written; the previous models are still in use.');
    expect(sent.some((c) => c.method === 'job.cancel')).toBe(true);
    expect(within(panel).getByRole('button', { name: 'Train models' })).toHaveProperty('disabled', false);
  });
});

describe('a long training and skipping the search', () => {
  it('keeps the notice beside the bar to the end, offers the quicker way this screen has, and sends tune false when skipped', async () => {
    // The notice as services/train/outlook.ts words it for a large log with tuning (its own unit test checks the figures).
    const notice =
      'a large workspace (16,000 items, 36,000 customers, 1,700,000 signals): this training needs roughly 14 CPU-min (about 7 min on two idle cores): ' +
      "EASE's dense inverse over 16,000 items 4 CPU-min; iALS 2 CPU-min; tuning first up to 8 CPU-min. Quicker: without tuning, without EASE, iALS with fewer factors";
    const sent: { method: string; payload: unknown }[] = [];
    let polls = 0;
    const job = (state: string) => ({
      id: 'j2', kind: 'train', state, startedAt: 1, finishedAt: state === 'running' ? null : 2, error: null,
      summary: state === 'done' ? 'tuned (time split; ials NDCG@10 0.100) and trained 5 models in 800.0 s' : null,
      progress: { stage: state === 'running' ? 'tune' : 'done', model: 'ials', fraction: state === 'running' ? 0.1 : 1 }, notice,
    });
    const client = createClient(async (method, payload): Promise<ApiResult<unknown>> => {
      sent.push({ method, payload });
      if (method === 'models.list') return { ok: true, value: { models: [] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
      if (method === 'train.start') return { ok: true, value: job('running') };
      if (method === 'job.status') return { ok: true, value: job(++polls < 3 ? 'running' : 'done') };
      return { ok: false, error: { code: 'input', message: method } };
    });
    const store = createAppStore(client, Date.now, () => new Promise((r) => setTimeout(r, 0)));
    render(
      <StoreContext.Provider value={store}>
        <Models />
      </StoreContext.Provider>,
    );
    const panel = await screen.findByRole('region', { name: 'Training' });
    // Nothing tuned yet: the default searches first, and the screen says so before the click.
    expect(within(panel).getByTestId('train-plan').textContent).toMatch(/^Nothing is tuned yet: will first search each model's settings/);
    fireEvent.click(within(panel).getByRole('button', { name: 'Train models' }));
    const box = await within(panel).findByRole('note', { name: 'How long this training takes' });
    expect(box.textContent).toContain('A large workspace (16,000 items, 36,000 customers, 1,700,000 signals): this training needs roughly 14 CPU-min');
    expect(box.textContent).toContain('tick “Skip tuning”');
    expect(box.textContent).toContain('shelfwright train --models … --factors N');
    // Still there once the job is done: read at leisure, not a passing message.
    await within(panel).findByText(/^tuned \(time split/);
    expect(within(panel).getByRole('note', { name: 'How long this training takes' })).toBe(box);

    fireEvent.click(within(panel).getByRole('checkbox', { name: /^Skip tuning/ }));
    expect(within(panel).getByTestId('train-plan').textContent).toMatch(/^Will train every model with its default settings, without searching/);
    fireEvent.click(within(panel).getByRole('button', { name: 'Train models' }));
    await waitFor(() => expect(sent.filter((c) => c.method === 'train.start')).toHaveLength(2));
    expect(sent.filter((c) => c.method === 'train.start').map((c) => c.payload)).toEqual([{}, { tune: false }]);
  });
});

describe("a model's tuning", () => {
  it('shows the settings chosen and the tuner notes beside them; a model left out of the search says not tuned', async () => {
    const base = { params: {}, trainedAt: Date.UTC(2026, 11, 1), trainMs: 1200, iterations: null, losses: [], notes: [], stale: false, sizeBytes: 10, evaluation: null, origin: null };
    const ials = {
      ...base, id: 1, kind: 'ials',
      tuning: {
        k: 10, tunedAt: Date.UTC(2026, 11, 1), fingerprint: 'f1',
        split: { method: 'time', train: 900, validation: 100, customers: 80 },
        grid: { model: 'ials', best: { factors: 64, regularization: 10 }, ndcg: 0.1234, trials: [], searched: true },
      },
      tuningNotes: ['iALS trials ran 3 of the 15 training sweeps each (a cheaper fit to rank settings)'],
    };
    const ease = { ...base, id: 2, kind: 'ease', tuning: null, tuningNotes: ['EASE not tuned: 9,000 items, above 5000 (each fit would take minutes); it trains with the default lambda'] };
    const itemknn = { ...base, id: 3, kind: 'itemknn', tuning: { ...ials.tuning, grid: { ...ials.tuning.grid, model: 'itemknn', best: { k: 50, fitHalfLifeDays: 22, profileHalfLifeDays: 'off' } } }, tuningNotes: [] };
    const client = createClient(async (method): Promise<ApiResult<unknown>> => {
      if (method === 'models.list') return { ok: true, value: { models: [ials, ease, itemknn] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
      return { ok: false, error: { code: 'input', message: method } };
    });
    render(
      <StoreContext.Provider value={createAppStore(client)}>
        <Models />
      </StoreContext.Provider>,
    );
    const region = await screen.findByRole('region', { name: 'Trained models' });
    const notes = await within(region).findByRole('list', { name: 'Tuning notes: iALS' });
    expect(notes.closest('td')?.textContent).toMatch(/^factors 64, regularization 10 · NDCG@10 0\.123 on held-out signals · tuned .+iALS trials ran 3 of the 15/);
    expect(within(region).getByRole('list', { name: 'Tuning notes: EASE' }).closest('td')?.textContent).toMatch(/^Not tuned ?EASE not tuned: 9,000 items/);
    // The half-lives in words, not as parameter names.
    expect(region.textContent).toMatch(/k 50; recency half-life 22 days when learning, off for the customer's own items · NDCG@10/);
    expect(region.textContent).not.toMatch(/HalfLifeDays/);
    // Every tuned model current with a fingerprint: the default training reuses the tuning, and says so.
    expect(screen.getByTestId('train-plan').textContent).toMatch(/^The data is unchanged since the last tuning/);
  });
});

describe("a model's notes", () => {
  it('open from its row; a model without notes says so with a dash', async () => {
    const info = (id: number, kind: string, notes: string[]) => ({
      id, kind, params: {}, trainedAt: Date.UTC(2026, 11, 1), trainMs: 1200, iterations: null, losses: [], notes,
      stale: false, sizeBytes: 10, evaluation: null, tuning: null, tuningNotes: [], origin: null,
    });
    const notes = ['EASE not tuned: 9,000 items, above 8,000', 'stored as the top 1,000 weights per item'];
    const client = createClient(async (method): Promise<ApiResult<unknown>> => {
      if (method === 'models.list') return { ok: true, value: { models: [info(1, 'ease', notes), info(2, 'popularity', [])] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: null } };
      return { ok: false, error: { code: 'input', message: method } };
    });
    render(
      <StoreContext.Provider value={createAppStore(client)}>
        <Models />
      </StoreContext.Provider>,
    );
    const region = await screen.findByRole('region', { name: 'Trained models' });
    const rows = await within(region).findAllByRole('row');
    const ease = rows.find((r) => r.textContent?.includes('(EASE)'))!;
    const summary = within(ease).getByText('2 notes');
    fireEvent.click(summary);
    expect(within(ease).getAllByRole('listitem').map((li) => li.textContent)).toEqual(notes);
    const popularity = rows.find((r) => r.textContent?.includes('popularity'))!;
    expect(popularity.lastElementChild?.textContent).toBe('–');
  });
});

describe('the evaluation split', () => {
  it('sends the split picked, and says which split measured the figures', async () => {
    const sent: unknown[] = [];
    const why = "per customer at random (none of the 3,891 signals has a time): 20% of each customer's items held out for test, then 20% of the rest for validation";
    const timeless = { ...evaluation, split: { method: 'random', why, validationFrom: null, testFrom: null, train: 2480, validation: 627, test: 784 } };
    const client = createClient(async (method, payload): Promise<ApiResult<unknown>> => {
      if (method === 'models.list') return { ok: true, value: { models: [] } };
      if (method === 'evaluate.latest') return { ok: true, value: { evaluation: timeless } };
      if (method === 'evaluate.start') {
        sent.push(payload);
        return { ok: false, error: { code: 'input', message: 'a split by time needs at least 3 signals with a time', where: { column: 'split' } } };
      }
      return { ok: false, error: { code: 'input', message: method } };
    });
    render(
      <StoreContext.Provider value={createAppStore(client)}>
        <Models />
      </StoreContext.Provider>,
    );
    const region = await screen.findByRole('region', { name: 'Evaluation: models against baselines' });
    expect((await within(region).findByTestId('split-words')).textContent).toBe(`Split: ${why}`);
    const picker = within(region).getByLabelText('Held out') as HTMLSelectElement;
    expect(Array.from(picker.options, (o) => o.value)).toEqual(['auto', 'time', 'random']);
    fireEvent.change(picker, { target: { value: 'time' } });
    fireEvent.click(within(region).getByRole('button', { name: 'Evaluate' }));
    expect((await within(region).findByRole('alert')).textContent).toContain('a split by time needs at least 3 signals with a time');
    expect(sent).toEqual([{ k: 10, split: 'time' }]);
  });
});
