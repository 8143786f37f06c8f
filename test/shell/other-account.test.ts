import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { AppContext } from '../../src-main/services/context.ts';
import { writeLaunchPage } from '../../src-main/shell/launch/launch-page.ts';
import { startWebShell, type WebShell } from '../../src-main/shell/web/server.ts';

/**
 * Issue 11: another account on the same machine (here `nobody`, through util-linux setpriv) tries to get the
 * web shell's token and to read or write outside the workspace. It needs root to switch accounts, as in CI.
 */
const NOBODY = 65534;
const SCRIPT = path.join(path.dirname(fileURLToPath(import.meta.url)), 'fixtures', 'other-account.mjs');
const setpriv = ['/usr/bin/setpriv', '/bin/setpriv'].find((f) => fs.existsSync(f));
/** Every folder from / down to `dir` lets other accounts pass (o+x), so nobody can reach the script there. */
function othersCanReach(dir: string): boolean {
  for (let d = path.resolve(dir); ; d = path.dirname(d)) {
    if ((fs.statSync(d).mode & 0o001) === 0) return false;
    if (d === path.dirname(d)) return true;
  }
}
const skipReason =
  process.getuid?.() !== 0
    ? 'needs root to run a script as another account'
    : !setpriv
      ? 'needs util-linux setpriv'
      : !othersCanReach(os.tmpdir())
        ? `other accounts cannot enter ${os.tmpdir()}`
        : null;

interface Answer {
  status: number;
  headers: Record<string, string>;
  body: string;
}
interface Read {
  ok: boolean;
  code?: string;
  text?: string;
}
interface Findings {
  uid: number;
  pages: Record<string, Answer>;
  api: (Answer & { method: string; token: string | null })[];
  upload: Answer;
  reads: Record<string, Read>;
}

describe.skipIf(skipReason !== null)(`another account on this machine${skipReason ? ` (skipped: ${skipReason})` : ''}`, () => {
  let dir: string;
  let profile: string;
  let ctx: AppContext;
  let shell: WebShell;
  let workspace: string;
  let uploaded: string;
  let stdout: string;
  let found: Findings;
  let infoBefore: unknown;

  beforeAll(async () => {
    // A folder others may enter, like a home or project folder: what protects each file is its own mode.
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-other-'));
    fs.chmodSync(dir, 0o755);
    fs.writeFileSync(path.join(dir, 'secret.csv'), 'ROOT-ONLY-LINE\n', { mode: 0o600 });
    fs.copyFileSync(SCRIPT, path.join(dir, 'attack.mjs'));
    fs.chmodSync(path.join(dir, 'attack.mjs'), 0o644);
    const renderer = path.join(dir, 'renderer');
    fs.mkdirSync(renderer, { mode: 0o755 });
    fs.writeFileSync(path.join(renderer, 'index.html'), '<!doctype html><html><head><title>t</title></head><body></body></html>', { mode: 0o644 });
    workspace = path.join(dir, 'shop.sqlite');
    ctx = new AppContext();
    ctx.open(workspace, { create: true });
    shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: renderer });
    // The editor's own session: a file uploaded with the token, and the launch page npm start writes.
    const up = await fetch(`${shell.origin}upload`, {
      method: 'POST',
      headers: { 'x-shelfwright-token': shell.token, 'content-type': 'application/octet-stream', 'x-file-name': 'customers.csv' },
      body: 'id\nROOT-ONLY-CUSTOMER\n',
    });
    expect(up.status).toBe(200);
    uploaded = ctx.uploads.resolve(((await up.json()) as { value: { upload: string } }).value.upload).path;
    profile = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-profile-'));
    const launchPage = fileURLToPath(writeLaunchPage(profile, shell.pageUrl));
    infoBefore = await invoke(createHandlerTable(ctx), 'workspace.info', {});

    const plan = {
      port: shell.port,
      secret: path.join(dir, 'secret.csv'),
      target: path.join(dir, 'planted.txt'),
      files: {
        workspace,
        secret: path.join(dir, 'secret.csv'),
        upload: uploaded,
        launchPage,
        environ: `/proc/${process.pid}/environ`,
        mem: `/proc/${process.pid}/mem`,
        cmdline: `/proc/${process.pid}/cmdline`,
      },
    };
    // Asynchronous spawn: this process must keep serving the requests the script makes.
    const child = await new Promise<{ code: number | null; out: string; err: string }>((resolve, reject) => {
      const p = spawn(setpriv!, [`--reuid=${NOBODY}`, `--regid=${NOBODY}`, '--clear-groups', process.execPath, path.join(dir, 'attack.mjs'), JSON.stringify(plan)], {
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      let out = '';
      let err = '';
      p.stdout.on('data', (c: Buffer) => (out += c.toString()));
      p.stderr.on('data', (c: Buffer) => (err += c.toString()));
      p.on('error', reject);
      p.on('close', (code) => resolve({ code, out, err }));
    });
    expect(child.err).toBe('');
    expect(child.code).toBe(0);
    stdout = child.out;
    found = JSON.parse(stdout) as Findings;
  }, 60_000);

  afterAll(async () => {
    await shell?.close();
    ctx?.close();
    for (const d of [dir, profile]) if (d) fs.rmSync(d, { recursive: true, force: true });
  });

  it('really ran as nobody', () => {
    expect(found.uid).toBe(NOBODY);
  });

  it('finds the token nowhere: not in the page, its headers, any answer, or this process’s command line', () => {
    expect(found.pages['/']!.status).toBe(200);
    // stdout holds every answer, header and file the script could read, /proc/<pid>/cmdline included
    // (readable by every account unless /proc is mounted with hidepid).
    expect(stdout).not.toContain(shell.token);
  });

  it('cannot read what holds the token: the launch page, this process’s environment or memory', () => {
    for (const name of ['launchPage', 'environ', 'mem']) expect(found.reads[name], name).toMatchObject({ ok: false, code: 'EACCES' });
  });

  it('gets 401 from every api call and upload, without a token or with a guessed one, path fields included', () => {
    expect(found.api.length).toBe(30);
    for (const a of found.api) {
      expect(a.status, `${a.method} with ${String(a.token)}`).toBe(401);
      expect(JSON.parse(a.body)).toEqual({ ok: false, error: { code: 'input', message: 'missing or wrong launch token' } });
    }
    expect(found.upload.status).toBe(401);
  });

  it('read nothing and wrote nothing outside its own reach, and the workspace is as it was', async () => {
    expect(stdout).not.toContain('ROOT-ONLY-LINE');
    expect(stdout).not.toContain('ROOT-ONLY-CUSTOMER');
    expect(found.reads.secret).toMatchObject({ ok: false, code: 'EACCES' });
    expect(found.reads.upload).toMatchObject({ ok: false, code: 'EACCES' });
    expect(found.reads.wroteTarget).toMatchObject({ ok: false, code: 'EACCES' });
    expect(fs.existsSync(path.join(dir, 'planted.txt'))).toBe(false);
    expect(await invoke(createHandlerTable(ctx), 'workspace.info', {})).toEqual(infoBefore);
  });

  it('cannot read the workspace file itself', (t) => {
    const mode = fs.statSync(workspace).mode & 0o777;
    // Private (0600) workspace files come with the erasure work (DESIGN.md: workspaces are private files);
    // until then this branch guarantees only that the web shell gives nothing away, checked above.
    t.skip((mode & 0o044) !== 0, `the workspace file is created ${mode.toString(8)} here, readable by others: private workspace files are not on this branch yet`);
    expect(found.reads.workspace).toMatchObject({ ok: false, code: 'EACCES' });
  });
});
