// @vitest-environment happy-dom
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor, TITLES } from './seed.ts';

const app = seededApp();


/** Week 49: 'Row' (opened in the editor) and 'Sponsored row', which asks for more sponsored items than the shop has. */
async function twoShelves(): Promise<void> {
  await openRowInEditor(app.store, '2026-12-07', 4);
  // The seeded shop promotes 2 of its 12 items: half of 8 slots (4) cannot be sponsored.
  expect(await app.store.getState().addShelf('Sponsored row', { size: 8, rules: { promoted: { minCount: 0.5 } } })).toBe(true);
  app.store.getState().go('board');
}

const status = async (label: string) => {
  const { editions } = await app.h.client.call('edition.list', {});
  return editions.find((e) => e.label === label)?.status;
};

describe('publishing', () => {
  it('asks first, listing the rules not met and the shelves never opened; cancelling publishes nothing', async () => {
    await twoShelves();
    const violations = app.store.getState().curation.edition?.shelves.find((s) => s.label === 'Sponsored row')?.violations ?? [];
    expect(violations.length).toBeGreaterThan(0);
    app.render();
    fireEvent.click(await screen.findByRole('button', { name: 'Publish edition' }));
    const dialog = await screen.findByRole('alertdialog', { name: 'Publish Week 49?' });
    const rules = within(within(dialog).getByRole('list', { name: 'Rules not met' })).getAllByRole('listitem');
    expect(rules.map((li) => li.textContent)).toEqual(violations.map((v) => `Sponsored row — ${v.title}: ${v.reason}`));
    // Rules in words, not field paths (issue 12 item 3): "At least 4 sponsored items (minCount)".
    for (const li of rules) expect(li.textContent).not.toMatch(/promoted\.\w+:/);
    // 'Row' was opened in the shelf editor; 'Sponsored row' was only filled when it was added.
    const unopened = within(dialog).getByRole('list', { name: 'Shelves never opened' });
    expect(within(unopened).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Sponsored row']);
    expect(document.activeElement?.textContent).toBe('Keep editing');

    fireEvent.click(within(dialog).getByRole('button', { name: 'Keep editing' }));
    expect(screen.queryByRole('alertdialog')).toBeNull();
    expect(await status('Week 49')).toBe('draft');
    expect(screen.queryByRole('note', { name: 'Read-only edition' })).toBeNull();
  });

  it('publishes on "Publish now" and shows the read-only banner on the board and in the shelf editor', async () => {
    await twoShelves();
    app.render();
    fireEvent.click(await screen.findByRole('button', { name: 'Publish edition' }));
    fireEvent.click(within(await screen.findByRole('alertdialog')).getByRole('button', { name: 'Publish now' }));
    const banner = await screen.findByRole('note', { name: 'Read-only edition' });
    expect(banner.textContent).toMatch(/^Week 49 was published on .+ and is read-only: its shelves can be viewed, compared and exported, not changed\./);
    expect(await status('Week 49')).toBe('published');
    expect(screen.queryByRole('alertdialog')).toBeNull();
    expect(screen.queryByRole('button', { name: 'Publish edition' })).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Edit shelf Row' }));
    expect((await screen.findByRole('note', { name: 'Read-only edition' })).textContent).toMatch(/^Week 49 was published/);
  });

  it('counts a shelf with an action in its log as opened, even from another window', async () => {
    await twoShelves();
    await app.h.client.call('shelf.act', { edition: 'Week 49', shelf: 'Sponsored row', action: { kind: 'lock' } });
    await app.store.getState().openEdition('Week 49'); // a fresh read of the edition; this window never opened that shelf
    app.render();
    fireEvent.click(await screen.findByRole('button', { name: 'Publish edition' }));
    const dialog = await screen.findByRole('alertdialog');
    expect(within(dialog).queryByRole('list', { name: 'Shelves never opened' })).toBeNull();
    expect(within(dialog).getByText('Every shelf has been opened.')).toBeTruthy();
  });
});

describe('a locked shelf', () => {
  it('says plainly that its list stays as it is and how to change it', async () => {
    await openRowInEditor(app.store, '2026-12-07', 4);
    app.render();
    await screen.findByRole('heading', { name: /Row/ });
    expect(screen.queryByText(/This shelf is locked/)).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Lock shelf' }));
    const note = await screen.findByText(/^This shelf is locked/);
    expect(note.textContent).toBe('This shelf is locked: its list stays exactly as it is, and nothing can pin, ban, move or refill it. Unlock the shelf to change it.');
    expect((screen.getByRole('button', { name: 'Refill' }) as HTMLButtonElement).disabled).toBe(true);
  });
});

describe('history', () => {
  it('names each changed item by its title and its id', async () => {
    await openRowInEditor(app.store, '2026-12-07', 4);
    await app.store.getState().publish();
    await app.store.getState().newEdition('Week 50', '2026-12-14', 'Week 49');
    const first = app.store.getState().curation.edition?.shelves[0]?.slots[0]?.item as string;
    app.store.getState().openShelf('Row');
    expect(await app.store.getState().act({ kind: 'ban', item: first, scope: 'shelf' })).toBe(true);
    await app.store.getState().publish();
    app.store.getState().go('history');
    app.render();
    fireEvent.change(await screen.findByLabelText('Earlier edition'), { target: { value: 'Week 49' } });
    fireEvent.change(screen.getByLabelText('Later edition'), { target: { value: 'Week 50' } });
    fireEvent.click(screen.getByRole('button', { name: 'Compare' }));
    const row = await screen.findByRole('row', { name: /^Row/ });
    const title = TITLES[Number(first.slice(2)) - 1];
    await waitFor(() => expect(within(row).getAllByRole('cell')[2]?.textContent).toContain(`${title} (${first})`));
    expect(row.textContent).not.toContain('({id})');
  });
});
