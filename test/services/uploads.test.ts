import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { afterEach, describe, expect, it } from 'vitest';
import { InputError } from '../../src-main/core/errors.ts';
import { safeBaseName } from '../../src-main/services/staged-file.ts';
import { sizeInWords, UploadRefused, UploadStore } from '../../src-main/services/uploads.ts';

describe('safeBaseName', () => {
  it('keeps only the last path part, with its extension', () => {
    expect(safeBaseName('../../evil.csv')).toBe('evil.csv');
    expect(safeBaseName('C:\\Users\\me\\shop.jsonl')).toBe('shop.jsonl');
    expect(safeBaseName('my shop (2026).csv')).toBe('my shop _2026_.csv');
  });
  it('never gives . or .. or an empty name', () => {
    for (const n of ['..', '.', '', '/', 'a/..', '...']) expect(safeBaseName(n)).toBe('upload.csv');
  });
  it('shortens a very long name but keeps the extension', () => {
    const b = safeBaseName(`${'x'.repeat(400)}.jsonl`);
    expect(b.length).toBeLessThanOrEqual(120);
    expect(b.endsWith('.jsonl')).toBe(true);
  });
});

describe('UploadStore', () => {
  const parents: string[] = [];
  function store(): UploadStore {
    const parent = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-uploads-'));
    parents.push(parent);
    return new UploadStore(parent);
  }
  afterEach(() => {
    for (const p of parents.splice(0)) fs.rmSync(p, { recursive: true, force: true });
  });

  it('makes no folder until the first upload', () => {
    expect(store().folder).toBeNull();
  });

  it('streams to its own sub-folder, resolves, removes one, and removes all on close', async () => {
    const s = store();
    const a = await s.receive('a.csv', Readable.from([Buffer.from('id\n'), Buffer.from('1\n')]), 100);
    const b = await s.receive('a.csv', Readable.from([Buffer.from('id\n2\n')]), 100);
    expect(a.id).toMatch(/^[0-9a-f]{32}$/);
    expect(a.bytes).toBe(5);
    expect(a.path).not.toBe(b.path); // the same name twice does not collide
    expect(fs.readFileSync(s.resolve(a.id).path, 'utf8')).toBe('id\n1\n');
    s.remove(a.id);
    expect(fs.existsSync(a.path)).toBe(false);
    expect(() => s.resolve(a.id)).toThrow(InputError);
    const folder = s.folder!;
    s.close();
    expect(fs.existsSync(folder)).toBe(false);
    expect(() => s.resolve(b.id)).toThrow(/choose the file again/);
    // usable again after close, in a new folder
    const c = await s.receive('c.csv', Readable.from([Buffer.from('x')]), 100);
    expect(fs.existsSync(c.path)).toBe(true);
    s.close();
  });

  it('refuses a body over the limit and leaves no partial file', async () => {
    const s = store();
    const e = await s.receive('big.csv', Readable.from([Buffer.alloc(60), Buffer.alloc(60)]), 100).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(UploadRefused);
    expect((e as UploadRefused).reason).toBe('too_large');
    expect(fs.readdirSync(s.folder!)).toEqual([]);
  });
});

describe('sizeInWords', () => {
  it('says a limit in the unit it is a whole number of', () => {
    expect([4 * 2 ** 30, 32 * 2 ** 20, 4096, 2 ** 20 + 1].map(sizeInWords)).toEqual(['4 GiB', '32 MiB', '4096 bytes', '1048577 bytes']);
  });
});
