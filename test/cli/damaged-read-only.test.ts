/**
 * Workspace files that cannot be used as usual: a damaged one is refused as a data error naming the file,
 * with the advice to restore a backup (also as JSON under --json); a read-only one opens for reading, and a
 * write to it is refused clearly, the file unchanged.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src-main/shell/cli/main.ts';
import { cli } from '../concurrency/processes.ts';
import { capture } from './capture.ts';
import { importSmallShop } from './small-shop.ts';

let dir: string;
let good: string;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-files-'));
  fs.chmodSync(dir, 0o755); // the other user must reach the folders inside
  good = path.join(dir, 'good.sqlite');
  await importSmallShop(good, path.join(dir, 'shop'), 5);
}, 120_000);

afterAll(() => {
  // The read-only folders are made writable again so they can be removed.
  for (const f of fs.readdirSync(dir)) fs.chmodSync(path.join(dir, f), 0o755);
  fs.rmSync(dir, { recursive: true, force: true });
});

async function run(...argv: string[]) {
  const io = capture();
  const code = await main(argv, io, {});
  return { code, out: io.stdout.join('\n'), err: io.stderr.join('\n') };
}

/**
 * Two ways a file gets damaged, as SQLite's "How To Corrupt An SQLite Database File" lists them: cut short
 * (a copy that stopped half-way; noticed when the file is opened) and pages overwritten with garbage
 * (noticed only when a command reads them).
 */
const DAMAGE: [string, (file: string) => void][] = [
  ['cut short', (file) => fs.truncateSync(file, 20_000)],
  [
    'pages overwritten',
    (file) => {
      const fd = fs.openSync(file, 'r+');
      fs.writeSync(fd, Buffer.alloc(4096 * 5, 0xff), 0, 4096 * 5, 4096);
      fs.closeSync(fd);
    },
  ],
];

describe('a damaged workspace', () => {
  for (const [how, damage] of DAMAGE) {
    for (const command of ['info', 'stats']) {
      it(`${how}: ${command} exits 2 naming the file and advising a backup, as text and as JSON`, async () => {
        const file = path.join(dir, `damaged-${how.replace(' ', '-')}-${command}.sqlite`);
        fs.copyFileSync(good, file);
        damage(file);
        const before = fs.readFileSync(file);
        const text = await run(command, '-w', file);
        expect(text.code).toBe(2);
        expect(text.err).toMatch(new RegExp(`^shelfwright ${command}: ${file}: the workspace file is damaged and cannot be read safely \\(SQLite: database disk image is malformed\\)\\. It was left as it is\\. Restore it from your latest backup copy of the file`));
        const json = await run(command, '-w', file, '--json');
        expect(json.code).toBe(2);
        expect(json.err).toBe('');
        const error = JSON.parse(json.out).error;
        expect(error).toMatchObject({ exit: 2, kind: 'data', where: { file } });
        expect(error.message).toContain('Restore it from your latest backup copy of the file');
        expect(fs.readFileSync(file).equals(before)).toBe(true);
      });
    }
  }
});

/** Permission bits bind only other users: as root, the command runs as nobody (uid 65534). */
const reader = process.getuid?.() === 0 ? { uid: 65534, gid: 65534 } : {};

describe('a read-only workspace', () => {
  const cases: [string, (folder: string, file: string) => void][] = [
    ['a read-only file in a folder the user may write to', (folder, file) => {
      fs.chmodSync(file, 0o444);
      if (reader.uid !== undefined) fs.chownSync(folder, reader.uid, reader.gid);
    }],
    ['a read-only folder', (folder, file) => {
      fs.chmodSync(file, 0o444);
      fs.chmodSync(folder, 0o555);
    }],
  ];
  for (const [name, protect] of cases) {
    it(`${name}: info and stats read it; a write is refused clearly and the file is unchanged`, async () => {
      const folder = path.join(dir, name.replace(/ /g, '-'));
      fs.mkdirSync(folder, { mode: 0o755 });
      const file = path.join(folder, 'shop.sqlite');
      fs.copyFileSync(good, file);
      protect(folder, file);
      const before = fs.readFileSync(file);
      const info = cli(['info', '-w', file], reader);
      expect(await info.exit, info.err()).toBe(0);
      expect(info.out()).toContain('120 items, 400 customers');
      const stats = cli(['stats', '-w', file, '--json'], reader);
      expect(await stats.exit, stats.err()).toBe(0);
      expect(JSON.parse(stats.out())).toMatchObject({ items: 120, customers: 400 });
      const forget = cli(['forget', 'C000002', '-w', file], reader);
      expect(await forget.exit).toBe(2);
      expect(forget.err()).toContain(`${file}: this workspace is read-only (the file or its folder cannot be written): it opens for reading, but nothing can be changed`);
      expect(fs.readFileSync(file).equals(before)).toBe(true);
      expect(fs.readdirSync(folder).filter((f) => f.startsWith('shop.sqlite-writer'))).toEqual([]);
    }, 60_000);
  }
});
