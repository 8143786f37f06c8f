import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { BlendSpec, ValidatedBlend } from '../../src-main/core/eval/validated-blend.ts';
import type { EaseModel } from '../../src-main/core/models/ease.ts';
import { anchorHistory } from '../../src-main/core/scoring/index.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { curationModelSource } from '../../src-main/services/curation/model-source.ts';
import { anchorRelevanceOf } from '../../src-main/services/curation/shelf-fill.ts';
import { loadWorld } from '../../src-main/services/curation/world.ts';
import { trainAndSave } from '../../src-main/services/train/train-job.ts';
import { BlendRepo } from '../../src-main/store/blends.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let opened: { db: Db; file: string } | undefined;
afterEach(() => {
  opened?.db.close();
  if (opened) fs.rmSync(path.dirname(opened.file), { recursive: true, force: true });
  opened = undefined;
});

/** The seeded workspace trained with content, item-kNN and EASE, then told its validated blend is `spec`. */
async function trainedWith(spec: BlendSpec): Promise<Db> {
  opened = openSeeded();
  const { db, file } = opened;
  await trainAndSave(db, file, { models: ['content', 'itemknn', 'ease'], threads: 1 });
  const stored = new BlendRepo(db).current()!;
  const blend: ValidatedBlend = { ...stored.blend, ...spec };
  new BlendRepo(db).save(blend, stored.fingerprint, stored.modelIds);
  return db;
}

const ONLY_COLLABORATIVE = { content: 0, collaborative: 1, audience: 0, popularity: 0, trend: 0, freshness: 0 };

describe('anchor shelves draw on the validated blend (issue 10 item 4)', () => {
  it('fill an "EASE only" anchor shelf in the order of EASE\'s scores for the anchors, not item-kNN\'s', async () => {
    const db = await trainedWith({ kind: 'single', model: 'ease', normalisation: 'zscore', weights: { ease: 1 }, coldContent: false });
    const service = new CurationService(db, curationModelSource, () => Date.parse('2026-03-01T12:00:00Z'));
    service.newEdition('w', '2026-03-02');
    const view = service.addShelf('w', 'Related', parseBriefRequest({ size: 8, anchors: [1, 6], weights: ONLY_COLLABORATIVE, lambda: 1 }));

    // EASE's own scores for a customer holding the two anchors (Steck 2019, S = X·B; B itself is checked against
    // ml-matrix in test/models/ease.test.ts): the shelf must be their top 8.
    const world = loadWorld(db, curationModelSource);
    const ease = world.blend!.scorer.parts[0]!.scorer as EaseModel;
    expect(ease.kind).toBe('ease');
    const a = [world.ctx.indexOfId.get(1)!, world.ctx.indexOfId.get(6)!];
    const h = anchorHistory(a, world.blend!.history.rows, world.ctx.n);
    const scores = new Float32Array(world.ctx.n);
    ease.scoreInto(world.blend!.history.rows, h, scores);
    const order = Array.from(scores.keys())
      .filter((i) => !a.includes(i))
      .sort((x, y) => scores[y]! - scores[x]! || x - y);
    expect(view.slots.map((s) => s.item)).toEqual(order.slice(0, 8).map((i) => world.ds.items[i]!.externalId));

    // The shelf's relevance is the blend's (remembered per anchor set), and differs from item-kNN's similarity rows.
    const rel = anchorRelevanceOf(world, Int32Array.from(a))!;
    expect(Array.from(rel).filter((_, i) => !a.includes(i))).toEqual(Array.from(scores).filter((_, i) => !a.includes(i)));
    expect(world.hybrid.models.collaborative!.kind).toBe('itemknn');
    // ...and the test tells the two apart: item-kNN's mean similarity to the anchors orders the top 8 otherwise.
    const knn = new Float32Array(world.ctx.n);
    for (const x of a) {
      const row = world.hybrid.similarityRow('collaborative', x);
      for (let i = 0; i < knn.length; i++) knn[i]! += row[i]!;
    }
    const knnOrder = Array.from(knn.keys()).filter((i) => !a.includes(i)).sort((x, y) => knn[y]! - knn[x]! || x - y);
    expect(knnOrder.slice(0, 8)).not.toEqual(order.slice(0, 8));
  }, 60_000);

  it('fall back to the collaborative model\'s similarity when no model is trained for a blend', () => {
    opened = openSeeded();
    const world = loadWorld(opened.db, curationModelSource);
    expect(world.blend).toBeNull();
    expect(anchorRelevanceOf(world, Int32Array.of(0, 1))).toBeNull();
    expect(anchorRelevanceOf(world, new Int32Array(0))).toBeNull();
  });
});
