import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';

describe('shelfwright command line', () => {
  it('lists its commands with --help and exits 0', async () => {
    const io = capture();
    expect(await main(['--help'], io, {})).toBe(0);
    expect(io.stdout.join('\n')).toMatch(/usage: shelfwright <command>/);
    expect(io.stdout.join('\n')).toMatch(/exit codes: 0 ok, 1 usage error, 2 data error/);
  });

  it('exits 1 on an unknown command and says how to get the list', async () => {
    const io = capture();
    expect(await main(['frobnicate'], io, {})).toBe(1);
    expect(io.stderr.join('\n')).toMatch(/unknown command 'frobnicate'.*--help/s);
  });

  it('exits 1 on an unknown flag', async () => {
    const io = capture();
    expect(await main(['info', '--bogus'], io, {})).toBe(1);
    expect(io.stderr.join('\n')).toMatch(/Unknown option '--bogus'/);
  });

  it('gives --help for a command', async () => {
    const io = capture();
    expect(await main(['info', '--help'], io, {})).toBe(0);
    expect(io.stdout.join('\n')).toMatch(/shelfwright info: /);
  });

  it('exits 2 with the path when the workspace does not exist', async () => {
    const io = capture();
    const missing = path.join(os.tmpdir(), `sw-missing-${process.pid}.sqlite`);
    expect(await main(['info', '--workspace', missing], io, {})).toBe(2);
    expect(io.stderr.join('\n')).toContain(`no workspace at ${missing}`);
    expect(fs.existsSync(missing)).toBe(false);
  });

  it('reads the workspace from SHELFWRIGHT_WORKSPACE and prints JSON with --json', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-'));
    const file = path.join(dir, 'w.sqlite');
    const { openWorkspace } = await import('../../src-main/store/workspace.ts');
    openWorkspace(file).close();
    const io = capture();
    expect(await main(['info', '--json'], io, { SHELFWRIGHT_WORKSPACE: file })).toBe(0);
    expect(JSON.parse(io.stdout.join(''))).toMatchObject({ open: true, file, items: 0 });
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
