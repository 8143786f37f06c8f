import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { PictureRepo } from '../../src-main/store/pictures.ts';
import { openWorkspace } from '../../src-main/store/workspace.ts';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-pictures-store-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let k = 0;
function workspace() {
  const db = openWorkspace(path.join(dir, `w${++k}.shelf`));
  db.prepare("INSERT INTO item (external_id, title) VALUES ('a1', 'Moss Lantern'), ('a2', 'Tin Orchard')").run();
  return db;
}
const hash = (c: string) => c.repeat(64);
const thumb = (h: string, bytes = 10) => ({ hash: h, recipe: 1, mime: 'image/webp' as const, width: 96, height: 48, data: Buffer.alloc(bytes, 7) });

describe('item pictures in the store (schema 9)', () => {
  it('returns the thumbnails of the asked items that have one, by external id', () => {
    const db = workspace();
    const repo = new PictureRepo(db);
    repo.putThumb(thumb(hash('a')));
    expect(repo.setPicture('a1', 'pics/a.png', 'ready', hash('a'))).toBe(true);
    expect(repo.setPicture('a2', 'https://pictures.example/b.jpg', 'remote', null)).toBe(true);
    expect(repo.setPicture('zz', 'pics/z.png', 'missing', null)).toBe(false);
    expect(repo.thumbsOf(['a1', 'a2', 'zz'])).toEqual([{ externalId: 'a1', mime: 'image/webp', data: Buffer.alloc(10, 7) }]);
    expect(repo.hasThumb(hash('a'), 1)).toBe(true);
    expect(repo.hasThumb(hash('a'), 2)).toBe(false); // another recipe: made again
  });

  it('refuses a ready picture without a thumbnail, a placeholder with one, and a thumbnail over 32 KB', () => {
    const db = workspace();
    const repo = new PictureRepo(db);
    expect(() => repo.setPicture('a1', 'pics/a.png', 'ready', null)).toThrow(/CHECK constraint failed/);
    repo.putThumb(thumb(hash('b')));
    expect(() => repo.setPicture('a1', 'pics/a.png', 'broken', hash('b'))).toThrow(/CHECK constraint failed/);
    expect(() => repo.putThumb(thumb(hash('c'), 32 * 1024 + 1))).toThrow(/CHECK constraint failed/);
    expect(() => repo.setPicture('a1', 'pics/a.png', 'ready', hash('d'))).toThrow(/FOREIGN KEY constraint failed/);
  });

  it('drops a picture with its item, and thumbnails no item shows any more', () => {
    const db = workspace();
    const repo = new PictureRepo(db);
    repo.putThumb(thumb(hash('a')));
    repo.putThumb(thumb(hash('b')));
    repo.setPicture('a1', 'pics/a.png', 'ready', hash('a'));
    repo.setPicture('a2', 'pics/b.png', 'ready', hash('b'));
    db.prepare("DELETE FROM item WHERE external_id = 'a2'").run();
    expect(repo.dropUnusedThumbs()).toBe(1);
    expect(repo.counts()).toEqual({ states: { ready: 1, missing: 0, broken: 0, remote: 0, unread: 0 }, thumbs: 1 });
  });
});
