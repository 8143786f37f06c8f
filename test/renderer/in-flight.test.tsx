// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createHandlerTable, invoke } from '../../src-main/api/handler-table.ts';
import { App } from '../../src-renderer/App.tsx';
import { createClient } from '../../src-renderer/client/client.ts';
import { createAppStore, StoreContext, type AppStore } from '../../src-renderer/state/store.ts';
import { openRowInEditor, seededHarness, type Harness } from './seed.ts';

/**
 * What the page does while an api call is still out (on a busy machine an answer can take seconds): the
 * real handler table behind a client that holds the answers of chosen calls until the test lets them go.
 */
let h: Harness;
let store: AppStore;
let held: { method: string; payload: unknown; release(): void }[];
let hold: (method: string, payload: unknown) => boolean;

beforeEach(() => {
  h = seededHarness();
  const table = createHandlerTable(h.ctx);
  held = [];
  hold = () => false;
  const client = createClient(
    async (m, p) => {
      // The work is done at once; only the answer is held, as when it is slow to come back.
      const answer = await invoke(table, m, p);
      if (hold(m, p)) await new Promise<void>((release) => held.push({ method: m, payload: p, release }));
      return answer;
    },
    undefined,
    { serverPaths: true },
  );
  store = createAppStore(client);
});
afterEach(() => {
  cleanup();
  h.close();
});

describe('a keyboard move while an action is in flight', () => {
  it('cannot be lifted until the action and the edition it changed are shown, then can', async () => {
    await openRowInEditor(store, '2026-12-07', 4);
    render(
      <StoreContext.Provider value={store}>
        <App />
      </StoreContext.Provider>,
    );
    const slots = await screen.findByRole('list', { name: 'Slots' });
    const row = (n: number) => within(slots).getByRole('listitem', { name: new RegExp(`^Slot ${n}:`) });
    const handle = within(row(1)).getByRole('button', { name: /^Move / });
    const title = row(1).getAttribute('aria-label')!.replace(/^Slot 1: /, '');
    expect(handle.getAttribute('aria-disabled')).toBe('false');
    // dnd-kit's live region: what a screen reader hears about a lift and move.
    const announced = () => document.querySelector('[id^=DndLiveRegion]')?.textContent ?? '';

    hold = (m) => m === 'shelf.act' || m === 'edition.show';
    fireEvent.click(within(row(2)).getByRole('button', { name: 'Pin' }));
    await waitFor(() => expect(held.map((c) => c.method)).toEqual(['shelf.act']));
    // A move names slots by position: lifted now, it would be dropped onto the order before the pin.
    expect(handle.getAttribute('aria-disabled')).toBe('true');
    fireEvent.keyDown(handle, { code: 'Space', key: ' ' });
    expect(announced()).toBe('');
    expect(handle.getAttribute('aria-pressed')).not.toBe('true');

    // The pin is shown, but the edition it changed is still being re-read: still no move.
    held.shift()!.release();
    await waitFor(() => expect(within(row(2)).getByText('Pinned')).toBeTruthy());
    await waitFor(() => expect(held.map((c) => c.method)).toEqual(['edition.show']));
    expect(handle.getAttribute('aria-disabled')).toBe('true');

    held.shift()!.release();
    await waitFor(() => expect(handle.getAttribute('aria-disabled')).toBe('false'));
    // Focus never left the handle (only the sortable was disabled, not the button), and Space now lifts.
    handle.focus();
    fireEvent.keyDown(handle, { code: 'Space', key: ' ' });
    await waitFor(() => expect(announced()).toBe(`${title} is over slot 1.`));
    expect(handle.getAttribute('aria-pressed')).toBe('true');
  });
});

describe('the candidate pool while it is ranked', () => {
  it("shows no other slot's candidates under a newly chosen slot", async () => {
    await openRowInEditor(store, '2026-12-07', 4);
    await store.getState().loadWhatIf(1);
    expect(store.getState().whatif.result?.slot).toBe(1);
    hold = (m) => m === 'shelf.whatif';
    const pending = store.getState().loadWhatIf(3);
    expect(store.getState().whatif).toMatchObject({ key: 'Week 49/Row/3', result: null, loading: true });
    await waitFor(() => expect(held).toHaveLength(1));
    held.shift()!.release();
    await pending;
    expect(store.getState().whatif.result?.slot).toBe(3);
  });

  it('keeps the latest answer when an earlier request for the same slot answers last', async () => {
    await openRowInEditor(store, '2026-12-07', 4);
    hold = (m) => m === 'shelf.whatif';
    const before = store.getState().loadWhatIf(2);
    await waitFor(() => expect(held).toHaveLength(1));
    hold = () => false;
    // Ban slot 1's item: the pool after the ban never offers it again for this shelf.
    const banned = store.getState().curation.edition!.shelves[0]!.slots[0]!.item!;
    expect(await store.getState().act({ kind: 'ban', item: banned, scope: 'shelf' })).toBe(true);
    await store.getState().loadWhatIf(2);
    const after = store.getState().whatif.result!.candidates.map((c) => c.item);
    held.shift()!.release();
    await before;
    expect(store.getState().whatif.result!.candidates.map((c) => c.item)).toEqual(after);
    expect(after).not.toContain(banned);
  });
});
