// @vitest-environment happy-dom
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { audienceOf, draftOf, type Audience } from '../../src-renderer/components/AudienceField.tsx';
import { dateWords, rankWords } from '../../src-renderer/components/format.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

describe('audience choice', () => {
  it('round-trips each kind and names what is missing', () => {
    const kinds: Audience[] = [{ kind: 'everyone' }, { kind: 'rule', category: 'home', signalKinds: ['purchase'], withinDays: 30 }, { kind: 'group', group: 2 }, { kind: 'group', group: 1, name: 'Lantern people' }];
    for (const a of kinds) {
      expect(audienceOf(draftOf(a))).toEqual(a);
    }
    expect(audienceOf({ kind: 'rule', category: ' ', withinDays: '30', group: '' })).toBe('Name the category the audience bought in.');
    expect(audienceOf({ kind: 'rule', category: 'home', withinDays: '0', group: '' })).toBe('Give the number of days as a number above 0.');
    expect(audienceOf({ kind: 'group', category: '', withinDays: '90', group: '' })).toBe('Choose a taste group.');
  });
});

const app = seededApp();


describe('forget a customer', () => {
  it('asks for confirmation, erases, and shows the new count; an unknown id is refused where it was typed', async () => {
    app.render();
    const form = await screen.findByRole('form', { name: 'Forget a customer' });
    expect(form.textContent).toContain('stays on this machine');
    expect(form.textContent).toContain('follow your local law and your data-protection adviser');
    fireEvent.change(within(form).getByLabelText('Customer id'), { target: { value: 'c-2' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Forget this customer…' }));
    // Nothing is erased before the second step.
    expect(app.h.ctx.db.prepare('SELECT COUNT(*) AS n FROM customer').get()).toEqual({ n: 6 });
    fireEvent.click(within(form).getByRole('button', { name: 'Yes, erase c-2' }));
    // The seed gives customer k the signals k-1, k+5, ... of 30: five each.
    await waitFor(() => expect(within(form).getByRole('status').textContent).toContain('Customer c-2 erased: 5 signals removed'));
    const counts = screen.getByLabelText('What this workspace holds');
    await waitFor(() => expect(within(counts).getAllByRole('definition').map((d) => d.textContent)).toEqual(['12', '5', '25']));

    fireEvent.change(within(form).getByLabelText('Customer id'), { target: { value: 'c-404' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Forget this customer…' }));
    fireEvent.click(within(form).getByRole('button', { name: 'Yes, erase c-404' }));
    const alert = await within(form).findByRole('alert');
    expect(alert.textContent).toMatch(/^Could not forget that customer: .*c-404/);
    expect(app.h.ctx.db.prepare('SELECT COUNT(*) AS n FROM customer').get()).toEqual({ n: 5 });
  });
});

describe('anchors in the shelf editor', () => {
  it('searches, adds and removes anchors, then ranks the pool towards them on the "top N%" scale', async () => {
    await openRowInEditor(app.store, '2026-12-07', 4);
    app.render();
    const panel = await screen.findByRole('region', { name: 'Anchors: rank towards items like these' });
    fireEvent.change(within(panel).getByLabelText('Find items by title or id'), { target: { value: 'Quiet' } });
    fireEvent.click(within(panel).getByRole('button', { name: 'Search' }));
    const results = await within(panel).findByRole('list', { name: 'Search results' });
    expect(within(results).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Quiet Gardens (i-2) SponsoredAdd']);
    fireEvent.click(within(results).getByRole('button', { name: 'Add Quiet Gardens as an anchor' }));
    expect(within(panel).getByRole('list', { name: 'Chosen anchors' }).textContent).toContain('Quiet Gardens');
    fireEvent.click(within(panel).getByRole('button', { name: 'Remove anchor Quiet Gardens' }));
    expect(within(panel).getByText('No anchors chosen.')).toBeTruthy();
    fireEvent.click(within(results).getByRole('button', { name: 'Add Quiet Gardens as an anchor' }));
    fireEvent.click(within(panel).getByRole('button', { name: 'Rank the pool towards these anchors' }));
    const ranked = await within(panel).findByRole('list', { name: 'Proposals ranked towards the anchors' });
    const rows = within(ranked).getAllByRole('listitem');
    expect(rows.length).toBeGreaterThan(0);
    // Each proposal says its place in the pool ("3 of 12 in the pool"), the scale the slots use.
    const proposal = app.store.getState().insight.proposal!;
    rows.forEach((r, q) => expect(r.textContent).toContain(rankWords(proposal.items[q]!.rank, proposal.poolSize)));
    // Saving puts the anchors in the shelf's brief, named by the shop's ids, and refills the shelf.
    fireEvent.click(within(panel).getByRole('button', { name: 'Fill the shelf from these anchors' }));
    await waitFor(() => expect(app.store.getState().curation.edition?.shelves.find((x) => x.label === 'Row')?.brief.anchors).toEqual(['i-2']));
    const stored = await app.h.client.call('shelf.show', { edition: 'Week 49', shelf: 'Row' });
    expect(stored.brief.anchors).toEqual(['i-2']);
  });
});

describe('backtest and similar items in the shelf editor', () => {
  it('shows the shares with their window for this shelf only, and explains neighbours in words', async () => {
    await app.store.getState().newEdition('Week 49', '2026-12-07');
    await app.store.getState().addShelf('Row', { size: 4 });
    await app.store.getState().addShelf('Other', { size: 4 });
    app.store.getState().openShelf('Row');
    app.store.getState().go('shelf');
    app.render();
    const backtest = await screen.findByRole('region', { name: 'Backtest' });
    fireEvent.change(within(backtest).getByLabelText('Window (last days of the data)'), { target: { value: '14' } });
    fireEvent.click(within(backtest).getByRole('button', { name: 'Run backtest' }));
    // It says what it measures before any figure, without a pointer.
    expect(within(backtest).getByText(/^What it measures: of this shelf’s audience who were active in the last 14 days/)).toBeTruthy();
    const result = await within(backtest).findByLabelText('Backtest result');
    const api = await app.h.client.call('shelf.backtest', { edition: 'Week 49', shelf: 'Row', windowDays: 14 });
    // Dates on screen in the editor's locale, through the one formatter (format.ts dateWords).
    expect(result.textContent).toContain(`${dateWords(api.windowStart)} to ${dateWords(api.windowEnd)} (14 days)`);
    // Share = engaged / active audience, shown as a percentage with one decimal.
    expect(within(result).getByLabelText(/^This shelf: /).textContent).toBe(`${((api.shelf.engaged / api.audienceActive) * 100).toFixed(1)}%`);
    expect(within(result).getByLabelText(/^Popularity only: /).textContent).toBe(`${((api.popularity.engaged / api.audienceActive) * 100).toFixed(1)}%`);
    app.store.getState().openShelf('Other');
    await waitFor(() => expect(screen.queryByLabelText('Backtest result')).toBeNull());

    const similar = screen.getByRole('region', { name: 'Similar items' });
    fireEvent.click(within(similar).getByRole('button', { name: 'Show similar items' }));
    const list = await within(similar).findByRole('list', { name: /^Items like / });
    const first = await app.h.client.call('item.similar', { item: app.store.getState().curation.edition!.shelves[1]!.slots[0]!.item!, n: 8 });
    const rows = within(list).getAllByRole('listitem');
    expect(rows).toHaveLength(first.neighbours.length);
    first.neighbours.forEach((n, i) => {
      const text = rows[i]!.textContent ?? '';
      expect(text).toContain(n.mainReason === 'content' ? 'Mostly alike in content' : 'Mostly bought by the same customers');
      expect(text.includes('Sponsored')).toBe(n.promoted);
    });
  });
});
