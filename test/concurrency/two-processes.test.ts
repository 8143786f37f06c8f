/**
 * Two Shelfwright processes on one workspace (DESIGN.md: "Two processes on one workspace wait or refuse
 * clearly; they never lose a committed write"). Every pair runs as real processes; the interleaving is made
 * deterministic by a signal file that is a named pipe (an import holds its write transaction until the test
 * closes the pipe) or by write-holder.ts, and the tests wait on what the processes print, never on time.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHandlerTable } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { forgetCustomer } from '../../src-main/services/forget.ts';
import { main } from '../../src-main/shell/cli/main.ts';
import { modelStatus } from '../../src-main/store/models.ts';
import { startWebShell } from '../../src-main/shell/web/server.ts';
import { APP_BLOCKING_WAIT_MS, openWorkspace } from '../../src-main/store/workspace.ts';
import { capture } from '../cli/capture.ts';
import { importSmallShop } from '../cli/small-shop.ts';
import { cli, holder, signalPipe } from './processes.ts';

const HEADER = 'customer,item,kind,value,at';
/** New signals (times after the generated history), so the data's fingerprint changes when they land. */
const NEW_ROWS = Array.from({ length: 12 }, (_, k) => `C000002,I${String(k + 1).padStart(5, '0')},purchase,1,2026-12-01T10:${String(k).padStart(2, '0')}:00Z`);
const WAITING = 'waiting for another Shelfwright process';

let dir: string;
let base: string;
let n = 0;

/** A fresh copy of the small shop (with edition E1 and its shelf S1) for one test. */
function workspace(): string {
  const file = path.join(dir, `w${++n}.sqlite`);
  fs.copyFileSync(base, file);
  return file;
}

function count(file: string, sql: string): number {
  const db = openWorkspace(file, { readonly: true });
  try {
    return db.prepare(sql).pluck().get() as number;
  } finally {
    db.close();
  }
}

const signals = (file: string) => count(file, 'SELECT count(*) FROM signal');

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-conc-'));
  base = path.join(dir, 'base.sqlite');
  await importSmallShop(base, path.join(dir, 'shop'), 11);
  for (const argv of [['edition', 'new', 'E1', '--date', '2026-11-30'], ['shelf', 'add', 'E1', 'S1', '--size', '6']]) {
    const io = capture();
    expect(await main([...argv, '-w', base], io, {}), io.stderr.join('\n')).toBe(0);
  }
}, 120_000);

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('two processes on one workspace', () => {
  it('import × import: the second waits, says so once, and both imports are kept', async () => {
    const file = workspace();
    const before = signals(file);
    const pipe = signalPipe(dir, HEADER);
    const first = cli(['import', 'signals', pipe.file, '-w', file]);
    await pipe.opened;
    const second = cli(['import', 'items', path.join(dir, 'shop', 'items.csv'), '-w', file, '--json']);
    await second.waitFor('stderr', `${WAITING} (an import of signals, pid ${first.pid}`);
    await pipe.end(NEW_ROWS);
    expect(await first.exit, first.err()).toBe(0);
    expect(await second.exit, second.err()).toBe(0);
    expect(second.err().split(WAITING)).toHaveLength(2); // said once
    expect(JSON.parse(second.out())).toMatchObject({ committed: true, unchanged: 120 });
    expect(signals(file)).toBe(before + NEW_ROWS.length);
  }, 60_000);

  it('import × train: a train that finishes while an import holds the workspace waits, then saves marked stale and says so', async () => {
    const file = workspace();
    const pipe = signalPipe(dir, HEADER);
    const importing = cli(['import', 'signals', pipe.file, '-w', file]);
    await pipe.opened;
    // The train reads the data as committed before the import (WAL readers do not wait for a writer).
    const train = cli(['train', '--models', 'popularity', '-w', file]);
    await train.waitFor('stderr', `${WAITING} (an import of signals, pid ${importing.pid}`);
    await pipe.end(NEW_ROWS);
    expect(await importing.exit, importing.err()).toBe(0);
    expect(await train.exit, train.err()).toBe(0);
    expect(train.out()).toContain('saved, marked stale; train again');
    const db = openWorkspace(file, { readonly: true });
    try {
      expect(modelStatus(db).map((m) => [m.kind, m.stale])).toEqual([['popularity', true]]);
    } finally {
      db.close();
    }
    expect(signals(file)).toBeGreaterThan(0);
  }, 60_000);

  it('demo × import: demo refuses a workspace an import is writing to, and the import is kept', async () => {
    const file = workspace();
    const before = signals(file);
    const pipe = signalPipe(dir, HEADER);
    const importing = cli(['import', 'signals', pipe.file, '-w', file]);
    await pipe.opened;
    const demo = cli(['demo', '-w', file, '--no-train']);
    expect(await demo.exit).toBe(2);
    expect(demo.err()).toContain(`the workspace ${file} is open in another Shelfwright process (an import of signals, pid ${importing.pid}`);
    expect(demo.err()).toContain('Nothing was changed');
    await pipe.end(NEW_ROWS);
    expect(await importing.exit, importing.err()).toBe(0);
    expect(signals(file)).toBe(before + NEW_ROWS.length);
    expect(fs.existsSync(`${file}.building`)).toBe(false);
  }, 60_000);

  it('demo × an app left open on the workspace (idle, not writing): refused, the file untouched', async () => {
    const file = workspace();
    const ino = fs.statSync(file).ino;
    const app = holder(file, 'open');
    await app.waitFor('stdout', 'ready');
    const demo = cli(['demo', '-w', file, '--no-train', '--json']);
    expect(await demo.exit).toBe(2);
    const error = JSON.parse(demo.out()).error;
    expect(error.code).toBe('conflict');
    expect(error.message).toContain('is open in another Shelfwright process (the app, an import or a training run)');
    app.send('done');
    expect(await app.exit).toBe(0);
    expect(fs.statSync(file).ino).toBe(ino);
    expect(count(file, 'SELECT count(*) FROM edition')).toBe(1);
  }, 60_000);

  it('demo × demo: a second build of the same workspace is refused while the first is building it', async () => {
    const file = workspace();
    // The first build's half-made file, open in its process (write-holder.ts stands in for that build).
    fs.copyFileSync(file, `${file}.building`);
    const building = holder(`${file}.building`, 'open');
    await building.waitFor('stdout', 'ready');
    const second = cli(['demo', '-w', file, '--no-train']);
    expect(await second.exit).toBe(2);
    expect(second.err()).toContain(`the workspace ${file}.building is open in another Shelfwright process`);
    expect(fs.existsSync(`${file}.building`)).toBe(true); // the first build's file is left alone
    building.send('done');
    expect(await building.exit).toBe(0);
  }, 60_000);

  it('forget × train: a train that read the data before an erasure committed waits for it, then saves nothing and says why', async () => {
    const file = workspace();
    const erasing = holder(file, 'forget', 'C000003');
    await erasing.waitFor('stdout', 'ready');
    const train = cli(['train', '--models', 'popularity', '-w', file, '--json']);
    await train.waitFor('stderr', `${WAITING} (an erasure, pid ${erasing.pid}`);
    erasing.send('commit');
    await erasing.waitFor('stdout', 'released');
    expect(await train.exit, train.err()).not.toBe(0);
    // Erasure is final (issue 11 part 2): a model fitted on the erased person's data is never stored.
    expect(train.out() + train.err()).toContain('a customer was erased (forget) while training ran');
    expect(count(file, "SELECT count(*) FROM customer WHERE external_id = 'C000003'")).toBe(0);
    expect(count(file, 'SELECT count(*) FROM model WHERE current = 1')).toBe(0);
  }, 60_000);

  it('edition action × import: a pin made while an import writes waits for it; both are kept', async () => {
    const file = workspace();
    const before = signals(file);
    const pipe = signalPipe(dir, HEADER);
    const importing = cli(['import', 'signals', pipe.file, '-w', file]);
    await pipe.opened;
    const pin = cli(['shelf', 'pin', 'E1', 'S1', 'I00007', '--slot', '2', '-w', file]);
    await pin.waitFor('stderr', `${WAITING} (an import of signals, pid ${importing.pid}`);
    await pipe.end(NEW_ROWS);
    expect(await importing.exit, importing.err()).toBe(0);
    expect(await pin.exit, pin.err()).toBe(0);
    expect(signals(file)).toBe(before + NEW_ROWS.length);
    expect(count(file, 'SELECT count(*) FROM editorial_action')).toBe(1);
  }, 60_000);

  it('a write that waits past the busy timeout is refused clearly: who holds the workspace, nothing changed, what to do', async () => {
    const file = workspace();
    const pipe = signalPipe(dir, HEADER);
    const importing = cli(['import', 'signals', pipe.file, '-w', file]);
    await pipe.opened;
    const forget = cli(['forget', 'C000004', '-w', file, '--json'], { env: { SHELFWRIGHT_BUSY_TIMEOUT_MS: '300' } });
    expect(await forget.exit).toBe(2);
    const error = JSON.parse(forget.out()).error;
    expect(error.code).toBe('conflict');
    expect(error.message).toMatch(new RegExp(`^the workspace is busy: another Shelfwright process \\(an import of signals, pid ${importing.pid}, since [0-9:]{8}\\) has been writing to it for more than 0.3 s\\. Nothing was changed; try again when it has finished`));
    expect(forget.err()).toContain(WAITING);
    expect(forget.err()).not.toContain('database is locked');
    await pipe.end(NEW_ROWS);
    expect(await importing.exit, importing.err()).toBe(0);
    expect(count(file, "SELECT count(*) FROM customer WHERE external_id = 'C000004'")).toBe(1);
  }, 60_000);

  it('web shell × CLI import: the web shell keeps answering while its import and its training wait, and shows the wait in the job status', async () => {
    const file = workspace();
    const before = signals(file);
    const ctx = new AppContext({ blockingWaitMs: APP_BLOCKING_WAIT_MS });
    ctx.open(file, { create: false });
    const staticDir = path.join(dir, `page${n}`);
    fs.mkdirSync(staticDir);
    fs.writeFileSync(path.join(staticDir, 'index.html'), '<!doctype html><title>t</title>');
    const shell = await startWebShell({ table: createHandlerTable(ctx), staticDir });
    // The page's calls, over HTTP as the renderer makes them.
    const api = async <T>(method: string, payload: unknown): Promise<T> => {
      const r = await fetch(`${shell.origin}api/${method}`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-shelfwright-token': shell.token },
        body: JSON.stringify(payload),
      });
      const body = (await r.json()) as { ok: boolean; value?: T; error?: { message: string } };
      if (!body.ok) throw new Error(`${method}: ${body.error?.message}`);
      return body.value as T;
    };
    try {
      const pipe = signalPipe(dir, HEADER);
      const importing = cli(['import', 'signals', pipe.file, '-w', file]);
      await pipe.opened;
      const { id } = await api<{ id: string }>('train.start', { models: ['popularity'] });
      // The job's stage turns to the waiting line: polled as the page polls.
      for (;;) {
        const state = await api<{ state: string; progress: { stage: string } }>('job.status', { id });
        expect(state.state).toBe('running');
        if (state.progress.stage.startsWith(`${WAITING} (an import of signals, pid ${importing.pid}`)) break;
        await new Promise((r) => setTimeout(r, 20)); // a poll interval, as the page polls; the loop ends on state
      }
      // The page's own import queues behind its training run's save, which waits for the command line's import.
      const pageImport = api<{ committed: boolean }>('import.run', { target: 'signals', fileName: 'more.csv', content: `${HEADER}\nC000005,I00009,view,1,2026-12-02T09:00:00Z\n` });
      expect(await api<{ open: boolean }>('workspace.info', {})).toMatchObject({ open: true });
      await pipe.end(NEW_ROWS);
      expect(await importing.exit, importing.err()).toBe(0);
      expect((await pageImport).committed).toBe(true);
      const done = await ctx.jobs.settled(id);
      expect(done.state).toBe('done');
      expect(done.summary).toContain('marked stale');
      expect(signals(file)).toBe(before + NEW_ROWS.length + 1);
    } finally {
      await shell.close();
      ctx.close();
    }
  }, 60_000);

  it('app × CLI import: a synchronous write in the app waits only as long as the app allows, then is refused naming the import', async () => {
    const file = workspace();
    const pipe = signalPipe(dir, HEADER);
    const importing = cli(['import', 'signals', pipe.file, '-w', file]);
    await pipe.opened;
    const db = openWorkspace(file, { blockingWaitMs: 200 });
    try {
      expect(() => forgetCustomer(db, 'C000006')).toThrow(
        new RegExp(`^the workspace is busy: another Shelfwright process \\(an import of signals, pid ${importing.pid}, since [0-9:]{8}\\) has been writing to it for more than 0\\.2 s\\. Nothing was changed`),
      );
      await pipe.end(NEW_ROWS);
      expect(await importing.exit, importing.err()).toBe(0);
      expect(forgetCustomer(db, 'C000006').customer).toBe('C000006');
    } finally {
      db.close();
    }
  }, 60_000);
});
