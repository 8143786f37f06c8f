import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { evaluateHoldout } from '../../src-main/services/holdout/evaluate.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { handWorkspace, storeModels, tempDir } from './fixture.ts';

/*
 * Worked by hand (workspace in fixture.ts; only the popularity model is stored, so its ranking is the
 * column sums i1 = 3, i2 = 3, i4 = 2, i3 = 1, i5 = i6 = i10 = 0). Holdout rows, K = 2:
 *
 *   u1,i3   u1,i5   u1,i3 (duplicate)   u2,i2   u2,i1 (u2 already has i1)   u9,i1 (unknown customer)   u3,i9 (unknown item)
 *
 * Rankings, each customer's own items removed:
 *   u1 has i1, i2 → i4 (2), i3 (1), ...      top 2 = [i4, i3]   truth {i3, i5}   hits [0, 1]
 *   u2 has i1, i3 → i2 (3), i4 (2), ...      top 2 = [i2, i4]   truth {i2}       hits [1, 0]
 * Metrics:
 *   Recall@2, denominator min(K, |truth|) (Liang et al. 2018): u1 1/2, u2 1/1 → mean 0.75
 *   NDCG@2, binary, log2(rank + 1) discount (Järvelin & Kekäläinen 2002):
 *     u1 (1/log2 3) / (1 + 1/log2 3) = 0.63093 / 1.63093 = 0.386853;  u2 1/1 = 1 → mean 0.6934264
 *   HitRate@2: 1, 1 → 1.   Precision@2 (Manning et al. 2008, ch. 8): 1/2, 1/2 → 0.5.
 *   AP@2 with denominator |truth| (Manning et al. 2008, ch. 8.4): u1 (1/2)/2 = 0.25, u2 1/1 = 1 → MAP 0.625
 *   Coverage@2 (Herlocker et al. 2004): {i4, i3, i2} of 7 items = 3/7
 *   Novelty (Zhou et al. 2010), p_i = customers with i / 4 customers: i2 3/4, i3 1/4, i4 2/4
 *     self-information log2(4/3) = 0.415037, 2, 1 → (1 + 2 + 0.415037 + 1) / 4 = 1.1037594
 */
let dir: string;
let db: Db;

beforeAll(async () => {
  dir = tempDir('holdout-hand');
  ({ db } = await handWorkspace(dir));
  storeModels(db, ['popularity']);
  fs.writeFileSync(path.join(dir, 'holdout.csv'), 'customer,item\nu1,i3\nu1,i5\nu1,i3\nu2,i2\nu2,i1\nu9,i1\nu3,i9\n');
});
afterAll(() => {
  db?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('evaluateHoldout on the hand-worked case', () => {
  it('computes every metric as worked out by hand', async () => {
    const r = await evaluateHoldout(db, { file: path.join(dir, 'holdout.csv') }, { k: 2 });
    const pop = r.models.find((m) => m.model === 'popularity')!;
    expect(pop.customers).toBe(2);
    expect(pop.recall).toBeCloseTo(0.75, 12);
    expect(pop.ndcg).toBeCloseTo((1 / Math.log2(3) / (1 + 1 / Math.log2(3)) + 1) / 2, 12);
    expect(pop.ndcg).toBeCloseTo(0.6934264, 6);
    expect(pop.hitRate).toBe(1);
    expect(pop.precision).toBe(0.5);
    expect(pop.map).toBeCloseTo(0.625, 12);
    expect(pop.coverage).toBeCloseTo(3 / 7, 12);
    expect(pop.novelty).toBeCloseTo(1.1037594, 6);
    expect(pop.stale).toBe(false);
  });

  it('answers each customer\'s NDCG@2 when asked: u1 0.386853 and u2 1, worked out above', async () => {
    const plain = await evaluateHoldout(db, { file: path.join(dir, 'holdout.csv') }, { k: 2 });
    expect(plain.perCustomer).toBeUndefined();
    const r = await evaluateHoldout(db, { file: path.join(dir, 'holdout.csv') }, { k: 2, perCustomer: true });
    expect(r.perCustomer!.customers).toEqual(['u1', 'u2']);
    const pop = r.perCustomer!.ndcg['popularity']!;
    expect(pop[0]).toBeCloseTo(1 / Math.log2(3) / (1 + 1 / Math.log2(3)), 12);
    expect(pop[1]).toBe(1);
    // Every row has its per-customer list, and the lists average to the row's mean.
    for (const m of r.models) expect((r.perCustomer!.ndcg[m.model] ?? []).reduce((a, b) => a + b, 0) / 2).toBeCloseTo(m.ndcg, 12);
  });

  it('counts unknown ids, duplicates and pairs the customer already has instead of dropping them silently', async () => {
    const r = await evaluateHoldout(db, { file: path.join(dir, 'holdout.csv') }, { k: 2 });
    expect(r.rows).toBe(7);
    expect(r.unknownCustomers).toEqual({ distinct: 1, rows: 1, examples: ['u9'] });
    expect(r.unknownItems).toEqual({ distinct: 1, rows: 1, examples: ['i9'] });
    expect(r.usableRows).toBe(5);
    expect(r.duplicateRows).toBe(1);
    expect(r.alreadyInWorkspace).toBe(1);
    expect(r.pairs).toBe(3);
    expect(r.customers).toBe(2);
    // Only popularity is trained and no blend is stored: the hybrid is popularity, and scores as it does.
    expect(r.models.map((m) => m.model).sort()).toEqual(['hybrid', 'popularity', 'random']);
    expect(r.models.find((m) => m.model === 'hybrid')!.ndcg).toBe(r.models.find((m) => m.model === 'popularity')!.ndcg);
    expect(r.notes.join(' ')).toMatch(/no validated blend is stored with these models: run train to learn one/);
    expect(r.weightsFrom).toBe('is popularity, not validated');
  });

  it('reads uploaded JSON Lines content with a column mapping, and names the file in errors', async () => {
    const content = '{"reader":"u1","sku":"i3"}\n{"reader":"u2","sku":"i2"}\n';
    const r = await evaluateHoldout(db, { fileName: 'week.jsonl', content }, { k: 2, mapping: { customer: 'reader', item: 'sku' } });
    expect(r.file).toBe('week.jsonl');
    expect(r.pairs).toBe(2);
    const bad = evaluateHoldout(db, { fileName: 'bad.csv', content: 'customer,item,value\nu1,i3,lots\n' }, { k: 2 });
    await expect(bad).rejects.toBeInstanceOf(InputError);
    await expect(bad).rejects.toMatchObject({ where: { file: 'bad.csv', line: 2, column: 3 } });
  });

  it('gives the same table on two runs (determinism, random baseline seeded)', async () => {
    const strip = (r: Awaited<ReturnType<typeof evaluateHoldout>>) => r.models.map(({ elapsedMs: _e, ...m }) => m);
    const a = await evaluateHoldout(db, { file: path.join(dir, 'holdout.csv') }, { k: 3 });
    const b = await evaluateHoldout(db, { file: path.join(dir, 'holdout.csv') }, { k: 3 });
    expect(strip(a)).toEqual(strip(b));
  });

  it('stages uploaded content inside its own folder whatever the name says (.., a path)', async () => {
    const content = 'customer,item\nu9,i1\nu1,i1\n';
    for (const fileName of ['../../outside.csv', 'C:\\Users\\me\\week.csv']) {
      // The same reading as for x.csv below: the file was staged and read, not written outside its folder.
      await expect(evaluateHoldout(db, { fileName, content }, { k: 2 })).rejects.toThrow(/unknown customer/);
    }
    // A bare '..' once named the temporary folder's parent (a write error); now it is only a name without a format.
    await expect(evaluateHoldout(db, { fileName: '..', content }, { k: 2 })).rejects.toThrow(/cannot tell the format/);
  });

  it('refuses a file with no usable pair, saying why', async () => {
    const only = evaluateHoldout(db, { fileName: 'x.csv', content: 'customer,item\nu9,i1\nu1,i1\n' }, { k: 2 });
    await expect(only).rejects.toThrow(/1 unknown customer, 0 unknown items, 1 pair already in the workspace/);
  });
});
