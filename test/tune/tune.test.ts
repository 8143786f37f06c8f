import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { confidence } from '../../src-main/core/models/ials-params.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { importFile } from '../../src-main/services/import.ts';
import { IALS_GRID, TUNE_BUDGET } from '../../src-main/services/tune/grid.ts';
import { confirmationHalves, validationSplit } from '../../src-main/services/tune/split.ts';
import { tuneDataset } from '../../src-main/services/tune/tune.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';
import { handWorkspace, tempDir } from '../holdout/fixture.ts';

let dir: string;
let shop: Db;

beforeAll(async () => {
  dir = tempDir('tune');
  const s = await generateDemoShop({ seed: 11, items: 100, customers: 300, signals: 6000, outDir: dir });
  shop = openWorkspace(path.join(dir, 'shop.sqlite'));
  for (const target of ['items', 'customers', 'signals'] as const) await importFile(shop, { target, file: s.files[target] });
}, 30_000);
afterAll(() => {
  shop?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('validationSplit', () => {
  it('splits timed signals by time: every validation signal is at or after every train signal', () => {
    const ds = loadDataset(shop);
    const s = validationSplit(ds, { share: 0.2 });
    expect(s.method).toBe('time');
    expect(s.train.length + s.validation.length).toBe(ds.signals.length);
    let lastTrain = -Infinity;
    for (const k of s.train) lastTrain = Math.max(lastTrain, ds.signals.at[k]!);
    for (const k of s.validation) expect(ds.signals.at[k]!).toBeGreaterThanOrEqual(s.from!);
    expect(lastTrain).toBeLessThan(s.from!);
    expect(s.validation.length / ds.signals.length).toBeGreaterThan(0.15);
  });

  it('cuts a time validation window into an earlier half that chooses and a later half that confirms', () => {
    const ds = loadDataset(shop);
    const s = validationSplit(ds, { share: 0.2 });
    const h = confirmationHalves(ds, s.validation, 'time', 1);
    expect(h.choose.length + h.confirm.length).toBe(s.validation.length);
    const latestChoose = Math.max(...Array.from(h.choose, (k) => ds.signals.at[k]!));
    for (const k of h.confirm) expect(ds.signals.at[k]!).toBeGreaterThanOrEqual(latestChoose);
    expect(Math.min(h.choose.length, h.confirm.length) / s.validation.length).toBeGreaterThan(0.4);
    // A random split's halves share no customer, and the same seed deals them alike.
    const r = confirmationHalves(ds, s.validation, 'random', 1);
    const who = (rows: Int32Array) => new Set(Array.from(rows, (k) => ds.signals.customer[k]));
    const later = who(r.confirm);
    for (const c of who(r.choose)) expect(later.has(c)).toBe(false);
    expect(confirmationHalves(ds, s.validation, 'random', 1)).toEqual(r);
  });

  it('without times holds out whole pairs per customer at random, seeded, never a customer\'s last item', async () => {
    const d = tempDir('tune-hand');
    const { db } = await handWorkspace(d);
    try {
      const ds = loadDataset(db);
      const a = validationSplit(ds, { seed: 4 });
      expect(a.method).toBe('random');
      expect(validationSplit(ds, { seed: 4 })).toEqual(a);
      const pair = (k: number) => `${ds.signals.customer[k]}:${ds.signals.item[k]}`;
      const trainPairs = new Set(Array.from(a.train, pair));
      for (const k of a.validation) expect(trainPairs.has(pair(k))).toBe(false);
      // Every customer of the fixture has 2 or 3 items: each keeps at least one in train and gives one.
      const perCustomer = (rows: Int32Array) => new Set(Array.from(rows, (k) => ds.signals.customer[k]));
      expect(perCustomer(a.train).size).toBe(4);
      expect(perCustomer(a.validation).size).toBe(4);
    } finally {
      db.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  });
});

describe('confidence scalings searched by the grid', () => {
  it('match Hu, Koren & Volinsky (2008): linear 1 + a*r (eq. 2) and log 1 + a*log(1 + r/e) (section 4)', () => {
    // r = 3, a = 2, e = 1: linear 1 + 6 = 7; log 1 + 2 ln 4 = 3.7725887 (natural log, as in the paper).
    expect(confidence({ alpha: 2, scaling: 'linear', epsilon: 1 }, 3)).toBe(7);
    expect(confidence({ alpha: 2, scaling: 'log', epsilon: 1 }, 3)).toBeCloseTo(3.7725887, 6);
    expect(new Set(IALS_GRID.scaling)).toEqual(new Set(['linear', 'log']));
  });
});

describe('tuneDataset', () => {
  it('searches each model from its defaults, fits no setting twice, keeps the best NDCG and stays within its budget', async () => {
    const seen: number[] = [];
    const r = await tuneDataset(loadDataset(shop), {
      k: 10,
      seed: 3,
      iterations: 4,
      threads: 2,
      sampleCustomers: 200,
      budget: 20, // wide, so that the assertions below hold however loaded the machine is
      onProgress: (p) => seen.push(p.fraction),
    });
    const grid = (m: string) => r.models.find((x) => x.model === m)!;
    // The first trial of each model is its defaults (the start of the coordinate search), except iALS, which
    // starts at regularisation 10 with log confidence (model-search.ts IALS_SEARCH_START). The shop's signals have
    // times, so item-kNN and EASE also start with both recency half-lives off.
    const off = { fitHalfLifeDays: 'off', profileHalfLifeDays: 'off' };
    expect(grid('itemknn').trials[0]!.params).toEqual({ k: 50, shrink: 10, values: 'presence', normalize: 'none', ...off });
    expect(grid('ease').trials[0]!.params).toEqual({ lambda: 500, values: 'presence', ...off });
    expect(grid('ials').trials[0]!.params).toEqual({ regularization: 10, alpha: 1, scaling: 'log', factors: 64 });
    // The hybrid is not tuned here: the validated blend is learned at training (blend.ts).
    expect(r.models.map((m) => m.model)).toEqual(['itemknn', 'ease', 'ials']);
    for (const m of r.models) {
      const keys = m.trials.map((t) => JSON.stringify(Object.entries(t.params).sort()));
      expect(new Set(keys).size).toBe(keys.length);
      // iALS chooses among its promoted trials (refitted with all 4 sweeps: successive halving, promote.ts),
      // recorded with their sweeps; every other model among all its trials.
      const chosenFrom = m.model === 'ials' ? m.trials.filter((t) => t.params['iterations'] === 4) : m.trials;
      expect(chosenFrom.length).toBeGreaterThan(0);
      const best = Math.max(...chosenFrom.map((t) => t.ndcg));
      // The chosen setting is a trial; EASE may take a larger λ within one standard error of the best
      // (model-search.ts oneStandardErrorUp), every other model the best.
      const shown = m.model === 'ials' ? { ...m.best, iterations: 4 } : m.best;
      expect(m.trials.find((t) => JSON.stringify(t.params) === JSON.stringify(shown))!.ndcg).toBe(m.ndcg);
      if (m.model !== 'ease') expect(m.ndcg).toBe(best);
      else expect(m.ndcg).toBeLessThanOrEqual(best);
    }
    // More than the defaults was tried, and the search says what it covered and why it stopped.
    expect(grid('itemknn').trials.length).toBeGreaterThan(1);
    expect(grid('ials').search!.axes['regularization']).toEqual([...IALS_GRID.regularization]);
    expect(['converged', 'budget']).toContain(grid('ials').search!.stopped);
    // Factors are searched last, upward from the default, each larger count with λ searched again: the trials'
    // factor counts never fall, and every count the search lists was fitted at two or more λ (or ended it).
    const ialsFactors = grid('ials')
      .trials.filter((t) => t.params['iterations'] === undefined)
      .map((t) => t.params['factors'] as number);
    for (let q = 1; q < ialsFactors.length; q++) expect(ialsFactors[q]!).toBeGreaterThanOrEqual(ialsFactors[q - 1]!);
    expect(grid('ials').search!.axes['factors']![0]).toBe(64);
    expect(grid('ials').search!.axes['factors']!.length).toBeGreaterThan(1); // budget 20 affords 128 factors here
    for (const f of grid('ials').search!.axes['factors']!) expect(ialsFactors).toContain(f);
    // The predicted spend of the searches never passes the budget (in plain fits of the searched models).
    expect(r.budget.plainFits).toBe(20);
    expect(r.budget.spentMs).toBeLessThanOrEqual(r.budget.plainFits * r.budget.plainMs + 1e-6);
    // Progress only moves forward and ends at 1.
    for (let q = 1; q < seen.length; q++) expect(seen[q]!).toBeGreaterThanOrEqual(seen[q - 1]!);
    expect(seen.at(-1)).toBe(1);
    expect(r.params.ials).toMatchObject(grid('ials').best);
    // As training parameters a half-life's 'off' is null.
    const asParams = (b: Record<string, number | string>) => Object.fromEntries(Object.entries(b).map(([key, v]) => [key, v === 'off' ? null : v]));
    expect(r.params.itemknn).toEqual(asParams(grid('itemknn').best));
    expect(r.params.ease).toMatchObject(asParams(grid('ease').best));
    expect(r.split.method).toBe('time');
  }, 60_000);

  it('runs the same trials whatever the clock says: a machine 1,000 times slower, or slow for one model only', async () => {
    const ds = loadDataset(shop);
    const opts = { k: 10, seed: 3, iterations: 4, threads: 1, sampleCustomers: 150, budget: 3 };
    // A clock that runs 1,000× fast, and one that jumps by a minute at every read after the first few (a
    // machine loaded mid-run): the budget is counted in predicted cost (trial-cost.ts), so neither may change a trial.
    const fast = performance.now.bind(performance);
    let reads = 0;
    let t = 0;
    const slow = () => fast() * 1000;
    const lurching = () => (++reads > 4 ? (t += 60_000) : t);
    const a = await tuneDataset(ds, opts);
    const b = await tuneDataset(ds, { ...opts, now: slow });
    const c = await tuneDataset(ds, { ...opts, now: lurching });
    const trials = (r: typeof a) => r.models.map((m) => ({ model: m.model, params: m.trials.map((x) => x.params), ndcg: m.trials.map((x) => x.ndcg), search: m.search }));
    expect(trials(b)).toEqual(trials(a));
    expect(trials(c)).toEqual(trials(a));
    expect(b.budget).toEqual(a.budget);
    expect(c.params).toEqual(a.params);
    // The clock still times the trials for the record.
    expect(c.models.some((m) => m.trials.some((x) => x.elapsedMs >= 60_000))).toBe(true);
  }, 90_000);

  it('at the smallest budget fits each model\'s defaults only, and a budget out of range is refused by name', async () => {
    const ds = loadDataset(shop);
    const opts = { k: 10, seed: 3, iterations: 4, threads: 1, sampleCustomers: 100 };
    const small = await tuneDataset(ds, { ...opts, budget: TUNE_BUDGET.min });
    const fits = (r: typeof small) => r.models.reduce((n, m) => n + m.trials.length, 0);
    // At 0.5 plain fits the starts alone use the budget up: one fit per model.
    expect(fits(small)).toBe(3);
    await expect(tuneDataset(ds, { ...opts, budget: 0.1 })).rejects.toThrow(/budget must be from 0.5 to 20 plain fits, got 0.1/);
    await expect(tuneDataset(ds, { ...opts, budget: 21 })).rejects.toThrow(/budget must be from 0.5 to 20/);
  }, 60_000);
});

describe('tuneDataset with fixed parameters', () => {
  it('does not search a model whose every grid parameter is fixed, and still fits it once', async () => {
    const d = tempDir('tune-fixed');
    const { db } = await handWorkspace(d);
    try {
      const fixed = { ials: { factors: 3, regularization: 0.1, alpha: 10, scaling: 'log' as const }, itemknn: { shrink: 0 } };
      const seen: { model: string; fraction: number }[] = [];
      const r = await tuneDataset(loadDataset(db), { k: 3, iterations: 2, threads: 1, fixed, onProgress: (p) => seen.push(p) });
      const grid = (m: string) => r.models.find((x) => x.model === m)!;
      expect(grid('ials')).toMatchObject({ trials: [], searched: false, best: fixed.ials, fixed: fixed.ials });
      expect(grid('ials').ndcg).toBeNaN();
      expect(r.params.ials).toMatchObject(fixed.ials);
      // item-kNN: shrink held at 0 in every trial; the search has no shrink axis.
      expect(grid('itemknn')).toMatchObject({ searched: true, fixed: { shrink: 0 } });
      for (const t of grid('itemknn').trials) expect(t.params['shrink']).toBe(0);
      expect(Object.keys(grid('itemknn').search!.axes)).toEqual(['normalize', 'k', 'values']);
      expect(grid('ease')).toMatchObject({ searched: true, fixed: {} });
      // The unsearched iALS was fitted once (its start point), and reported as such in the progress.
      expect(seen.filter((p) => p.model === 'ials' && p.fraction < 1)).toHaveLength(1);
      expect(seen.at(-1)).toMatchObject({ fraction: 1 });
      expect(r.models.map((m) => m.model)).not.toContain('hybrid');
    } finally {
      db.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  }, 30_000);
});

describe('tuneDataset with iALS alpha fixed', () => {
  it('searches both scalings at that alpha only (no alpha axis)', async () => {
    const d = tempDir('tune-alpha');
    const { db } = await handWorkspace(d);
    try {
      const r = await tuneDataset(loadDataset(db), { k: 3, iterations: 2, threads: 1, fixed: { ials: { alpha: 10 } } });
      const ials = r.models.find((x) => x.model === 'ials')!;
      expect(ials.search!.axes['scaling']).toEqual(['linear', 'log']);
      expect(ials.search!.axes['alpha']).toBeUndefined();
      for (const t of ials.trials) expect(t.params['alpha']).toBe(10);
      expect(ials.fixed).toEqual({ alpha: 10 });
      expect(r.params.ials!.alpha).toBe(10);
    } finally {
      db.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  }, 30_000);
});

describe('train.start with tune', () => {
  it('tunes a workspace with no times, tags but no descriptions and untouched items, and stores the grids with the models', async () => {
    const d = tempDir('tune-api');
    const { db, file } = await handWorkspace(d);
    db.close();
    const ctx = new AppContext();
    ctx.open(file, { create: false });
    try {
      const table = createHandlerTable(ctx);
      // A cancel while tuning stops the thread and writes nothing.
      const first = await invoke(table, 'train.start', { ials: { iterations: 3 }, threads: 1, tune: { k: 3 } });
      const id = (first as { value: { id: string } }).value.id;
      while (ctx.jobs.status(id).progress.stage !== 'tune' && ctx.jobs.status(id).state === 'running') await new Promise((r) => setTimeout(r, 2));
      await invoke(table, 'job.cancel', { id });
      expect((await ctx.jobs.settled(id)).state).toBe('cancelled');
      expect(new ModelRepo(ctx.db).list()).toHaveLength(0);
      const started = await invoke(table, 'train.start', { ials: { iterations: 3 }, threads: 1, tune: { k: 3 } });
      expect(started.ok).toBe(true);
      const job = await ctx.jobs.settled((started as { value: { id: string } }).value.id);
      expect(job.error).toBeNull();
      expect(job.state).toBe('done');
      expect(job.summary).toMatch(/random split/);
      const list = await invoke(table, 'models.list', {});
      if (!list.ok) throw new Error(list.error.message);
      const models = (list.value as { models: { kind: string; params: Record<string, unknown>; tuning: { grid: { best: Record<string, unknown> }; hybridContentWeight?: number } | null }[] }).models;
      const ials = models.find((m) => m.kind === 'ials')!;
      expect(ials.tuning).not.toBeNull();
      expect(ials.params).toMatchObject(ials.tuning!.grid.best);
      expect(models.find((m) => m.kind === 'itemknn')!.params).toMatchObject(models.find((m) => m.kind === 'itemknn')!.tuning!.grid.best);
      // Content has no grid: its share of the hybrid is the validated blend's (no dead content-weight record).
      expect(models.find((m) => m.kind === 'content')!.tuning).toBeNull();
    } finally {
      ctx.close();
      fs.rmSync(d, { recursive: true, force: true });
    }
  }, 30_000);
});
