import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { capture } from './capture.ts';
import { importSmallShop } from './small-shop.ts';

/**
 * Paths a new user gets wrong: a workspace that is not there or is a folder, a folder given as the file to
 * import, an output file in a folder that does not exist. Each must exit 2 (data error, as `--help` promises),
 * say what is wrong in plain words with the next step, never print a system code (ENOENT, EISDIR) and change
 * or create nothing.
 *
 * The conditions themselves are POSIX's: open() fails with ENOENT when "a component of the path prefix of path
 * does not name an existing file" and with EISDIR when "the named file is a directory" and write access is
 * asked (POSIX.1-2017, XSH open()). The tests build exactly those two cases.
 */

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-cli-qa-paths-'));
const ws = path.join(dir, 'shop.sqlite');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

beforeAll(() => importSmallShop(ws, path.join(dir, 'shop'), 3), 30_000);

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = capture();
  const code = await main(argv, io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

const noSystemCodes = (text: string) => expect(text).not.toMatch(/ENOENT|EISDIR|EACCES|unable to open database|internal error/);

describe('the workspace path', () => {
  it('says how to make a workspace when the file is not there, and does not create it', async () => {
    const missing = path.join(dir, 'nothere.sqlite');
    const r = await run('stats', '-w', missing);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`shelfwright stats: no workspace at ${missing}: make one by importing a catalogue`);
    expect(r.err).toContain(`shelfwright import items FILE -w ${missing}`);
    expect(r.err).toContain(`shelfwright demo -w ${missing}`);
    expect(fs.existsSync(missing)).toBe(false);
  });

  it('says a folder is a folder, for reading and for importing into', async () => {
    for (const argv of [['stats'], ['import', 'items', path.join(dir, 'shop', 'items.csv')]]) {
      const r = await run(...argv, '-w', dir);
      expect(r.code).toBe(2);
      expect(r.err).toContain(`${dir}: this is a folder, not a workspace file`);
      noSystemCodes(r.err);
    }
  });
});

describe('import from a folder', () => {
  it('exits 2 naming the folder, and the workspace keeps what it had', async () => {
    const before = JSON.parse((await run('stats', '-w', ws, '--json')).out) as { items: number; signals: number };
    const folder = path.join(dir, 'shop');
    for (const extra of [[], ['--format', 'csv'], ['--preview']]) {
      const r = await run('import', 'items', folder, '-w', ws, ...extra);
      expect(r.code).toBe(2);
      expect(r.err).toContain(`${folder}: this is a folder, not a file`);
      noSystemCodes(r.err);
    }
    const after = JSON.parse((await run('stats', '-w', ws, '--json')).out) as { items: number; signals: number };
    expect(after).toMatchObject({ items: before.items, signals: before.signals });
  });
});

describe('evaluate --holdout with a folder', () => {
  it('names the folder instead of guessing a format from it', async () => {
    const folder = path.join(dir, 'shop');
    const r = await run('evaluate', '--holdout', folder, '-w', ws);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${folder}: this is a folder, not a holdout file`);
    expect(r.err).not.toContain('cannot tell the format');
  });
});

describe('edition export --out', () => {
  beforeAll(async () => {
    expect((await run('edition', 'new', 'week 1', '--date', '2026-03-02', '-w', ws)).code).toBe(0);
    expect((await run('shelf', 'add', 'week 1', 'Front', '--size', '4', '-w', ws)).code).toBe(0);
  }, 30_000);

  it('refuses a folder that does not exist, before any work, and creates nothing', async () => {
    const out = path.join(dir, 'no', 'such', 'week1.csv');
    const r = await run('edition', 'export', 'week 1', '--format', 'csv', '--out', out, '-w', ws);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`the folder ${path.join(dir, 'no', 'such')} does not exist; create it first`);
    noSystemCodes(r.err);
    expect(fs.existsSync(path.join(dir, 'no'))).toBe(false);
  });

  it('refuses a folder as the file to write', async () => {
    const r = await run('edition', 'export', 'week 1', '--format', 'html', '--out', dir, '-w', ws);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${dir}: cannot write the output file: this is a folder; give the name of a file`);
    expect(r.out).toBe('');
    noSystemCodes(r.err);
    // With --json the same failure is one JSON object on stdout, nothing on stderr.
    const j = await run('edition', 'export', 'week 1', '--format', 'html', '--out', dir, '-w', ws, '--json');
    expect(j.code).toBe(2);
    expect(j.err).toBe('');
    expect(JSON.parse(j.out).error).toMatchObject({ exit: 2, kind: 'data', message: expect.stringContaining('cannot write the output file: this is a folder') });
  });

  it('writes the whole file and leaves no partial file beside it', async () => {
    const out = path.join(dir, 'week1.json');
    const r = await run('edition', 'export', 'week 1', '--format', 'json', '--out', out, '-w', ws, '--json');
    expect(r.code).toBe(0);
    const written = fs.readFileSync(out, 'utf8');
    expect(JSON.parse(r.out)).toEqual({ format: 'json', file: out, bytes: Buffer.byteLength(written) });
    expect(JSON.parse(written)).toBeTypeOf('object');
    expect(fs.readdirSync(dir).filter((f) => f.includes('.partial-'))).toEqual([]);
  });
});

describe('recommend --out and --customers', () => {
  it('refuses an output folder that does not exist before scoring anyone', async () => {
    const out = path.join(dir, 'missing', 'top.csv');
    const r = await run('recommend', '--all', '--top', '3', '--out', out, '-w', ws);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`the folder ${path.join(dir, 'missing')} does not exist`);
    noSystemCodes(r.err);
    expect(r.err).not.toContain('.partial-');
  });

  it('says plainly that the customer list is not there', async () => {
    const list = path.join(dir, 'nobody.txt');
    const r = await run('recommend', '--customers', list, '--top', '3', '--out', path.join(dir, 'top.csv'), '-w', ws);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`${list}: no such customer list: check the path`);
    noSystemCodes(r.err);
    expect(fs.existsSync(path.join(dir, 'top.csv'))).toBe(false);
  });
});
