import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CancelledError } from '../../src-main/core/errors.ts';
import { buildDemoWorkspace, ensureDemoWorkspace } from '../../src-main/services/demo.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-demo-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const size = { items: 200, customers: 600, signals: 8_000 };

describe('the demo workspace', () => {
  it('is generated, imported and trained into one file, and only then appears', async () => {
    const file = path.join(dir, 'demo.sqlite');
    const steps: string[] = [];
    const report = await buildDemoWorkspace(file, { size, onStep: (s) => steps.push(s) });
    expect(steps).toEqual(['generating the demo shop', 'importing items', 'importing customers', 'importing signals', 'training models', 'finishing']);
    expect(report.imports.map((r) => r.added)).toEqual([200, 600, expect.any(Number)]);
    expect(report.training?.models).toEqual(expect.arrayContaining(['content', 'itemknn', 'ials', 'popularity']));
    expect(fs.existsSync(`${file}.building`)).toBe(false);
    const db = openWorkspace(file);
    expect(db.prepare('SELECT count(*) FROM item').pluck().get()).toBe(200);
    expect(db.prepare('SELECT count(*) FROM model WHERE current = 1').pluck().get()).toBeGreaterThanOrEqual(4);
    // Trained as `train` trains by default: tuned first, the search stored with the model.
    const ials = db.prepare("SELECT evaluation FROM model WHERE current = 1 AND kind = 'ials'").pluck().get() as string;
    expect(JSON.parse(ials).tuning.grid.trials.length).toBeGreaterThan(1);
    db.close();
  });

  it('is left alone when it exists already', async () => {
    const file = path.join(dir, 'demo.sqlite');
    const before = fs.statSync(file).mtimeMs;
    expect(await ensureDemoWorkspace(file, { size })).toBeNull();
    expect(fs.statSync(file).mtimeMs).toBe(before);
  });

  it('leaves the old file untouched when the build is cancelled', async () => {
    const file = path.join(dir, 'demo.sqlite');
    const bytes = fs.readFileSync(file);
    const controller = new AbortController();
    const build = buildDemoWorkspace(file, {
      size,
      signal: controller.signal,
      onStep: (s) => s === 'importing signals' && controller.abort(),
    });
    await expect(build).rejects.toBeInstanceOf(CancelledError);
    expect(fs.readFileSync(file).equals(bytes)).toBe(true);
    expect(fs.existsSync(`${file}.building`)).toBe(false);
  });
});
