import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createHandlerTable } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { openAppWindow } from '../../src-main/shell/launch/app-window.ts';
import { startWebShell, type WebShell } from '../../src-main/shell/web/server.ts';

let dir: string;
let ctx: AppContext;
let shell: WebShell;
beforeEach(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-window-'));
  const root = path.join(dir, 'renderer');
  fs.mkdirSync(root);
  fs.writeFileSync(path.join(root, 'index.html'), '<!doctype html><html><head><title>t</title></head><body>page</body></html>');
  ctx = new AppContext();
  ctx.open(path.join(dir, 'w.sqlite'), { create: true });
  shell = await startWebShell({ table: createHandlerTable(ctx), staticDir: root });
});
afterEach(async () => {
  await shell.close();
  ctx.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

/** A stand-in browser: a shell script run in place of Chromium. */
function standIn(body: string): string {
  const file = path.join(dir, 'browser');
  fs.writeFileSync(file, `#!/bin/sh\n${body}\n`, { mode: 0o755 });
  return file;
}

/** Opens the window and resolves when the browser process is gone, with what was said and whether the session ended. */
function run(browser: string, opts: { atOnceMs?: number } = {}): Promise<{ said: string[]; closed: boolean }> {
  return new Promise((resolve) => {
    const said: string[] = [];
    let closed = false;
    openAppWindow({
      browser,
      args: ['--app=file:///nowhere'],
      say: (l) => said.push(l),
      onClosed: () => (closed = true),
      // onGone comes before the verdict; the verdict is given in the same turn, so read it on the next one.
      onGone: () => setImmediate(() => resolve({ said, closed })),
      ...opts,
    });
  });
}

describe('opening the app window', () => {
  it('keeps serving and says no window could be opened when the browser exits at once (no display)', async () => {
    // The kind of line Chromium writes and exits on when there is no display (its X11 platform code).
    const r = await run(standIn('echo "[1:1:ERROR:ozone_platform_x11.cc(240)] Missing X server or \\$DISPLAY" >&2\nexit 1'));
    expect(r.closed).toBe(false);
    expect(r.said).toHaveLength(1);
    expect(r.said[0]).toMatch(/^No window could be opened \(.*browser exited at once with code 1: Missing X server or \$DISPLAY\)\. Shelfwright keeps running: open the address above in a browser; Ctrl\+C stops it\.$/);
    const page = await fetch(shell.origin);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('page');
  });

  it('keeps serving when the browser cannot be started at all', async () => {
    const r = await run(path.join(dir, 'no-such-browser'));
    expect(r.closed).toBe(false);
    expect(r.said[0]).toMatch(/^No window could be opened \(.*no-such-browser could not start: spawn .*ENOENT\)/);
    expect((await fetch(shell.origin)).status).toBe(200);
  });

  it('treats even a clean exit at once as no window (nothing the editor could have closed)', async () => {
    const r = await run(standIn('exit 0'));
    expect(r.closed).toBe(false);
    expect(r.said[0]).toMatch(/exited at once with code 0\)/);
  });

  it('ends the session when a window that was open closes cleanly', async () => {
    // atOnceMs 0: any run counts as a window that was shown, without waiting on the clock.
    const r = await run(standIn('exit 0'), { atOnceMs: 0 });
    expect(r.closed).toBe(true);
    expect(r.said).toEqual([]);
  });
});
