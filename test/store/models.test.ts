import fs from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { dataFingerprint, ModelRepo, modelStatus, type ModelRecord } from '../../src-main/store/models.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { smallWorkspace } from './models-fixture.ts';

const record = (kind: ModelRecord['kind'], fingerprint: string, bytes = Uint8Array.of(1, 2, 3)): ModelRecord => ({
  kind,
  params: { factors: 4 },
  fingerprint,
  trainedAt: 1_700_000_000_000,
  trainMs: 12.5,
  report: { iterations: 2, losses: [3, 2], notes: ['a note'] },
  bytes,
});

let open: { db: Db; dir: string }[] = [];
afterEach(() => {
  for (const w of open) {
    w.db.close();
    fs.rmSync(w.dir, { recursive: true, force: true });
  }
  open = [];
});
const workspace = () => {
  const w = smallWorkspace({ items: 6, customers: 5 });
  open.push(w);
  return w;
};

describe('ModelRepo', () => {
  it('stores models, keeps one current per kind and a bounded history', () => {
    const { db } = workspace();
    const repo = new ModelRepo(db, 1);
    repo.saveAll([record('ials', 'f1', Uint8Array.of(1)), record('popularity', 'f1')]);
    repo.saveAll([record('ials', 'f2', Uint8Array.of(2))]);
    repo.saveAll([record('ials', 'f3', Uint8Array.of(3, 3))]);
    const current = repo.loadCurrent('ials')!;
    expect(Array.from(current.bytes)).toEqual([3, 3]);
    expect(current.fingerprint).toBe('f3');
    expect(current.report).toEqual({ iterations: 2, losses: [3, 2], notes: ['a note'] });
    expect(current.params).toEqual({ factors: 4 });
    const ials = repo.list().filter((m) => m.kind === 'ials');
    expect(ials.map((m) => [m.fingerprint, m.current])).toEqual([['f3', true], ['f2', false]]); // f1 pruned
    expect(ials[0]!.sizeBytes).toBe(2);
    expect(repo.loadCurrent('ease')).toBeUndefined();
  });

  it('writes nothing when one record of a run fails (one transaction)', () => {
    const { db } = workspace();
    const repo = new ModelRepo(db);
    repo.saveAll([record('ials', 'f1')]);
    const bad = { ...record('popularity', 'f2'), kind: 'nonsense' as 'ials' };
    expect(() => repo.saveAll([record('ials', 'f2'), bad])).toThrow(/CHECK constraint/);
    expect(repo.list().map((m) => [m.kind, m.fingerprint])).toEqual([['ials', 'f1']]);
    expect(repo.loadCurrent('ials')!.fingerprint).toBe('f1');
  });

  it('records an evaluation', () => {
    const { db } = workspace();
    const repo = new ModelRepo(db);
    const [id] = repo.saveAll([record('itemknn', 'f')]);
    repo.setEvaluation(id!, { 'NDCG@10': 0.25 });
    expect(repo.loadCurrent('itemknn')!.evaluation).toEqual({ 'NDCG@10': 0.25 });
  });
});

describe('dataFingerprint and modelStatus', () => {
  it('changes when a signal is added, a value or an item field changes, and not otherwise', () => {
    const { db } = workspace();
    const f0 = dataFingerprint(db);
    expect(dataFingerprint(db)).toBe(f0);
    db.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (1, 2, (SELECT code FROM signal_kind WHERE name = 'click'), 1, 5)").run();
    const f1 = dataFingerprint(db);
    expect(f1).not.toBe(f0);
    db.prepare('UPDATE signal SET value = 2 WHERE at = 5').run();
    const f2 = dataFingerprint(db);
    expect(f2).not.toBe(f1);
    db.prepare("UPDATE item SET tags = '[\"new\"]' WHERE id = 3").run();
    const f3 = dataFingerprint(db);
    expect(f3).not.toBe(f2);
    db.prepare('UPDATE item SET available = 0 WHERE id = 3').run();
    expect(dataFingerprint(db)).not.toBe(f3);
  });

  it('marks a model stale once the workspace changes', () => {
    const { db } = workspace();
    new ModelRepo(db).saveAll([record('ials', dataFingerprint(db)), record('content', dataFingerprint(db))]);
    expect(modelStatus(db).map((m) => [m.kind, m.stale])).toEqual([['content', false], ['ials', false]]);
    db.prepare("INSERT INTO signal (customer_id, item_id, kind, value, at) VALUES (2, 3, (SELECT code FROM signal_kind WHERE name = 'view'), 1, 7)").run();
    expect(modelStatus(db).map((m) => [m.kind, m.stale])).toEqual([['content', true], ['ials', true]]);
  });
});
