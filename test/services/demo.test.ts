import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CancelledError } from '../../src-main/core/errors.ts';
import Database from 'better-sqlite3';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
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
    // The generator's pictures: nearly every item has a thumbnail, made once per drawing (at most 72).
    expect(report.imports[0]!.pictures).toMatchObject({ missing: 0, broken: 0, remote: 0, unread: 0 });
    expect(report.imports[0]!.pictures!.ready).toBeGreaterThan(180);
    expect(db.prepare("SELECT count(*) FROM item_picture WHERE state = 'ready'").pluck().get()).toBe(report.imports[0]!.pictures!.ready);
    expect(db.prepare('SELECT count(*) FROM picture_thumb').pluck().get()).toBeLessThanOrEqual(72);
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

  it('replaces only a workspace or nothing: a text file, another program’s database and a folder are refused untouched', async () => {
    const text = path.join(dir, 'notes.txt');
    fs.writeFileSync(text, 'root-only line\n');
    const other = path.join(dir, 'other-app.db');
    const db = new Database(other);
    db.exec('CREATE TABLE settings (k TEXT, v TEXT); PRAGMA user_version = 7;');
    db.close();
    const otherBytes = fs.readFileSync(other);
    const folder = path.join(dir, 'a-folder');
    fs.mkdirSync(folder);
    await expect(buildDemoWorkspace(text, { size })).rejects.toThrow(/will not build the demo at .*notes\.txt: the file there is not a Shelfwright workspace \(not an SQLite database\); choose a new file name/);
    await expect(buildDemoWorkspace(other, { size })).rejects.toThrow(/another program’s database, not a Shelfwright workspace/);
    await expect(buildDemoWorkspace(folder, { size })).rejects.toThrow(/something other than a file is there/);
    expect(fs.readFileSync(text, 'utf8')).toBe('root-only line\n');
    expect(fs.readFileSync(other).equals(otherBytes)).toBe(true);
    // A stray `<file>.building` that is not ours is refused too (the build would remove it).
    fs.writeFileSync(path.join(dir, 'fresh.sqlite.building'), 'someone else’s');
    await expect(buildDemoWorkspace(path.join(dir, 'fresh.sqlite'), { size })).rejects.toThrow(/fresh\.sqlite\.building: the file there is not a Shelfwright workspace/);
    expect(fs.readFileSync(path.join(dir, 'fresh.sqlite.building'), 'utf8')).toBe('someone else’s');
  });

  it('through the api, says so at once as an input error instead of a job that fails later', async () => {
    const ctx = new AppContext();
    const text = path.join(dir, 'notes.txt');
    const r = await invoke(createHandlerTable(ctx), 'workspace.demo', { file: text, train: false });
    expect(r).toMatchObject({ ok: false, error: { code: 'input', where: { file: text } } });
    expect(fs.readFileSync(text, 'utf8')).toBe('root-only line\n');
  });
});
