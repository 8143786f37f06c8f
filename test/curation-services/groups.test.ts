import { afterEach, describe, expect, it } from 'vitest';
import { IalsModel } from '../../src-main/core/models/ials.ts';
import { IALS_DEFAULTS } from '../../src-main/core/models/ials-params.ts';
import { curationModelSource, describeTasteGroups, GROUP_COUNT } from '../../src-main/services/curation/model-source.ts';
import { CurationService } from '../../src-main/services/curation/service.ts';
import { dataFingerprint } from '../../src-main/store/models.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { openSeeded } from './fixture.ts';

let db: Db | undefined;
afterEach(() => db?.close());

/**
 * An iALS model with planted factors: customer u's factor is the unit vector of its camp (u % 3 of the
 * fixture, which shops mostly in category u % 3), item i's the unit vector of its category. So the
 * taste groups must follow the camps, and each camp's top category by lift must be its own.
 */
function plantedIals(customers: number, items: number): IalsModel {
  const k = 4;
  const x = new Float32Array(customers * k);
  for (let u = 0; u < customers; u++) x[u * k + ((u + 1) % 3)] = 1 + (u % 5) * 0.01;
  const y = new Float32Array(items * k);
  for (let i = 0; i < items; i++) y[i * k + (i % 4)] = 1;
  return new IalsModel({ ...IALS_DEFAULTS, factors: k }, x, y);
}

describe('taste-group audiences', () => {
  it('groups customers by their planted camp and names each group by its category', () => {
    ({ db } = openSeeded());
    const m = plantedIals(30, 40);
    db.prepare("INSERT INTO model (kind, fingerprint, trained_at, train_ms, bytes) VALUES ('ials', ?, 1, 1, ?)").run(dataFingerprint(db), Buffer.from(m.serialize()));
    const svc = new CurationService(db, curationModelSource);
    const world = svc.world();
    expect(world.groups).toBeDefined();
    // Dense customer index d is customer id d + 1, camp (d + 1) % 3; the factor planted at index d is camp's.
    const campOfGroup = new Map<number, number>();
    world.groups!.forEach((g, d) => {
      const camp = (d + 1) % 3;
      if (!campOfGroup.has(g)) campOfGroup.set(g, camp);
      expect(campOfGroup.get(g)).toBe(camp);
    });
    const described = describeTasteGroups(db, world.ds);
    expect(described).toHaveLength(GROUP_COUNT);
    const cats = ['teapots', 'lanterns', 'notebooks'];
    for (const d of described) {
      if (d.customers === 0) continue;
      expect(d.categories[0]!.value).toBe(cats[campOfGroup.get(d.group)!]);
      expect(d.categories[0]!.lift).toBeGreaterThan(1);
    }
    // A shelf for one group meters against that group's category mix.
    svc.newEdition('w', '2026-03-02');
    const g = world.groups![0]!;
    const v = svc.addShelf('w', 'For one group', { size: 4, audience: { kind: 'group', group: g } });
    expect(v.slots).toHaveLength(4);
    expect(v.brief.audience).toEqual({ kind: 'group', group: g });
  });

  it('says to train first when there is no iALS model', () => {
    ({ db } = openSeeded());
    const world = new CurationService(db, curationModelSource).world();
    expect(() => describeTasteGroups(db!, world.ds)).toThrow(/train the models first/);
  });
});
