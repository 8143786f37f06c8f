// @vitest-environment happy-dom
import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it, onTestFinished } from 'vitest';
import { makeThumbnail } from '../../src-main/ingest/thumbnail.ts';
import { PictureRepo } from '../../src-main/store/pictures.ts';
import { handPng } from '../ingest/png.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor, TITLES } from './seed.ts';

const app = seededApp();

/** Gives the odd-numbered seeded items (i-1, i-3, ...) one picture; the rest have none. Returns its data: URL. */
async function pictureOddItems(): Promise<string> {
  const made = await makeThumbnail(handPng(48, 48, (x, y) => [x * 5, y * 5, 120]));
  if (!made.ok) throw new Error(made.reason);
  const repo = new PictureRepo(app.h.ctx.db);
  repo.putThumb({ hash: 'a'.repeat(64), recipe: 1, ...made.thumb });
  for (let i = 1; i <= 12; i += 2) repo.setPicture(`i-${i}`, 'pics/odd.png', 'ready', 'a'.repeat(64));
  repo.setPicture('i-2', 'https://pictures.example/i-2.jpg', 'remote', null);
  return `data:image/webp;base64,${made.thumb.data.toString('base64')}`;
}

/** The seeded item number of a slot from its label 'Slot n: title' (seed.ts: item i-(k+1) is titled TITLES[k]). */
const itemNumberOf = (label: string) => TITLES.indexOf(label.replace(/^Slot \d+: /, '')) + 1;

describe('item pictures on screen', () => {
  it('shows each slot its thumbnail from the api, and a neutral placeholder where the item has none', async () => {
    const src = await pictureOddItems();
    await openRowInEditor(app.store, '2026-12-07', 12);
    const calls: string[][] = [];
    const call = app.h.client.call;
    app.h.client.call = ((m, p) => {
      if (m === 'item.pictures') calls.push((p as { items: string[] }).items);
      return call(m, p);
    }) as typeof call;
    app.render();
    const slots = await screen.findByRole('list', { name: 'Slots' });
    await waitFor(() => expect(slots.querySelectorAll('img.thumb')).toHaveLength(6));
    const cards = [...slots.querySelectorAll(':scope > li')];
    expect(cards).toHaveLength(12);
    for (const li of cards) {
      const n = itemNumberOf(li.getAttribute('aria-label')!);
      expect(n).toBeGreaterThan(0);
      const img = li.querySelector('img.thumb');
      if (n % 2 === 1) {
        expect(img?.getAttribute('src')).toBe(src);
        expect(img?.getAttribute('alt')).toBe(''); // decorative: the title is written beside it
      } else {
        expect(img).toBeNull();
        expect(li.querySelector('.thumb-none[aria-hidden="true"]')).not.toBeNull();
      }
    }
    // Every picture a render wants goes out in one call, and nothing is asked twice.
    expect(calls).toHaveLength(1);
    expect(calls[0]!.slice().sort()).toEqual(Array.from({ length: 12 }, (_, i) => `i-${i + 1}`).sort());
  });

  it('shows the thumbnails on the board, and asks again after an import of items', async () => {
    await pictureOddItems();
    await openRowInEditor(app.store, '2026-12-07', 5);
    app.store.getState().go('board');
    app.render();
    const card = await screen.findByRole('article', { name: 'Shelf Row' });
    const shown = app.store.getState().curation.edition!.shelves[0]!.slots.filter((s) => s.item !== null);
    const odd = shown.filter((s) => Number(s.item!.slice(2)) % 2 === 1).length;
    await waitFor(() => expect(card.querySelectorAll('img.thumb-mini')).toHaveLength(odd));
    expect(card.querySelectorAll('.thumb-mini.thumb-none')).toHaveLength(shown.length - odd);
    // An import of items may change pictures: the page forgets them and asks again.
    let asked = 0;
    const call = app.h.client.call;
    app.h.client.call = ((m, p) => {
      if (m === 'item.pictures') asked++;
      return call(m, p);
    }) as typeof call;
    await app.store.getState().runImport({ fileName: 'p.csv', content: 'id,price\ni-1,3.50\n' }, 'items', {});
    expect(app.store.getState().importer.report?.committed).toBe(true);
    await waitFor(() => expect(asked).toBe(1));
    await waitFor(() => expect(card.querySelectorAll('img.thumb-mini')).toHaveLength(odd));
  });

  it('shows the thumbnails in the candidate pool', async () => {
    const src = await pictureOddItems();
    // happy-dom lays nothing out: the pool's virtual list reads its scroller's client size to choose its rows.
    const saved = (['clientHeight', 'clientWidth'] as const).map((k) => [k, Object.getOwnPropertyDescriptor(HTMLElement.prototype, k)] as const);
    Object.defineProperty(HTMLElement.prototype, 'clientHeight', { configurable: true, get: () => 600 });
    Object.defineProperty(HTMLElement.prototype, 'clientWidth', { configurable: true, get: () => 800 });
    onTestFinished(() => {
      for (const [k, d] of saved) {
        if (d) Object.defineProperty(HTMLElement.prototype, k, d);
        else delete (HTMLElement.prototype as unknown as Record<string, unknown>)[k];
      }
    });
    await openRowInEditor(app.store, '2026-12-07', 6);
    app.render();
    const pool = await screen.findByRole('list', { name: 'Candidates for this slot' });
    // Six items are on the shelf, the other six are the pool.
    await waitFor(() => expect(pool.querySelectorAll(':scope > li')).toHaveLength(6));
    await waitFor(() => expect(pool.querySelectorAll('img.thumb-pool').length).toBeGreaterThan(0));
    let pictured = 0;
    for (const li of pool.querySelectorAll(':scope > li')) {
      const pin = li.querySelector('button')!.getAttribute('aria-label')!; // 'Pin <title> into slot 1'
      const n = TITLES.indexOf(pin.replace(/^Pin (.*) into slot \d+$/, '$1')) + 1;
      expect(n).toBeGreaterThan(0);
      if (n % 2 === 1) {
        expect(li.querySelector('img.thumb-pool')?.getAttribute('src')).toBe(src);
        pictured++;
      } else expect(li.querySelector('.thumb-pool.thumb-none')).not.toBeNull();
    }
    expect(pictured).toBe(pool.querySelectorAll('img.thumb-pool').length);
  });
});

describe('item pictures in the planner', () => {
  it("shows each calendar cell its item's thumbnail through the board's component, and the placeholder where it has none", async () => {
    const src = await pictureOddItems();
    await openRowInEditor(app.store, '2026-11-30', 4);
    await app.store.getState().makePlan({ shelf: 'Row', start: '2026-12-07', weeks: 2, edition: 'Week 49' });
    app.store.getState().go('planner');
    app.render();
    const table = await screen.findByRole('table', { name: 'Plan for Row' });
    const cells = [...table.querySelectorAll<HTMLElement>('td[data-item]')];
    expect(cells).toHaveLength(8); // 4 slots × 2 weeks
    await waitFor(() => expect(table.querySelectorAll('img.thumb-cell')).toHaveLength(cells.filter((c) => Number(c.dataset['item']!.slice(2)) % 2 === 1).length));
    for (const td of cells) {
      const n = Number(td.dataset['item']!.slice(2));
      if (n % 2 === 1) {
        expect(td.querySelector('img.thumb-cell')?.getAttribute('src')).toBe(src);
        expect(td.querySelector('img.thumb-cell')?.getAttribute('alt')).toBe(''); // decorative: the title is beside it
      } else expect(td.querySelector('.thumb-cell.thumb-none[aria-hidden="true"]')).not.toBeNull();
    }
  });
});
