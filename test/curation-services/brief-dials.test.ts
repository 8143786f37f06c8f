import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { describeAutoDials } from '../../src-main/core/curation/choice-cost.ts';
import { DEFAULT_WEIGHTS, parseBrief } from '../../src-main/core/editing/brief-schema.ts';
import { DIAL_COST_LIMIT, EDITORIAL_DIALS, dialCost, fitDials } from '../../src-main/services/curation/brief-dials.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { curationModelSource } from '../../src-main/services/curation/model-source.ts';
import { loadWorld } from '../../src-main/services/curation/world.ts';
import { trainAndSave } from '../../src-main/services/train/train-job.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';
import { parseBriefRequest } from '../../src-main/core/editing/brief-schema.ts';

let opened: { db: Db; file: string } | undefined;
afterEach(() => {
  opened?.db.close();
  if (opened) fs.rmSync(path.dirname(opened.file), { recursive: true, force: true });
  opened = undefined;
});

const DATE = Date.parse('2026-03-02');
const NOW = () => Date.parse('2026-03-01T12:00:00Z');

async function trained(): Promise<CurationService> {
  opened = openSeeded();
  await trainAndSave(opened.db, opened.file, { models: ['content', 'itemknn', 'ials'], params: { ials: { factors: 8, iterations: 4, seed: 2 } }, threads: 1 });
  const service = new CurationService(opened.db, curationModelSource, NOW);
  service.newEdition('w', '2026-03-02');
  return service;
}

const KITES = { kind: 'rule', category: 'kites', signalKinds: ['purchase', 'view'], withinDays: 90 };

describe('dials set per brief (issue 10 item 4)', () => {
  it('a new brief without weights gets dials that cost at most 5%, found from the editorial dials down', async () => {
    const service = await trained();
    const view = service.addShelf('w', 'Kites', parseBriefRequest({ size: 4, audience: KITES }));
    const w = view.brief.weights;
    expect(view.brief.autoDials).toBeDefined();
    expect(view.brief.autoDials!.limit).toBe(DIAL_COST_LIMIT);
    expect(view.brief.autoDials!.cost!).toBeLessThanOrEqual(DIAL_COST_LIMIT);
    // The three dials keep the editorial proportions; the relevance weights are the schema's.
    expect(w.trend / w.popularity).toBeCloseTo(EDITORIAL_DIALS.trend / EDITORIAL_DIALS.popularity, 2);
    expect([w.content, w.collaborative, w.audience]).toEqual([DEFAULT_WEIGHTS.content, DEFAULT_WEIGHTS.collaborative, DEFAULT_WEIGHTS.audience]);
    // Measured again independently of the stored figure: the shelf's dials cost what the brief says.
    const world = loadWorld(opened!.db, curationModelSource);
    const stored = service.shelves.byLabel(service.editions.byLabel('w').id, 'Kites').brief;
    expect(dialCost(world, stored, DATE)).toBeCloseTo(view.brief.autoDials!.cost!, 4);
    expect(describeAutoDials(view.brief.autoDials, w)).toMatch(/^The dials \(popularity [\d.]+, trend [\d.]+, freshness [\d.]+\) were set for this brief so they cost at most 5% of predicted relevance\.$/);
  }, 60_000);

  it('shrinks the dials until they cost no more than the limit', async () => {
    await trained();
    const world = loadWorld(opened!.db, curationModelSource);
    // The 5% case itself is checked on the demo shop (test/integration/default-dials.test.ts); this small shop's
    // editorial dials cost less, so the limit is set below what they cost here. Which of these small briefs the
    // editorial dials cost anything on depends on the models' details, so the first that does is taken.
    const NOTEBOOKS = { kind: 'rule', category: 'notebooks', signalKinds: ['purchase', 'view'], withinDays: 90 };
    const costed = [
      { size: 4, anchors: [1], audience: NOTEBOOKS },
      { size: 4, audience: NOTEBOOKS },
      { size: 3, audience: KITES },
      { size: 6, audience: NOTEBOOKS },
      { size: 4, anchors: [2], audience: { kind: 'everyone' } },
    ]
      .map((b) => parseBrief(b))
      .map((brief) => ({ brief, fixed: dialCost(world, { ...brief, weights: { ...DEFAULT_WEIGHTS, ...EDITORIAL_DIALS } }, DATE) }))
      .find((c) => c.fixed > 0);
    expect(costed).toBeDefined();
    const { brief, fixed } = costed!;
    const set = fitDials(world, brief, DATE, fixed / 2);
    expect(set.autoDials!.cost!).toBeLessThanOrEqual(fixed / 2);
    expect(dialCost(world, set, DATE)).toBeLessThanOrEqual(fixed / 2);
    expect(set.weights.popularity).toBeLessThan(EDITORIAL_DIALS.popularity);
  }, 60_000);

  it("never overwrites the editor's dials, and sets its own again when the audience changes", async () => {
    const service = await trained();
    const mine = { ...DEFAULT_WEIGHTS, popularity: 0.9, trend: 0.4, freshness: 0.4 };
    const editor = service.addShelf('w', 'Mine', parseBriefRequest({ size: 4, audience: KITES, weights: mine }));
    expect(editor.brief.weights).toEqual(mine);
    expect(editor.brief.autoDials).toBeUndefined();
    expect(describeAutoDials(editor.brief.autoDials, editor.brief.weights)).toBeNull();
    // A new audience keeps them too, and so does a client that sends `autoDials` of its own.
    const moved = service.setBrief('w', 'Mine', { ...editor.brief, anchors: [], audience: { kind: 'everyone' }, autoDials: { limit: 0.05, cost: 0 } });
    expect(moved.brief.weights).toEqual(mine);
    expect(moved.brief.autoDials).toBeUndefined();

    const auto = service.addShelf('w', 'Auto', parseBriefRequest({ size: 4, audience: KITES }));
    const first = auto.brief.autoDials!;
    // The same brief sent back unchanged (as the brief form does) keeps the dials set for it.
    const same = service.setBrief('w', 'Auto', { ...auto.brief, anchors: [], lambda: 0.6 });
    expect(same.brief.weights).toEqual(auto.brief.weights);
    expect(same.brief.autoDials).toEqual(first);
    // A new audience sets them again, for it.
    const everyone = service.setBrief('w', 'Auto', { ...auto.brief, anchors: [], audience: { kind: 'everyone' } });
    const world = loadWorld(opened!.db, curationModelSource);
    const expected = fitDials(world, { ...service.shelves.byLabel(service.editions.byLabel('w').id, 'Auto').brief }, DATE);
    expect(everyone.brief.weights).toEqual(expected.weights);
    expect(everyone.brief.autoDials).toEqual(expected.autoDials);
    // The editor turning a dial makes all the dials theirs from then on.
    const turned = service.setBrief('w', 'Auto', { ...everyone.brief, anchors: [], weights: { ...everyone.brief.weights, popularity: 0.3 } });
    expect(turned.brief.weights.popularity).toBe(0.3);
    expect(turned.brief.autoDials).toBeUndefined();
    const again = service.setBrief('w', 'Auto', parseBriefRequest({ ...turned.brief, anchors: [], audience: KITES }));
    expect(again.brief.weights).toEqual(turned.brief.weights);
  }, 60_000);

  it('without any model keeps the safe defaults and says the dials could not be set yet', () => {
    opened = openSeeded();
    const service = new CurationService(opened.db); // no models at all: nothing can say what is relevant
    service.newEdition('w', '2026-03-02');
    const view = service.addShelf('w', 'Front', parseBriefRequest({ size: 4 }));
    expect(view.brief.weights).toEqual(DEFAULT_WEIGHTS);
    expect(view.brief.autoDials).toEqual({ limit: DIAL_COST_LIMIT, cost: null });
    expect(describeAutoDials(view.brief.autoDials, view.brief.weights)).toMatch(/could not be set for this brief yet/);
  });
});
