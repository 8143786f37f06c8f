import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { parseStartArgs } from '../../src-main/shell/launch/args.ts';
import { chromiumAppArgs, findChromium } from '../../src-main/shell/launch/browser.ts';
import { ensureDemo } from '../../src-main/shell/launch/demo.ts';
import { findElectronBinary } from '../../src-main/shell/launch/electron.ts';
import { LAUNCH_PAGE_NAME, writeLaunchPage } from '../../src-main/shell/launch/launch-page.ts';
import { rendererNeedsBuild } from '../../src-main/shell/launch/renderer-build.ts';

let dir: string;
beforeEach(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-launch-'));
});
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

function fakeElectron(opts: { pathTxt?: string; binary?: boolean }): void {
  const pkg = path.join(dir, 'node_modules', 'electron');
  fs.mkdirSync(path.join(pkg, 'dist'), { recursive: true });
  fs.writeFileSync(path.join(pkg, 'package.json'), JSON.stringify({ name: 'electron', version: '45.5.0', main: 'index.js' }));
  // index.js throws like the real one does when the binary is missing: detection must never run it.
  fs.writeFileSync(path.join(pkg, 'index.js'), 'throw new Error("must not be required")');
  if (opts.pathTxt !== undefined) fs.writeFileSync(path.join(pkg, 'path.txt'), opts.pathTxt);
  if (opts.binary) fs.writeFileSync(path.join(pkg, 'dist', 'electron'), '#!/bin/sh\n', { mode: 0o755 });
}

describe('findElectronBinary', () => {
  it('returns null when electron is not installed at all', () => {
    expect(findElectronBinary(dir)).toBeNull();
  });
  it('returns null when the package is there but path.txt is not (the binary download never ran)', () => {
    fakeElectron({});
    expect(findElectronBinary(dir)).toBeNull();
  });
  it('returns null when path.txt names a binary that is missing', () => {
    fakeElectron({ pathTxt: 'electron' });
    expect(findElectronBinary(dir)).toBeNull();
  });
  it('finds dist/<path.txt> when present, without loading the package', () => {
    fakeElectron({ pathTxt: 'electron\n', binary: true });
    expect(findElectronBinary(dir)).toBe(path.join(fs.realpathSync(dir), 'node_modules', 'electron', 'dist', 'electron'));
  });
});

describe('findChromium', () => {
  it('prefers chromium over google-chrome, searching PATH in order', () => {
    const a = path.join(dir, 'a');
    const b = path.join(dir, 'b');
    fs.mkdirSync(a);
    fs.mkdirSync(b);
    fs.writeFileSync(path.join(a, 'google-chrome'), '', { mode: 0o755 });
    fs.writeFileSync(path.join(b, 'chromium'), '', { mode: 0o755 });
    expect(findChromium([a, b].join(path.delimiter))).toBe(path.join(b, 'chromium'));
  });
  it('skips files that are not executable and returns null on an empty PATH', () => {
    fs.writeFileSync(path.join(dir, 'chromium'), '', { mode: 0o644 });
    expect(findChromium(dir)).toBeNull();
    expect(findChromium(undefined)).toBeNull();
  });
  it('builds app-mode arguments with a fresh profile and no background traffic', () => {
    const args = chromiumAppArgs('http://127.0.0.1:5/#token=x', '/tmp/p');
    expect(args).toContain('--app=http://127.0.0.1:5/#token=x');
    expect(args).toContain('--user-data-dir=/tmp/p');
    for (const f of ['--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']) {
      expect(args).toContain(f);
    }
  });
});

describe('writeLaunchPage', () => {
  const pageUrl = `http://127.0.0.1:4321/#token=${'ab'.repeat(32)}`;

  it('puts the token in a private file and gives the browser only that file address', () => {
    fs.chmodSync(dir, 0o700);
    const address = writeLaunchPage(dir, pageUrl);
    const file = path.join(dir, LAUNCH_PAGE_NAME);
    expect(address).toBe(`file://${file}`);
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
    // The browser's command line (readable by every account through /proc/<pid>/cmdline) holds no token.
    expect(chromiumAppArgs(address, dir).join(' ')).not.toContain('ab'.repeat(32));
    expect(fs.readFileSync(file, 'utf8')).toContain(`<meta http-equiv="refresh" content="0; url=${pageUrl}">`);
  });

  it('refuses a folder other accounts can enter, and never writes over an existing file', () => {
    fs.chmodSync(dir, 0o755);
    expect(() => writeLaunchPage(dir, pageUrl)).toThrow(/other accounts can enter it \(mode 755\)/);
    expect(fs.existsSync(path.join(dir, LAUNCH_PAGE_NAME))).toBe(false);
    fs.chmodSync(dir, 0o700);
    fs.writeFileSync(path.join(dir, LAUNCH_PAGE_NAME), 'planted');
    expect(() => writeLaunchPage(dir, pageUrl)).toThrow(/EEXIST/);
    expect(fs.readFileSync(path.join(dir, LAUNCH_PAGE_NAME), 'utf8')).toBe('planted');
  });
});

describe('parseStartArgs', () => {
  it('reads every flag, in both spellings of a value', () => {
    expect(parseStartArgs(['--workspace', 'a.sqlite', '--no-browser', '--port=8123'])).toEqual({
      workspace: 'a.sqlite',
      noBrowser: true,
      web: false,
      port: 8123,
    });
  });
  it('rejects an unknown flag, a missing value and a bad port, saying what is expected', () => {
    expect(() => parseStartArgs(['--wat'])).toThrow(/unknown option --wat.*usage/);
    expect(() => parseStartArgs(['--workspace'])).toThrow(/--workspace needs a value/);
    expect(() => parseStartArgs(['--port', '70000'])).toThrow(/0 to 65535/);
  });
});

describe('rendererNeedsBuild', () => {
  it('is true with no build, false after it, true again once a source is newer', () => {
    const src = path.join(dir, 'src');
    const dist = path.join(dir, 'dist');
    fs.mkdirSync(path.join(src, 'deep'), { recursive: true });
    fs.writeFileSync(path.join(src, 'deep', 'a.tsx'), 'x');
    expect(rendererNeedsBuild(dist, [src])).toBe(true);
    fs.mkdirSync(dist);
    fs.writeFileSync(path.join(dist, 'index.html'), '<html>');
    const later = new Date(Date.now() + 10_000);
    fs.utimesSync(path.join(dist, 'index.html'), later, later);
    expect(rendererNeedsBuild(dist, [src])).toBe(false);
    const evenLater = new Date(Date.now() + 20_000);
    fs.utimesSync(path.join(src, 'deep', 'a.tsx'), evenLater, evenLater);
    expect(rendererNeedsBuild(dist, [src])).toBe(true);
  });
});

describe('ensureDemo', () => {
  it('tells the terminal each step of the first-launch build, and each model once', async () => {
    const lines: string[] = [];
    await ensureDemo(path.join(dir, 'w.sqlite'), (l) => lines.push(l), async (_file, o) => {
      o.onStep?.('importing items');
      for (const model of ['ials', 'ials', 'ease'] as const) o.onTrainProgress?.({ stage: 'fit', model, fraction: 0.5 });
    });
    expect(lines).toEqual(['demo workspace: importing items', 'demo workspace: training ials', 'demo workspace: training ease']);
  });
  it('says once that it is tuning, however many models the search goes through', async () => {
    const lines: string[] = [];
    await ensureDemo(path.join(dir, 'w2.sqlite'), (l) => lines.push(l), async (_file, o) => {
      for (const model of ['itemknn', 'ease', 'ials', 'itemknn'] as const) o.onTrainProgress?.({ stage: 'tune', model, fraction: 0.2 });
      o.onTrainProgress?.({ stage: 'fit', model: 'content', fraction: 0.8 });
    });
    expect(lines).toEqual(['demo workspace: tuning the models (searching their settings)', 'demo workspace: training content']);
  });
  it('leaves an existing workspace alone', async () => {
    const file = path.join(dir, 'w.sqlite');
    fs.writeFileSync(file, 'mine');
    const lines: string[] = [];
    await ensureDemo(file, (l) => lines.push(l));
    expect(fs.readFileSync(file, 'utf8')).toBe('mine');
    expect(lines).toEqual([]);
  });
});
