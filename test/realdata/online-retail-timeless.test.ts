import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { workspaceCli } from '../cli/capture.ts';
import { writeTimelessCopy } from './timeless-copy.ts';

/**
 * An editor's whole journey on a log without times, on real data: the UCI "Online Retail" slice (Chen 2015, UCI
 * Machine Learning Repository, doi:10.24432/C5BW33, CC BY 4.0; test/fixtures/online-retail/README.md says how it was
 * cut). Its times are stripped here, at test time: the signals are summed into one (customer, product, quantity)
 * row per pair, as a shop's export of basket counts would hold them, and the items lose their date added. Then
 * import (headers detected, no --map), train, evaluate (the per-customer split, said), the time-dependent parts
 * (neutral and saying so) and the backtests (refused in words), all through the command line.
 */
let dir: string;
let ws: string;

const { run, json } = workspaceCli(() => ws);

let pairs = 0;
beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-timeless-'));
  ws = path.join(dir, 'timeless.sqlite');
  const copy = writeTimelessCopy(dir);
  pairs = copy.pairs;
  expect((await run('import', 'items', copy.items)).code).toBe(0);
  const imported = await json('import', 'signals', copy.counts, '--kind', 'other', '--create-customers');
  expect(imported.mapping).toEqual({ customer: 'customer_id', item: 'product', value: 'quantity' });
  expect(imported.added).toBe(pairs);
  // Fast settings: the slice is small, and CI has two cores.
  const trained = await run('train', '--no-tune', '--factors', '32', '--iterations', '10');
  expect(trained.code, trained.err).toBe(0);
}, 120_000);

afterAll(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('evaluate on a log without times', () => {
  it('says in stats that no signal has a time', async () => {
    expect((await run('stats')).out).toContain(`signals    ${pairs.toLocaleString('en')} none with a time`);
  });


  it('holds out per customer at random, says so, and the hybrid finds more than popularity', async () => {
    const e = await json('evaluate', '--k', '10');
    expect(e.split.method).toBe('random');
    expect(e.split.validationFrom).toBeNull();
    expect(e.split.why).toContain(`none of the ${pairs.toLocaleString('en')} signals has a time`);
    expect(e.split.train + e.split.validation + e.split.test).toBe(pairs);
    const ndcg = (m: string) => (e.rows as { model: string; ndcg: number }[]).find((r) => r.model === m)!.ndcg;
    // Outside truth: the shop's own customers' other purchases (UCI Online Retail, doi:10.24432/C5BW33), held out
    // per customer. Popularity is the floor a recommender must beat (common practice, no source); random the floor
    // below it.
    expect(ndcg('popularity')).toBeGreaterThan(ndcg('random'));
    expect(ndcg('hybrid')).toBeGreaterThanOrEqual(ndcg('popularity'));
    const plain = await run('evaluate', '--k', '10');
    expect(plain.out).toMatch(/^split: per customer at random \(none of the .* signals has a time\)/m);
  }, 60_000);

  it('gives the same figures for the same seed, run after run', async () => {
    const a = await json('evaluate', '--k', '5', '--split', 'random');
    const b = await json('evaluate', '--k', '5', '--split', 'random');
    const strip = (e: { rows: { elapsedMs?: number }[] }) => e.rows.map(({ elapsedMs: _, ...r }) => r);
    expect(strip(b)).toEqual(strip(a));
  }, 60_000);

  it('refuses a split by time as a usage error, naming what is missing, and stores nothing', async () => {
    const stamp = async () => ((await json('models')).models as { evaluation: { evaluatedAt: number } | null }[]).map((m) => m.evaluation?.evaluatedAt ?? null);
    const before = await stamp();
    const r = await run('evaluate', '--split', 'time');
    expect(r.code).toBe(1);
    expect(r.err).toContain(`--split time: a split by time needs at least 3 signals with a time, and none of the ${pairs.toLocaleString('en')} has one`);
    expect(await stamp()).toEqual(before);
    const bad = await run('evaluate', '--split', 'soon');
    expect(bad.code).toBe(1);
    expect(bad.err).toContain("--split must be auto, time, random, got 'soon'");
  });
});

describe('the time-dependent parts on a log without times', () => {
  it('proposes with trend and freshness left out, saying why, and no score is NaN', async () => {
    const r = await json('propose', '--n', '10');
    expect(r.notes).toEqual(expect.arrayContaining([
      'Trend is left out: no signal has a time, so no item can be seen rising.',
      'Freshness is left out: no item has a date added, so none can be told new.',
    ]));
    expect(r.items).toHaveLength(10);
    for (const x of r.items) {
      expect(Number.isFinite(x.score)).toBe(true);
      expect(x.contributions.trend ?? 0).toBe(0);
      expect(x.contributions.freshness ?? 0).toBe(0);
    }
  });

  it('fills a shelf with its dials for trend and freshness at 0, in words, and a meter without NaN', async () => {
    expect((await run('edition', 'new', 'week 1', '--date', '2026-12-07')).code).toBe(0);
    const r = await run('shelf', 'add', 'week 1', 'Front', '--size', '8', '--rest', '1');
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain('Trend is left out: no signal has a time');
    expect(r.out).not.toMatch(/NaN/);
    const v = await json('shelf', 'meter', 'week 1', 'Front');
    expect(v.brief.weights.trend).toBe(0);
    expect(v.brief.weights.freshness).toBe(0);
    expect(v.brief.autoDials.idle).toEqual(['trend', 'freshness']);
    expect(v.slots.filter((s: { item: string | null }) => s.item !== null)).toHaveLength(8);
    expect(Number.isFinite(v.meter.predictedRelevance)).toBe(true);
    expect(v.meter.age.medianDays).toBeNull(); // no dates added: no age, not NaN
  });

  it('plans with a neutral seasonal fit and says why', async () => {
    const r = await json('plan', 'Front', '--from', '2026-12-07', '--weeks', '2');
    expect(r.notes).toContain('seasonal fit is 1 for every item: no signal has a time, so no season can be read; the plan follows relevance alone');
    for (const w of r.weeks) expect(w.meter.seasonalFit).toBe(1);
  }, 60_000);

  it("writes many customers' lists at once as JSON Lines, each full and scored", async () => {
    const ids = [...new Set(fs.readFileSync(path.join(dir, 'basket-counts.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(',')[0]!))];
    const list = path.join(dir, 'customers.txt');
    fs.writeFileSync(list, `customer\n${ids.join('\n')}\n`);
    const out = path.join(dir, 'top.jsonl');
    const r = await json('recommend', '--customers', list, '--top', '5', '--out', out);
    expect([r.customers, r.rows, r.format]).toEqual([ids.length, ids.length * 5, 'jsonl']);
    const lines = fs.readFileSync(out, 'utf8').trim().split('\n').map((l) => JSON.parse(l) as { customer: string; rank: number; score: number });
    expect(lines).toHaveLength(ids.length * 5);
    for (const l of lines) expect(Number.isFinite(l.score)).toBe(true);
    expect(new Set(lines.map((l) => l.customer)).size).toBe(ids.length);
  });

  it('refuses a decay by age for the cluster export, writing nothing', async () => {
    const out = path.join(dir, 'cluster-export');
    const r = await run('export', 'signals', '--format', 'parquet', '--out', out, '--half-life', '30');
    expect(r.code).toBe(2);
    expect(r.err).toContain('no signal has a time, so there is no age to decay by');
    expect(fs.existsSync(out)).toBe(false);
  });

  it('refuses both backtests in words: there are no past weeks to replay', async () => {
    const shelf = await run('shelf', 'backtest', 'week 1', 'Front');
    expect(shelf.code).toBe(2);
    expect(shelf.err).toContain(`a backtest replays the latest weeks of signals, and none of the ${pairs.toLocaleString('en')} signals has a time`);
    const plan = await run('plan', 'backtest', 'Front');
    expect(plan.code).toBe(2);
    expect(plan.err).toContain('there are no past weeks to replay');
  });
});
