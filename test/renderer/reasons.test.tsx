// @vitest-environment happy-dom
import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, onTestFinished } from 'vitest';
import { reasonWords } from '../../src-main/core/curation/reason-words.ts';
import { count, dateWords, momentWords, rankWords, screenNumbers } from '../../src-renderer/components/format.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

const app = seededApp();

const widthOf = (el: Element) => Number.parseFloat((el as HTMLElement).style.width);

describe('reasons in the shelf editor', () => {
  it("shows each slot's main reason in words first, then its rank in the pool, then the bars", async () => {
    await openRowInEditor(app.store, '2026-12-07', 6);
    app.render();
    const slots = await screen.findByRole('list', { name: 'Slots' });
    const shelf = app.store.getState().curation.edition!.shelves[0]!;
    for (const s of shelf.slots) {
      const row = within(slots).getByRole('listitem', { name: new RegExp(`^Slot ${s.slot}:`) });
      const reason = row.querySelector('.reason')!;
      expect(reason.textContent).toBe(s.reason ? reasonWords(s.reason, screenNumbers) : 'No part of its score has evidence to show in words.');
      const rank = within(row).getByText(new RegExp(`${rankWords(s.rank, shelf.poolSize)}$`));
      const bars = within(row).getByRole('list', { name: 'Parts of the score' });
      expect(reason.compareDocumentPosition(rank) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
      expect(rank.compareDocumentPosition(bars) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
    }
    // The invented shop's items have customers, days added and signals: most slots have a reason to give.
    expect(shelf.slots.filter((s) => s.reason !== null).length).toBeGreaterThan(0);
    // Distinct scores read as distinct ranks.
    for (const a of shelf.slots) for (const b of shelf.slots) if (a.score !== b.score) expect(a.rank).not.toBe(b.rank);
  });

  it('draws every row\'s bars on one scale: the largest part on the shelf fills its track, the others in proportion', async () => {
    await openRowInEditor(app.store, '2026-12-07', 6);
    app.render();
    const slots = await screen.findByRole('list', { name: 'Slots' });
    const shelf = app.store.getState().curation.edition!.shelves[0]!;
    const largest = Math.max(...shelf.slots.flatMap((s) => Object.values(s.contributions)));
    let full = 0;
    for (const s of shelf.slots) {
      const row = within(slots).getByRole('listitem', { name: new RegExp(`^Slot ${s.slot}:`) });
      const bars = within(row).getByRole('list', { name: 'Parts of the score' });
      for (const li of within(bars).getAllByRole('listitem')) {
        const part = li.querySelector('.bar-label')!.textContent!;
        const w = widthOf(li.querySelector('.bar-fill')!);
        expect(w).toBeCloseTo((s.contributions[part]! / largest) * 100, 6);
        if (w === 100) full++;
      }
    }
    expect(full).toBeGreaterThanOrEqual(1);
  });

  it('ranks the candidates for a slot by their place in the pool and gives their reasons', async () => {
    // happy-dom lays nothing out: give the virtualised list's scroller a height, so it renders its rows.
    const proto = HTMLElement.prototype;
    const own = { height: Object.getOwnPropertyDescriptor(proto, 'clientHeight'), width: Object.getOwnPropertyDescriptor(proto, 'clientWidth') };
    const sized = (px: number, d: PropertyDescriptor | undefined) => ({
      configurable: true,
      get(this: HTMLElement) {
        return this.classList.contains('pool-scroll') ? px : ((d?.get?.call(this) as number | undefined) ?? 0);
      },
    });
    Object.defineProperty(proto, 'clientHeight', sized(360, own.height));
    Object.defineProperty(proto, 'clientWidth', sized(400, own.width));
    onTestFinished(() => {
      if (own.height) Object.defineProperty(proto, 'clientHeight', own.height);
      else delete (proto as { clientHeight?: number }).clientHeight;
      if (own.width) Object.defineProperty(proto, 'clientWidth', own.width);
      else delete (proto as { clientWidth?: number }).clientWidth;
    });
    await openRowInEditor(app.store, '2026-12-07', 4);
    app.render();
    const list = await screen.findByRole('list', { name: 'Candidates for this slot' });
    await waitFor(() => expect(app.store.getState().whatif.result?.candidates.length ?? 0).toBeGreaterThan(0));
    const shelf = app.store.getState().curation.edition!.shelves[0]!;
    const first = app.store.getState().whatif.result!.candidates[0]!;
    const row = await within(list).findByText(first.title);
    const li = row.closest('li')!;
    expect(within(li).getByText(rankWords(first.rank, shelf.poolSize))).toBeTruthy();
    if (first.reason) expect(within(li).getByText(reasonWords(first.reason, screenNumbers))).toBeTruthy();
  });
});

describe('numbers and dates on screen', () => {
  it("groups thousands in the editor's locale (Intl.NumberFormat, ECMA-402) and says where an item stands", () => {
    const expected = new Intl.NumberFormat(undefined).format(1234567);
    expect(count(1234567)).toBe(expected);
    expect(rankWords(3, 1204)).toBe(`3 of ${new Intl.NumberFormat(undefined).format(1204)} in the pool`);
    expect(rankWords(null, 10)).toBe('not in the pool');
  });

  it('shows a calendar date in the locale, on its own day whatever the time zone, and keeps what is not a date as it came', () => {
    // ECMA-402: Intl.DateTimeFormat with timeZone 'UTC' formats the instant UTC midnight as that same day.
    const same = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'UTC' }).format(Date.UTC(2026, 11, 7));
    expect(dateWords('2026-12-07')).toBe(same);
    expect(dateWords('2026-12-07')).toContain('2026');
    expect(dateWords('next week')).toBe('next week');
    expect(dateWords(null)).toBe('—');
    expect(momentWords(Number.NaN)).toBe('—');
  });
});
