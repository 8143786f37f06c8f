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
    expect(io.stderr.join('\n')).toBe("shelfwright info: unknown option --bogus for 'shelfwright info'\nRun 'shelfwright info --help'.");
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

  it('takes the global options before the command too (shelfwright -w FILE import items ...)', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-lead-'));
    const file = path.join(dir, 'w.sqlite');
    const csv = path.join(dir, 'items.csv');
    fs.writeFileSync(csv, 'id,title\na,A\nb,B\n');
    expect(await main(['-w', file, 'import', 'items', csv], capture(), {})).toBe(0);
    const io = capture();
    expect(await main(['--json', `--workspace=${file}`, 'info'], io, {})).toBe(0);
    expect(JSON.parse(io.stdout.join(''))).toMatchObject({ open: true, file, items: 2 });
    const wrong = capture();
    expect(await main(['-w', file, 'frobnicate'], wrong, {})).toBe(1);
    expect(wrong.stderr.join('\n')).toMatch(/unknown command 'frobnicate'/);
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('with --json, reports a failure as one JSON object on stdout, with the same exit code', async () => {
    const usage = capture();
    expect(await main(['stats', '--jsn', '--json'], usage, {})).toBe(1);
    expect(usage.stderr).toEqual([]);
    expect(JSON.parse(usage.stdout.join(''))).toMatchObject({ error: { exit: 1, kind: 'usage', message: expect.stringMatching(/--jsn/) } });

    const missing = capture();
    const nowhere = path.join(os.tmpdir(), 'sw-no-such-dir', 'nothing.sqlite');
    expect(await main(['stats', '-w', nowhere, '--json'], missing, {})).toBe(2);
    expect(JSON.parse(missing.stdout.join(''))).toMatchObject({ error: { exit: 2, kind: 'data', message: expect.stringMatching(/no workspace at/) } });

    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-json-err-'));
    const png = path.join(dir, 'photo.csv');
    fs.writeFileSync(png, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00]));
    const api = capture();
    expect(await main(['import', 'items', png, '-w', path.join(dir, 'w.sqlite'), '--json'], api, {})).toBe(2);
    const failure = JSON.parse(api.stdout.join('')).error;
    expect(failure).toMatchObject({ exit: 2, kind: 'data', code: expect.any(String), where: { file: png, line: 3 } }); // the PNG signature's two line breaks come before its first NUL
    expect(failure.message).toMatch(/not a text file/);
    fs.rmSync(dir, { recursive: true, force: true });

    const unknownCommand = capture();
    expect(await main(['stat', '--json'], unknownCommand, {})).toBe(1);
    expect(JSON.parse(unknownCommand.stdout.join('')).error.message).toMatch(/unknown command 'stat'/);
  });

  it('a flag value past a limit the api sets is a usage error (exit 1) naming the flag', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-limits-'));
    const ws = path.join(dir, 'w.sqlite');
    fs.writeFileSync(path.join(dir, 'items.csv'), 'id,title\nA1,Rake\n');
    expect(await main(['import', 'items', path.join(dir, 'items.csv'), '-w', ws], capture(), {})).toBe(0);
    const io = capture();
    expect(await main(['train', '--threads', '9', '-w', ws], io, {})).toBe(1);
    expect(io.stderr.join('\n')).toMatch(/--threads must be a whole number from 1 to 8, got '9'\nRun 'shelfwright train --help'/);
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
