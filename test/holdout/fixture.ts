import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll } from 'vitest';
import { buildInteractionMatrix } from '../../src-main/core/matrix/build.ts';
import { fitContent } from '../../src-main/core/models/content.ts';
import { fitItemKnn } from '../../src-main/core/models/itemknn.ts';
import { fitPopularity } from '../../src-main/core/models/popularity.ts';
import type { FitReport, ModelKind, Scorer } from '../../src-main/core/models/scorer.ts';
import { importFile } from '../../src-main/services/import.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { dataFingerprint, ModelRepo } from '../../src-main/store/models.ts';
import { openWorkspace, type Db } from '../../src-main/store/workspace.ts';

export function tempDir(prefix: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), `shelfwright-${prefix}-`));
}

/**
 * The hand-worked workspace of the holdout and recommend tests. Tags but no descriptions; signals without
 * times; item i5 nobody has touched; i6 and i10 are identical twins (same title, category and tags) that
 * nobody has touched, so they always tie.
 *
 *   u1: i1, i2      u2: i1, i3      u3: i1, i2, i4      u4: i4, i2
 *   popularity (column sums, one click each): i1 = 3, i2 = 3, i3 = 1, i4 = 2, i5 = i6 = i10 = 0
 */
export async function handWorkspace(dir: string): Promise<{ db: Db; file: string }> {
  const file = path.join(dir, 'hand.sqlite');
  fs.writeFileSync(
    path.join(dir, 'items.csv'),
    [
      'id,title,category,tags,supplier',
      'i1,Moss lantern,garden,lamp;outdoor,Fernwick',
      'i2,Moss bench,garden,outdoor;seat,Fernwick',
      'i3,Copper kettle,kitchen,kettle;copper,Brassleigh',
      'i4,Copper pan,kitchen,pan;copper,Brassleigh',
      'i5,Moss planter,garden,outdoor;lamp;seat,Fernwick',
      'i6,Paper notebook,stationery,paper,Quillory',
      'i10,Paper notebook,stationery,paper,Quillory',
    ].join('\n'),
  );
  fs.writeFileSync(path.join(dir, 'customers.csv'), 'id\nu1\nu2\nu3\nu4\n');
  const pairs = [['u1', 'i1'], ['u1', 'i2'], ['u2', 'i1'], ['u2', 'i3'], ['u3', 'i1'], ['u3', 'i2'], ['u3', 'i4'], ['u4', 'i4'], ['u4', 'i2']];
  fs.writeFileSync(path.join(dir, 'signals.csv'), ['customer,item,kind', ...pairs.map(([c, i]) => `${c},${i},click`)].join('\n'));
  const db = openWorkspace(file);
  for (const target of ['items', 'customers', 'signals'] as const) {
    const r = await importFile(db, { target, file: path.join(dir, `${target}.csv`) });
    if (!r.committed) throw new Error(`fixture import of ${target} failed: ${JSON.stringify(r.errors)}`);
  }
  return { db, file };
}

/** Fits the cheap models in this thread and stores them as a training run would (tests only). */
export function storeModels(db: Db, kinds: readonly ('content' | 'itemknn' | 'popularity')[]): void {
  const ds = loadDataset(db);
  const m = buildInteractionMatrix(ds);
  const fingerprint = dataFingerprint(db);
  const fits: Record<string, () => { model: Scorer; report: FitReport }> = {
    content: () => fitContent(ds.items),
    itemknn: () => fitItemKnn(m),
    popularity: () => fitPopularity(m),
  };
  new ModelRepo(db).saveAll(
    kinds.map((kind) => {
      const f = fits[kind]!();
      return {
        kind: kind as ModelKind,
        params: {},
        fingerprint,
        trainedAt: Date.now(),
        trainMs: f.report.elapsedMs,
        report: { notes: f.report.notes },
        bytes: f.model.serialize(),
      };
    }),
  );
}

/**
 * The hand-worked workspace for one test file: made in a temp folder (named `name`) before its tests, removed
 * after them. `file()` is the workspace's path once made.
 */
export function handWorkspaceForFile(name: string): { file: () => string } {
  let dir = '';
  let file = '';
  beforeAll(async () => {
    dir = tempDir(name);
    const made = await handWorkspace(dir);
    made.db.close();
    file = made.file;
  }, 30_000);
  afterAll(() => {
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });
  return { file: () => file };
}
