// @vitest-environment happy-dom
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { READINGS, SHELF_READING_KEYS } from '../../src-main/core/curation/readings.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

const app = seededApp();

describe('the shelf meter at a glance', () => {
  it('draws every reading as a gauge with its value on its scale, its range and its band in words', async () => {
    await openRowInEditor(app.store, '2026-12-07', 6);
    app.render();
    const strip = await screen.findByRole('region', { name: 'Shelf meter' });
    const gauges = within(strip).getAllByRole('listitem');
    expect(gauges.map((g) => g.querySelector('.gauge-name')?.textContent)).toEqual(SHELF_READING_KEYS.map((k) => READINGS[k].name));
    const m = app.store.getState().curation.edition!.shelves[0]!.meter;
    for (const k of ['intraListDistance', 'novelty', 'calibrationGap'] as const) {
      const v = m[k]!;
      expect(v).toBeGreaterThanOrEqual(0);
      expect(v).toBeLessThanOrEqual(1);
      const g = gauges[SHELF_READING_KEYS.indexOf(k)]!;
      expect(g.querySelector('.gauge-value')?.textContent).toBe(`${v.toFixed(2)} (0–1)`);
    }
    // The default band of variety (0.40 or more): drawn short, said in full for screen readers.
    const variety = gauges[0]!;
    expect(variety.textContent).toMatch(/(on|below) target, ≥ 0\.40target 0\.40 or more$/);
    expect(variety.querySelector('svg')?.getAttribute('aria-hidden')).toBe('true');
    // Help on the page, each gauge described by it.
    const help = document.getElementById(variety.getAttribute('aria-describedby')!)!;
    expect(help.textContent).toContain(READINGS.intraListDistance.help);
    expect(help.checkVisibility?.() ?? true).toBe(true);
    // The age histogram's counts add up to the items with a date (every item here has one).
    const ages = screen.getByRole('figure', { name: 'Item age at the edition date' });
    const counts = Array.from(ages.querySelectorAll('.age-count'), (e) => Number(e.textContent));
    expect(counts.reduce((a, b) => a + b, 0)).toBe(6);
  });

  it('counts saturated slots from 1, as the slots are numbered', async () => {
    // Every customer buys 'Moss and Mortar' (i-4): it saturates the everyone audience wherever it stands.
    const db = app.h.ctx.db;
    const buy = db.prepare("INSERT INTO signal (customer_id, item_id, kind, at) VALUES (?, (SELECT id FROM item WHERE external_id = 'i-4'), (SELECT code FROM signal_kind WHERE name = 'purchase'), ?)");
    for (let c = 1; c <= 6; c++) buy.run(c, Date.UTC(2026, 10, 1) + c);
    await openRowInEditor(app.store, '2026-12-07', 12);
    app.render();
    const shelf = app.store.getState().curation.edition!.shelves[0]!;
    const at = shelf.slots.find((s) => s.item === 'i-4')!.slot;
    expect(shelf.meter.saturatedSlots).toContain(at);
    expect(Math.min(...shelf.meter.saturatedSlots)).toBeGreaterThanOrEqual(1);
    const details = await screen.findByRole('region', { name: 'Meter in detail' });
    const warn = within(details).getByText(/most of this audience already/);
    expect(warn.textContent).toMatch(new RegExp(`^Slots? (\\d+, )*${at}(, \\d+)*:`));
    expect(warn.textContent).not.toMatch(/Slots? 0\b/);
  });

  it('sets a target band in the app, keeps the list, and says in words where a what-if moves a reading', async () => {
    await openRowInEditor(app.store, '2026-12-07', 6);
    app.render();
    const before = app.store.getState().curation.edition!.shelves[0]!.slots.map((s) => s.item);
    const details = await screen.findByRole('region', { name: 'Meter in detail' });
    fireEvent.change(within(details).getByLabelText('Variety, at least'), { target: { value: '0.99' } });
    fireEvent.change(within(details).getByLabelText('Under 30 days, at most (percent)'), { target: { value: '40' } });
    fireEvent.click(within(details).getByRole('button', { name: 'Save targets' }));
    const strip = screen.getByRole('region', { name: 'Shelf meter' });
    await waitFor(() => expect(within(strip).getAllByRole('listitem')[0]!.textContent).toMatch(/below target, ≥ 0\.99/));
    const shelf = app.store.getState().curation.edition!.shelves[0]!;
    expect(shelf.brief.targets).toMatchObject({ intraListDistance: { min: 0.99 }, ageShareUnder30Days: { max: 0.4 } });
    expect(shelf.slots.map((s) => s.item)).toEqual(before);

    await app.store.getState().loadWhatIf(2);
    const cand = app.store.getState().whatif.result!.candidates.find((c) => (c.delta['intraListDistance'] ?? 0) !== 0)!;
    app.store.getState().focusCandidate(cand.item);
    const delta = await within(within(strip).getAllByRole('listitem')[0]!).findByText(/target$/, { selector: '.delta' });
    const d = cand.delta['intraListDistance']!;
    // Below a band of 0.99 or more, any rise is closer and any fall further; the colour class matches the words.
    expect(delta.textContent).toBe(`${d > 0 ? '+' : '−'}${Math.abs(d).toFixed(2)}, ${d > 0 ? 'closer to' : 'further from'} target`);
    expect(delta.className).toContain(d > 0 ? 'dir-closer' : 'dir-further');

    // Off the scale: refused in words, nothing changes.
    fireEvent.change(within(details).getByLabelText('Novelty, at most'), { target: { value: '3' } });
    fireEvent.click(within(details).getByRole('button', { name: 'Save targets' }));
    expect((await within(details).findByRole('alert')).textContent).toBe("Targets not saved: Novelty: the target's upper end must be within 0–1, got 3.00");
    expect(app.store.getState().curation.edition!.shelves[0]!.brief.targets).toEqual(shelf.brief.targets);

    // Back to the stated defaults: variety 0.40 or more again.
    fireEvent.click(within(details).getByRole('button', { name: 'Back to defaults' }));
    await waitFor(() => expect(app.store.getState().curation.edition!.shelves[0]!.brief.targets).toEqual({}));
    await waitFor(() => expect(within(strip).getAllByRole('listitem')[0]!.textContent).toMatch(/target, ≥ 0\.40target 0\.40 or more$/));
    expect((within(details).getByLabelText('Variety, at least') as HTMLInputElement).value).toBe('0.4');
  });
});
