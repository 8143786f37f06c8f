import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { MAX_PICTURE_BYTES, THUMB_SIDE } from '../../src-main/ingest/thumbnail.ts';
import { importFile } from '../../src-main/services/import.ts';
import { PictureRepo } from '../../src-main/store/pictures.ts';
import type { Db } from '../../src-main/store/workspace.ts';
import { freshWorkspace, snapshot, tempDir, write } from './helpers.ts';
import { handPng, webpSize, zeroPng } from './png.ts';

const dir = tempDir('shelfwright-pictures-');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let k = 0;
const ws = () => freshWorkspace(dir, `w${++k}.shelf`);
fs.mkdirSync(path.join(dir, 'pics'));
/** 400 × 200, left half red, right half blue: a landscape picture to fit inside the thumbnail's square. */
const wide = write(dir, 'pics/wide.png', handPng(400, 200, (x) => (x < 200 ? [220, 30, 30] : [30, 30, 220])));
const thumbs = (db: Db) => db.prepare('SELECT hash, recipe, mime, width, height, data FROM picture_thumb ORDER BY hash').all() as { hash: string; mime: string; width: number; height: number; data: Buffer }[];
const pictureRows = (db: Db) => db.prepare('SELECT * FROM item_picture ORDER BY item_id').all();

describe('importing items with pictures', () => {
  it('makes one bounded WebP thumbnail from a picture named by a path relative to the file', async () => {
    const db = ws();
    const r = await importFile(db, { target: 'items', file: write(dir, 'good.csv', 'id,title,image\na1,Moss Lantern,pics/wide.png\n') });
    expect(r).toMatchObject({ committed: true, added: 1, warnings: [] });
    expect(r.mapping.image).toBe('image');
    expect(r.pictures).toMatchObject({ named: 1, ready: 1, made: 1, reused: 0, missing: 0, broken: 0 });
    const [t] = thumbs(db);
    // The stored key is the sha256 of the file's bytes (FIPS 180-4, via Node's crypto).
    const { createHash } = await import('node:crypto');
    expect(t!.hash).toBe(createHash('sha256').update(fs.readFileSync(wide)).digest('hex'));
    expect(t!.mime).toBe('image/webp');
    // Read from the WebP container itself (RFC 9649): the 2:1 picture fits the square at 96 × 48.
    expect(webpSize(t!.data)).toMatchObject({ width: THUMB_SIDE, height: THUMB_SIDE / 2 });
    expect([t!.width, t!.height]).toEqual([THUMB_SIDE, THUMB_SIDE / 2]);
    expect(t!.data.length).toBeLessThanOrEqual(32 * 1024);
    // Decoded again, the left of the thumbnail is red and the right blue (lossy, so within a margin).
    const { data } = await sharp(t!.data).removeAlpha().raw().toBuffer({ resolveWithObject: true });
    const at = (x: number, y: number) => [...data.subarray((y * THUMB_SIDE + x) * 3, (y * THUMB_SIDE + x) * 3 + 3)];
    expect(at(10, 24)[0]).toBeGreaterThan(180);
    expect(at(85, 24)[2]).toBeGreaterThan(180);
    expect(new PictureRepo(db).pictureOf('a1')).toEqual({ source: 'pics/wide.png', state: 'ready', thumb: t!.hash });
  });

  it('keeps no camera metadata: the EXIF of a photo does not reach the thumbnail', async () => {
    const db = ws();
    const photo = await sharp(handPng(120, 80, () => [40, 160, 60])).jpeg().withExif({ IFD0: { Artist: 'Pellow Quarrington', Copyright: 'secret-owner' } }).toBuffer();
    expect(photo.includes('secret-owner')).toBe(true);
    write(dir, 'pics/photo.jpg', photo);
    await importFile(db, { target: 'items', file: write(dir, 'photo.csv', 'id,title,picture\na1,Fern Tray,pics/photo.jpg\n') });
    const [t] = thumbs(db);
    // RFC 9649: metadata would travel in EXIF or XMP chunks; there are none, and the text is nowhere.
    expect(webpSize(t!.data).chunks).not.toContain('EXIF');
    expect(webpSize(t!.data).chunks).not.toContain('XMP ');
    expect(t!.data.includes('secret-owner')).toBe(false);
  });

  it('turns a photo upright by its EXIF orientation before making it small', async () => {
    const db = ws();
    // Stored 40 wide and 20 high, tagged Orientation 6: shown turned a quarter clockwise, 20 wide and 40 high
    // (EXIF 2.32, CIPA DC-008-2019, tag 0x0112).
    const sideways = await sharp(handPng(40, 20, () => [90, 90, 200])).jpeg().withMetadata({ orientation: 6 }).toBuffer();
    expect((await sharp(sideways).metadata()).orientation).toBe(6);
    write(dir, 'pics/sideways.jpg', sideways);
    await importFile(db, { target: 'items', file: write(dir, 'sideways.csv', 'id,title,image\na1,Fern Tray,pics/sideways.jpg\n') });
    const [t] = thumbs(db);
    expect(webpSize(t!.data)).toMatchObject({ width: 20, height: 40 }); // upright, and never enlarged
  });

  it('makes a picture shared by items once, and a re-import reuses it without making it again', async () => {
    const db = ws();
    const file = write(dir, 'shared.csv', `id,title,image\na1,Moss Lantern,pics/wide.png\na2,Tin Orchard,${wide}\n`);
    const first = await importFile(db, { target: 'items', file });
    expect(first.pictures).toMatchObject({ named: 2, ready: 2, made: 1, reused: 0 });
    const stored = thumbs(db);
    expect(stored).toHaveLength(1);
    const again = await importFile(db, { target: 'items', file });
    expect(again.pictures).toMatchObject({ named: 2, ready: 2, made: 0, reused: 2 });
    expect(thumbs(db)).toEqual(stored);
  });

  it('reads file: addresses, records web addresses without fetching them, and says so once', async () => {
    const db = ws();
    const csv = `id,title,image\na1,Moss Lantern,${pathToFileURL(wide).href}\na2,Tin Orchard,https://pictures.example/tin.jpg\na3,Salt Atlas,http://pictures.example/salt.jpg\n`;
    const r = await importFile(db, { target: 'items', file: write(dir, 'urls.csv', csv) });
    expect(r).toMatchObject({ committed: true, added: 3 });
    expect(r.pictures).toMatchObject({ named: 3, ready: 1, remote: 2 });
    const repo = new PictureRepo(db);
    expect(repo.pictureOf('a2')).toEqual({ source: 'https://pictures.example/tin.jpg', state: 'remote', thumb: null });
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings[0]).toMatch(/^2 pictures are web addresses \(the first on line 3\): Shelfwright .* does not fetch from the network/);
  });

  it('refuses an address of another kind with the row, naming line and column', async () => {
    const db = ws();
    const before = snapshot(db);
    const r = await importFile(db, { target: 'items', file: write(dir, 'ftp.csv', 'id,title,image\na1,Moss Lantern,ftp://pictures.example/a.jpg\n') });
    expect(r).toMatchObject({ committed: false, rejected: 1 });
    expect(r.errors[0]!.message).toBe(`${path.join(dir, 'ftp.csv')}:2:3: image: 'ftp://pictures.example/a.jpg' is neither a file path nor a web address (http: or https:)`);
    expect(snapshot(db)).toEqual(before);
  });

  it('imports the item of a missing picture with a placeholder and a warning naming its row', async () => {
    const db = ws();
    const file = write(dir, 'missing.csv', 'id,title,image\na1,Moss Lantern,pics/wide.png\na2,Tin Orchard,pics/gone.png\n');
    const r = await importFile(db, { target: 'items', file });
    expect(r).toMatchObject({ committed: true, added: 2 });
    expect(r.pictures).toMatchObject({ ready: 1, missing: 1 });
    expect(r.warnings).toEqual([`${file}:3:3: image: 'pics/gone.png': no such file; the item is shown with a placeholder`]);
    expect(new PictureRepo(db).pictureOf('a2')).toEqual({ source: 'pics/gone.png', state: 'missing', thumb: null });
  });

  it('imports the item of a broken picture with a placeholder: not a picture, cut short, SVG, too many pixels', async () => {
    const db = ws();
    write(dir, 'pics/text.jpg', 'this is not a picture at all');
    const full = handPng(300, 300, (x, y) => [(x * 7) % 256, (y * 5) % 256, 90]);
    write(dir, 'pics/cut.png', full.subarray(0, Math.floor(full.length / 2)));
    write(dir, 'pics/drawing.svg', '<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><image href="/etc/hostname"/></svg>');
    // 7,000 × 7,000 = 49 megapixels in a few hundred KB: refused before decoding (sharp's limitInputPixels).
    write(dir, 'pics/bomb.png', zeroPng(7000, 7000));
    const csv = 'id,title,image\nb1,One,pics/text.jpg\nb2,Two,pics/cut.png\nb3,Three,pics/drawing.svg\nb4,Four,pics/bomb.png\n';
    const file = write(dir, 'broken.csv', csv);
    const r = await importFile(db, { target: 'items', file });
    expect(r).toMatchObject({ committed: true, added: 4 });
    expect(r.pictures).toMatchObject({ named: 4, ready: 0, broken: 4, made: 0 });
    expect(r.warnings).toHaveLength(4);
    expect(r.warnings[0]).toMatch(new RegExp(`^${escape(file)}:2:3: image: 'pics/text.jpg': not a picture sharp can read .*; the item is shown with a placeholder$`));
    expect(r.warnings[1]).toMatch(/:3:3: image: 'pics\/cut.png': the png file is damaged or too large to decode/);
    expect(r.warnings[2]).toMatch(/:4:3: image: 'pics\/drawing.svg': an SVG drawing \(it may name other files, so it is not read\)/);
    expect(r.warnings[3]).toMatch(/:5:3: image: 'pics\/bomb.png': (not a picture sharp can read|the png file is damaged or too large to decode) \(.*pixel/i);
    expect(thumbs(db)).toEqual([]);
    expect((pictureRows(db) as { state: string }[]).map((p) => p.state)).toEqual(['broken', 'broken', 'broken', 'broken']);
  });

  it('refuses a picture file over the bound with its row, and the failed import writes nothing', async () => {
    const db = ws();
    await importFile(db, { target: 'items', file: write(dir, 'base.csv', 'id,title,image\na1,Moss Lantern,pics/wide.png\n') });
    const before = { ...snapshot(db), thumbs: thumbs(db), pictures: pictureRows(db) };
    // A sparse file: its size is over the bound without writing 20 MB.
    const fd = fs.openSync(path.join(dir, 'pics/huge.jpg'), 'w');
    fs.ftruncateSync(fd, MAX_PICTURE_BYTES + 1);
    fs.closeSync(fd);
    const file = write(dir, 'huge.csv', 'id,title,image\na1,Moss Lantern Revised,\na2,Tin Orchard,pics/huge.jpg\n');
    const r = await importFile(db, { target: 'items', file });
    expect(r).toMatchObject({ committed: false, rejected: 1, added: 0 });
    expect(r.errors[0]!.message).toBe(`${file}:3:3: image: 'pics/huge.jpg' is 20.0 MB; a picture may be at most 20.0 MB (make it smaller, or leave the cell empty)`);
    expect({ ...snapshot(db), thumbs: thumbs(db), pictures: pictureRows(db) }).toEqual(before);
  });

  it('with accepted rejects, keeps the other rows and pictures and leaves the refused item out', async () => {
    const db = ws();
    const file = write(dir, 'partial.csv', 'id,title,image\na1,Moss Lantern,pics/wide.png\na2,Tin Orchard,pics/huge.jpg\n');
    const r = await importFile(db, { target: 'items', file, acceptPartial: true });
    expect(r).toMatchObject({ committed: true, added: 1, rejected: 1 });
    expect(db.prepare('SELECT external_id FROM item').pluck().all()).toEqual(['a1']);
    expect(new PictureRepo(db).counts()).toEqual({ states: { ready: 1, missing: 0, broken: 0, remote: 0, unread: 0 }, thumbs: 1 });
  });

  it('a blank picture cell removes the picture, and its thumbnail once no item shows it', async () => {
    const db = ws();
    await importFile(db, { target: 'items', file: write(dir, 'set.csv', 'id,title,image\na1,Moss Lantern,pics/wide.png\n') });
    const r = await importFile(db, { target: 'items', file: write(dir, 'clear.csv', 'id,image\na1,\n') });
    expect(r.pictures).toMatchObject({ named: 0, cleared: 1 });
    expect(pictureRows(db)).toEqual([]);
    expect(thumbs(db)).toEqual([]);
  });

  it('a file without an image column leaves stored pictures as they are', async () => {
    const db = ws();
    await importFile(db, { target: 'items', file: write(dir, 'set2.csv', 'id,title,image\na1,Moss Lantern,pics/wide.png\n') });
    const before = { thumbs: thumbs(db), pictures: pictureRows(db) };
    const r = await importFile(db, { target: 'items', file: write(dir, 'price.csv', 'id,price\na1,12.50\n') });
    expect(r.pictures).toBeUndefined();
    expect({ thumbs: thumbs(db), pictures: pictureRows(db) }).toEqual(before);
  });

  it('records, without reading, paths in a file sent from a page', async () => {
    const db = ws();
    const r = await importFile(db, { target: 'items', file: write(dir, 'sent.csv', `id,title,image\na1,Moss Lantern,${wide}\n`), pictures: 'record' });
    expect(r.pictures).toMatchObject({ named: 1, unread: 1, ready: 0 });
    expect(thumbs(db)).toEqual([]);
    expect(r.warnings[0]).toMatch(/^1 picture is named by path \(the first on line 2\) in a file sent from the page/);
  });
});

function escape(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}
