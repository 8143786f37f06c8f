import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import type { ResponseOf } from '../../src-main/api/contract.ts';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { importFile } from '../../src-main/services/import.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { tempDir } from '../holdout/fixture.ts';

/** A small generated shop (timed signals, taste groups) opened the way a shell opens it. */
const dir = tempDir('api-models');
const ctx = new AppContext();
let table: ReturnType<typeof createHandlerTable>;
let first: { item: string; title: string; category: string };
beforeAll(async () => {
  const shop = await generateDemoShop({ seed: 9, items: 100, customers: 300, signals: 6000, outDir: dir });
  ctx.open(path.join(dir, 'w.sqlite'), { create: true });
  for (const target of ['items', 'customers', 'signals'] as const) await importFile(ctx.db, { target, file: shop.files[target] });
  table = createHandlerTable(ctx);
  first = ctx.db.prepare('SELECT external_id AS item, title, category FROM item ORDER BY id LIMIT 1').get() as typeof first;
}, 30_000);
afterAll(() => {
  ctx.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

async function ok<M extends Parameters<typeof invoke>[1]>(name: M, payload: unknown): Promise<never> {
  const r = await invoke(table, name, payload);
  if (!r.ok) throw new Error(`${name}: ${r.error.message}`);
  return r.value as never;
}

describe('models api', () => {
  it('train.start cancelled mid-way writes nothing; run to the end it stores every model with its report', async () => {
    // A plain training (`tune: false`); train.start's default tunes first (test/tune/train-default.test.ts).
    const long: ResponseOf<'train.start'> = await ok('train.start', { ials: { factors: 8, iterations: 300 }, threads: 2, tune: false });
    expect(long.kind).toBe('train');
    let s = long;
    while (s.progress.model !== 'ials' && s.state === 'running') {
      await new Promise((r) => setTimeout(r, 5));
      s = await ok('job.status', { id: long.id });
    }
    expect(s.progress.stage).toBe('fit');
    await ok('job.cancel', { id: long.id });
    expect((await ctx.jobs.settled(long.id)).state).toBe('cancelled');
    expect(new ModelRepo(ctx.db).list()).toHaveLength(0);

    const job: ResponseOf<'train.start'> = await ok('train.start', { ials: { factors: 8, iterations: 4 }, threads: 2, tune: false });
    expect((await ctx.jobs.settled(job.id)).state).toBe('done');
    const { models }: ResponseOf<'models.list'> = await ok('models.list', {});
    expect(models.map((m) => m.kind).sort()).toEqual(['content', 'ease', 'ials', 'itemknn', 'popularity']);
    const ials = models.find((m) => m.kind === 'ials')!;
    expect(ials.iterations).toBe(4);
    expect(ials.losses).toHaveLength(4);
    expect(ials.params).toMatchObject({ factors: 8 });
    expect(ials.stale).toBe(false);
    expect(ials.evaluation).toBeNull();
  }, 30_000);

  it('evaluate.start stores the table with the models; evaluate.latest and models.list return it', async () => {
    expect((await ok<'evaluate.latest'>('evaluate.latest', {}) as ResponseOf<'evaluate.latest'>).evaluation).toBeNull();
    const job: ResponseOf<'evaluate.start'> = await ok('evaluate.start', { k: 5 });
    const end = await ctx.jobs.settled(job.id);
    expect(end.error).toBeNull();
    const { evaluation }: ResponseOf<'evaluate.latest'> = await ok('evaluate.latest', {});
    expect(evaluation!.k).toBe(5);
    expect(evaluation!.stale).toBe(false);
    expect(evaluation!.rows.map((r) => r.model)).toEqual(expect.arrayContaining(['hybrid', 'popularity', 'random', 'itemknn']));
    const { models }: ResponseOf<'models.list'> = await ok('models.list', {});
    const knn = models.find((m) => m.kind === 'itemknn')!;
    expect(knn.evaluation!.model).toBe('itemknn');
    expect(knn.evaluation!.ndcg).toBe(evaluation!.rows.find((r) => r.model === 'itemknn')!.ndcg);
  }, 30_000);

  it('evaluate.latest keeps the last evaluation after a retrain, marked stale in words', async () => {
    const { evaluation: before }: ResponseOf<'evaluate.latest'> = await ok('evaluate.latest', {});
    const job: ResponseOf<'train.start'> = await ok('train.start', { ials: { factors: 8, iterations: 4 }, threads: 2 });
    expect((await ctx.jobs.settled(job.id)).state).toBe('done');
    const { evaluation: after }: ResponseOf<'evaluate.latest'> = await ok('evaluate.latest', {});
    expect(after!.rows).toEqual(before!.rows);
    expect(after!.evaluatedAt).toBe(before!.evaluatedAt);
    expect(after!.stale).toBe(true);
    expect(after!.staleReason).toMatch(/^the models were retrained since/);
    expect(before!.staleReason).toBeNull();
  }, 30_000);

  it('item.search finds by title or id, LIKE wildcards taken literally; item.similar explains neighbours', async () => {
    const { items }: ResponseOf<'item.search'> = await ok('item.search', { query: first.item, limit: 5 });
    expect(items[0]!.item).toBe(first.item); // exact id first
    const word = first.title.split(' ').at(-1)!.toLowerCase();
    const byTitle: ResponseOf<'item.search'> = await ok('item.search', { query: word, limit: 50 });
    expect(byTitle.items.length).toBeGreaterThan(0);
    expect(byTitle.items.every((i) => i.title.toLowerCase().includes(word) || i.item.toLowerCase().includes(word))).toBe(true);
    expect(((await ok('item.search', { query: '%' })) as ResponseOf<'item.search'>).items).toEqual([]);
    const sim: ResponseOf<'item.similar'> = await ok('item.similar', { item: first.item, n: 4 });
    expect(sim.neighbours).toHaveLength(4);
    for (const n of sim.neighbours) {
      expect(n.item).not.toBe(first.item);
      expect(n.content).not.toBeNull();
      expect(n.collaborative).not.toBeNull();
    }
    for (let q = 1; q < 4; q++) expect(sim.neighbours[q]!.score).toBeLessThanOrEqual(sim.neighbours[q - 1]!.score);
    const missing = await invoke(table, 'item.similar', { item: 'nope' });
    expect(missing).toMatchObject({ ok: false, error: { code: 'not_found' } });
  });

  it('propose returns an explained pool with sponsored flags and refuses an unknown anchor', async () => {
    const p: ResponseOf<'propose'> = await ok('propose', { anchors: [first.item], n: 6, date: '2026-03-10', categories: [first.category] });
    expect(p.items.length).toBeGreaterThan(0);
    for (const x of p.items) {
      expect(x.category).toBe(first.category);
      expect(x.sponsored).toBe(x.promoted);
      expect(x.percentile).toBeGreaterThanOrEqual(0);
      expect(Object.keys(x.contributions)).toEqual(expect.arrayContaining(['content', 'collaborative']));
    }
    const bad = await invoke(table, 'propose', { anchors: ['ghost'] });
    expect(bad).toMatchObject({ ok: false, error: { code: 'input', message: expect.stringMatching(/ghost/) } });
  });
});
