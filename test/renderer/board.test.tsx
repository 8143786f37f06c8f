// @vitest-environment happy-dom
import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { dateWords } from '../../src-renderer/components/format.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

const app = seededApp();

describe('the board', () => {
  it('says how many slots a card leaves out ("+3 more" for eight slots shown five at a time), and nothing when none', async () => {
    await openRowInEditor(app.store, '2026-12-07', 8);
    expect(await app.store.getState().addShelf('Short row', { size: 4 })).toBe(true);
    app.store.getState().go('board');
    app.render();
    const row = await screen.findByRole('article', { name: 'Shelf Row' });
    expect(within(row).getAllByRole('listitem')).toHaveLength(5);
    expect(within(row).getByText('+3 more')).toBeTruthy();
    const short = screen.getByRole('article', { name: 'Shelf Short row' });
    expect(within(short).queryByText(/more$/)).toBeNull();
    // The edition's date in the one on-screen format.
    expect(screen.getByText(new RegExp(`· ${dateWords('2026-12-07')} ·`))).toBeTruthy();
  });
});
