import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import type { ShelfView } from '../../src-main/api/contracts/curation.ts';
import { IalsModel, loadIals } from '../../src-main/core/models/ials.ts';
import type { Brief } from '../../src-main/core/curation/types.ts';
import { parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import { audienceAffinityInto } from '../../src-main/core/scoring/index.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { ownedMatrix } from '../../src-main/services/holdout/trained.ts';
import { curationModelSource } from '../../src-main/services/curation/model-source.ts';
import { audienceAffinityOf, validatedRelevance } from '../../src-main/services/curation/shelf-fill.ts';
import { loadWorld } from '../../src-main/services/curation/world.ts';
import { trainAndSave } from '../../src-main/services/train/train-job.ts';
import { ModelRepo } from '../../src-main/store/models.ts';
import { DAY, openSeeded } from './fixture.ts';

let app: AppContext | undefined;
afterEach(() => {
  const file = app?.isOpen ? app.file : undefined;
  app?.close();
  if (file) fs.rmSync(path.dirname(file), { recursive: true, force: true });
});

/** The api over the seeded workspace, as a shell composes it. */
function api(): { call: (name: string, payload: unknown) => Promise<unknown>; file: string } {
  const seeded = openSeeded();
  seeded.db.close();
  app = new AppContext();
  app.open(seeded.file, { create: false });
  const table = createHandlerTable(app);
  const call = async (name: string, payload: unknown) => {
    const r = await invoke(table, name, payload);
    if (!r.ok) throw new Error(`${name}: ${r.error.message}`);
    return r.value;
  };
  return { call, file: seeded.file };
}

const train = (seed: number) =>
  trainAndSave(app!.db, app!.file, { models: ['content', 'itemknn', 'ials'], params: { ials: { factors: 8, iterations: 4, seed } }, threads: 1 });

describe('the curation world follows training (issue 5)', () => {
  it('rebuilds a world made before training, so the api fills from the trained models and their taste groups', async () => {
    const { call } = api();
    await call('edition.new', { label: 'w', date: '2026-03-02' });
    await call('shelf.add', { edition: 'w', label: 'Front', brief: { size: 6 } });
    const before = loadWorld(app!.db, curationModelSource);
    expect(before.groups).toBeUndefined(); // no iALS yet: no taste groups
    await expect(call('shelf.add', { edition: 'w', label: 'Group', brief: { size: 4, audience: { kind: 'group', group: 0 } } })).rejects.toThrow(
      /taste groups/,
    );

    await train(2);
    const after = loadWorld(app!.db, curationModelSource);
    expect(after).not.toBe(before);
    const stored = loadIals(new ModelRepo(app!.db).loadCurrent('ials')!.bytes);
    expect(after.hybrid.models.affinity).toBeInstanceOf(IalsModel);
    expect(Array.from((after.hybrid.models.affinity as IalsModel).itemFactors)).toEqual(Array.from(stored.itemFactors));
    expect(after.groups).toBeDefined();

    // Anchored shelf: collaborative similarity to the anchors; every shelf: the audience's iALS affinity.
    const anchored = (await call('shelf.add', { edition: 'w', label: 'Related', brief: { size: 6, anchors: ['SKU-001', 'SKU-002'] } })) as ShelfView;
    expect(anchored.slots.every((s) => s.item !== null && (s.contributions['collaborative'] ?? 0) > 0)).toBe(true);
    // The api names anchors by the shop's ids both ways; the store keeps row ids.
    expect(anchored.brief.anchors).toEqual(['SKU-001', 'SKU-002']);
    await expect(call('shelf.add', { edition: 'w', label: 'Ghost', brief: { size: 4, anchors: ['SKU-999'] } })).rejects.toThrow(
      "anchor 'SKU-999': no item with this id in the workspace",
    );
    const group = (await call('shelf.add', { edition: 'w', label: 'Group', brief: { size: 4, audience: { kind: 'group', group: 0 } } })) as ShelfView;
    expect(group.slots.some((s) => (s.contributions['audience'] ?? 0) > 0)).toBe(true);
    const front = (await call('shelf.fill', { edition: 'w', shelf: 'Front' })) as ShelfView;
    expect(front.slots.some((s) => (s.contributions['audience'] ?? 0) > 0)).toBe(true);
    expect(front.slots.some((s) => (s.contributions['trend'] ?? 0) > 0)).toBe(true);
    // The price of the editor's choices (issue 10 item 4): a number in [0, 1] once models are trained;
    // boosting the least relevant item of the pool into the list, and pinning it first, can only raise it.
    const price = front.meter.choiceCost!;
    expect(price).toBeGreaterThanOrEqual(0);
    expect(price).toBeLessThanOrEqual(1);
    const world = loadWorld(app!.db, curationModelSource);
    const v = validatedRelevance(world, parseBrief({ size: 6 }), Date.parse('2026-03-02'))!;
    const worst = [...v.relevance.keys()].filter((i) => !Number.isNaN(v.relevance[i]!)).sort((a, b) => v.relevance[a]! - v.relevance[b]!)[0]!;
    const action = { kind: 'pin', slot: 1, item: world.ds.items[worst]!.externalId };
    const pinned = (await call('shelf.act', { edition: 'w', shelf: 'Front', action })) as ShelfView;
    expect(pinned.meter.choiceCost!).toBeGreaterThan(price);
  });

  it('rebuilds the world again after a retrain, with the new model', async () => {
    api();
    await train(2);
    const first = loadWorld(app!.db, curationModelSource);
    expect(loadWorld(app!.db, curationModelSource)).toBe(first); // nothing changed: the same world
    await train(7);
    const second = loadWorld(app!.db, curationModelSource);
    expect(second).not.toBe(first);
    const stored = loadIals(new ModelRepo(app!.db).loadCurrent('ials')!.bytes);
    expect(Array.from((second.hybrid.models.affinity as IalsModel).itemFactors)).toEqual(Array.from(stored.itemFactors));
    expect(second.hybrid.models.affinity).not.toBe(first.hybrid.models.affinity);
  });

  it('sees one item going out of stock as another comes back (the counts alone stay equal)', () => {
    api();
    const db = app!.db;
    db.prepare('UPDATE item SET available = 0 WHERE id = 1').run();
    const first = loadWorld(db, curationModelSource);
    expect(first.ctx.available[first.ctx.indexOfId.get(1)!]).toBe(0);
    db.prepare('UPDATE item SET available = 1 - available WHERE id IN (1, 2)').run();
    const second = loadWorld(db, curationModelSource);
    expect(second).not.toBe(first);
    expect(second.ctx.available[second.ctx.indexOfId.get(1)!]).toBe(1);
    expect(second.ctx.available[second.ctx.indexOfId.get(2)!]).toBe(0);
  });

  it("averages the audience's validated blend, its iALS scores exactly, and measures trend over the documented windows", async () => {
    api();
    await train(2);
    const world = loadWorld(app!.db, curationModelSource);
    const model = world.hybrid.models.affinity as IalsModel;
    const date = Date.parse('2026-03-02T00:00:00Z');
    const brief = { audience: { kind: 'everyone' } } as Brief;
    const affinity = audienceAffinityOf(world, brief, date)!;
    expect(audienceAffinityOf(world, brief, date)).toBe(affinity); // remembered per audience
    // The audience's relevance is the validated blend's mean over its customers (every one: the audience is
    // below the sample size), each customer's own items at that customer's lowest score; the slow way here.
    const blend = world.blend!;
    const owned = ownedMatrix(world.ds);
    const n = world.ctx.n;
    const sum = new Float64Array(n);
    const buf = new Float32Array(n);
    for (let u = 0; u < world.ds.customerIds.length; u++) {
      blend.scorer.scoreInto(u, blend.history, buf);
      const min = Math.min(...buf);
      for (let p = owned.indptr[u]!; p < owned.indptr[u + 1]!; p++) buf[owned.indices[p]!] = min;
      for (let i = 0; i < n; i++) sum[i]! += buf[i]!;
    }
    for (const i of [0, 7, 39]) expect(affinity[i]).toBeCloseTo(sum[i]! / world.ds.customerIds.length, 5);
    // Without a blend the iALS mean is exact. Hu, Koren & Volinsky (2008): the predicted preference is
    // p̂_ui = x_uᵀy_i; the audience's affinity is its mean over the audience, here summed customer by customer.
    const exact = new Float32Array(n);
    audienceAffinityInto(model, blend.history, Int32Array.from({ length: model.customerCount }, (_, u) => u), exact);
    const k = model.factors;
    for (const i of [0, 7, 39]) {
      let sum = 0;
      for (let u = 0; u < model.customerCount; u++) {
        let dot = 0;
        for (let f = 0; f < k; f++) dot += model.customerFactors[u * k + f]! * model.itemFactors[i * k + f]!;
        sum += dot;
      }
      expect(exact[i]).toBeCloseTo(sum / model.customerCount, 5);
    }
    // Trend (core/models/popularity.ts): (recent + 5) / (previous + 5) over 14-day windows ending just
    // after the latest signal; the counts here come from SQL, independently of the code under test.
    const last = (app!.db.prepare('SELECT max(at) AS t FROM signal').get() as { t: number }).t + 1;
    const count = app!.db.prepare<[number, number, number], { n: number }>('SELECT count(*) AS n FROM signal WHERE item_id = ? AND at >= ? AND at < ?');
    for (const id of [1, 2, 3, 12]) {
      const recent = count.get(id, last - 14 * DAY, last)!.n;
      const previous = count.get(id, last - 28 * DAY, last - 14 * DAY)!.n;
      const i = world.ctx.indexOfId.get(id)!;
      expect(world.hybrid.data.trend![i]).toBeCloseTo((recent + 5) / (previous + 5), 6);
    }
  });
});
