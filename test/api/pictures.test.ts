import fs from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { makeThumbnail } from '../../src-main/ingest/thumbnail.ts';
import { PictureRepo } from '../../src-main/store/pictures.ts';
import { handPng } from '../ingest/png.ts';
import { seededHarness, type Harness } from '../renderer/seed.ts';

let h: Harness | undefined;
afterEach(() => h?.close());

describe('item.pictures', () => {
  it("answers each asked item with its thumbnail's bytes as a data: URL, or null for the placeholder", async () => {
    h = seededHarness();
    const made = await makeThumbnail(handPng(30, 20, () => [10, 120, 60]));
    if (!made.ok) throw new Error(made.reason);
    const repo = new PictureRepo(h.ctx.db);
    repo.putThumb({ hash: 'e'.repeat(64), recipe: 1, ...made.thumb });
    repo.setPicture('i-1', 'pics/a.png', 'ready', 'e'.repeat(64));
    repo.setPicture('i-2', 'https://pictures.example/b.jpg', 'remote', null);
    const r = await h.client.call('item.pictures', { items: ['i-1', 'i-2', 'i-3', 'no-such-item'] });
    expect(r.pictures).toEqual([
      { item: 'i-1', src: `data:image/webp;base64,${made.thumb.data.toString('base64')}` },
      { item: 'i-2', src: null },
      { item: 'i-3', src: null },
      { item: 'no-such-item', src: null },
    ]);
  });

  it('refuses more than 500 items in one call', async () => {
    h = seededHarness();
    const r = await invoke(createHandlerTable(h.ctx), 'item.pictures', { items: Array.from({ length: 501 }, (_, i) => `i-${i}`) });
    expect(r.ok).toBe(false);
  });
});

describe('import.run and pictures', () => {
  it('records, without reading, the picture paths of a file sent as content (a page may not read this machine)', async () => {
    h = seededHarness();
    const picture = `${h.dir}/lamp.png`;
    fs.writeFileSync(picture, handPng(20, 20, () => [1, 2, 3]));
    const sent = await h.client.call('import.run', { fileName: 'sent.csv', content: `id,title,image\nn1,Moss Lantern,${picture}\n`, target: 'items' });
    expect(sent.pictures).toMatchObject({ named: 1, unread: 1, ready: 0 });
    expect(sent.warnings.join('\n')).toContain('in a file sent from the page');
    // The same file named by its path (the command line, Electron) is read.
    const file = `${h.dir}/named.csv`;
    fs.writeFileSync(file, `id,title,image\nn1,Moss Lantern,lamp.png\n`);
    const named = await h.client.call('import.run', { file, target: 'items' });
    expect(named.pictures).toMatchObject({ named: 1, ready: 1 });
  });
});
