import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { seededRng } from '../../src-main/core/rng.ts';
import type { Dataset } from '../../src-main/core/types.ts';
import { evaluationSplit } from '../../src-main/services/evaluate-split.ts';
import { importFile } from '../../src-main/services/import.ts';
import { loadDataset } from '../../src-main/store/dataset.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

/**
 * Where `evaluate` cuts its windows when only some signals have a time, on real purchases: the UCI "Online Retail"
 * slice (Chen 2015, doi:10.24432/C5BW33, CC BY 4.0; test/fixtures/online-retail/README.md) with a seeded share of
 * its times removed here.
 */
const FIXTURE = path.resolve(import.meta.dirname, '../fixtures/online-retail');
let dir: string;
let full: Dataset;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-eval-split-'));
  const db = openWorkspace(path.join(dir, 'w.sqlite'));
  await importFile(db, { target: 'items', file: path.join(FIXTURE, 'items.csv') });
  await importFile(db, { target: 'signals', file: path.join(FIXTURE, 'train.csv'), unknown: 'create' });
  full = loadDataset(db);
  db.close();
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** The dataset with the times of a seeded `share` of its signals removed. */
function withoutTimes(share: number): Dataset {
  const rng = seededRng(99);
  const at = Float64Array.from(full.signals.at, (t) => (rng.next() < share ? NaN : t));
  return { ...full, signals: { ...full.signals, at } };
}
const all = (s: { train: Int32Array; validation: Int32Array; test: Int32Array }) => [...s.train, ...s.validation, ...s.test].sort((a, b) => a - b);

describe('evaluationSplit', () => {
  it('splits by time when every signal has one', () => {
    const s = evaluationSplit(full, 'auto', { seed: 1 });
    expect(s.method).toBe('time');
    expect(s.why).toMatch(/^by time: test from 2011-\d\d-\d\d, validation from 2011-\d\d-\d\d$/);
    for (const k of s.test) expect(full.signals.at[k]).toBeGreaterThanOrEqual(s.cuts!.testFrom);
  });

  it('still splits by time when most signals have one: the untimed stay in train, and it says so', () => {
    const ds = withoutTimes(0.3);
    const s = evaluationSplit(ds, 'auto', { seed: 1 });
    expect(s.method).toBe('time');
    const untimed = ds.signals.at.filter((t) => t !== t).length;
    expect(s.why).toContain(`(${untimed.toLocaleString('en')} signals without a time stay in train)`);
    const inTrain = new Set(s.train);
    ds.signals.at.forEach((t, k) => {
      if (t !== t) expect(inTrain.has(k)).toBe(true);
    });
  });

  it('holds out per customer when fewer than half have a time, saying how many do; time stays possible when asked', () => {
    const ds = withoutTimes(0.7);
    const timed = ds.signals.length - ds.signals.at.filter((t) => t !== t).length;
    const s = evaluationSplit(ds, 'auto', { seed: 1 });
    expect(s.method).toBe('random');
    expect(s.why).toContain(`only ${timed.toLocaleString('en')} of ${ds.signals.length.toLocaleString('en')} signals have a time`);
    expect(evaluationSplit(ds, 'time', { seed: 1 }).method).toBe('time');
  });

  it('deals every signal once, keeps each customer-item pair on one side, and repeats itself for a seed', () => {
    const ds = withoutTimes(1);
    const s = evaluationSplit(ds, 'auto', { seed: 3 });
    expect(all(s)).toEqual(Array.from({ length: ds.signals.length }, (_, k) => k));
    // A held-out pair must not leak into train through a second signal (common practice, no source).
    const side = new Map<string, string>();
    for (const [name, rows] of [['train', s.train], ['validation', s.validation], ['test', s.test]] as const) {
      for (const k of rows) {
        const key = `${ds.signals.customer[k]}:${ds.signals.item[k]}`;
        expect(side.get(key) ?? name).toBe(name);
        side.set(key, name);
      }
    }
    const again = evaluationSplit(ds, 'random', { seed: 3 });
    expect([again.train, again.validation, again.test]).toEqual([s.train, s.validation, s.test]);
    expect(again.why).toContain('(asked for)');
    expect(Array.from(evaluationSplit(ds, 'random', { seed: 4 }).test)).not.toEqual(Array.from(s.test));
  });

  it('refuses a split by time with fewer than 3 timed signals, on the field split', () => {
    const ds = withoutTimes(1);
    ds.signals.at[0] = 1;
    ds.signals.at[1] = 2;
    let caught: unknown;
    try {
      evaluationSplit(ds, 'time', { seed: 1 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(InputError);
    expect((caught as InputError).where.column).toBe('split');
    expect((caught as InputError).message).toContain(`a split by time needs at least 3 signals with a time, and only 2 of ${ds.signals.length.toLocaleString('en')} have one`);
  });
});
