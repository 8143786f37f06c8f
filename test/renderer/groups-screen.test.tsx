// @vitest-environment happy-dom
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { IalsModel } from '../../src-main/core/models/ials.ts';
import { IALS_DEFAULTS } from '../../src-main/core/models/ials-params.ts';
import { dataFingerprint } from '../../src-main/store/models.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

const app = seededApp();

/** Planted iALS factors: customers 1, 3, 5 along one axis and 2, 4, 6 along another (two tastes). */
function plantTwoTastes(): void {
  const k = 3;
  const x = new Float32Array(6 * k);
  for (let u = 0; u < 6; u++) x[u * k + (u % 2)] = 0.5 + u * 0.1;
  const y = new Float32Array(12 * k).map((_, i) => ((i % k) === ((i / k) | 0) % 2 ? 1 : 0));
  const m = new IalsModel({ ...IALS_DEFAULTS, factors: k }, x, y);
  // The seed's customers have two distinct items each: let one item be enough history here.
  app.h.ctx.db.prepare('INSERT INTO taste_group_settings (id, min_k, max_k, min_history) VALUES (1, 2, 12, 1)').run();
  app.h.ctx.db.prepare("INSERT INTO model (kind, fingerprint, trained_at, train_ms, bytes) VALUES ('ials', ?, 1, 1, ?)").run(dataFingerprint(app.h.ctx.db), Buffer.from(m.serialize()));
}


describe('the taste groups screen', () => {
  it('says to train first when there is no model', async () => {
    app.render();
    fireEvent.click(screen.getByRole('button', { name: 'Taste groups' }));
    expect((await screen.findByRole('alert')).textContent).toContain('train the models first');
  });

  it('charts the group sizes, names a group, and aims the open shelf at it', async () => {
    plantTwoTastes();
    await openRowInEditor(app.store, '2026-11-30', 3);
    app.render();
    fireEvent.click(screen.getByRole('button', { name: 'Taste groups' }));
    const chart = await screen.findByRole('list', { name: 'Customers per group' });
    expect(within(chart).getByLabelText('Group 0: 3 customers')).toBeTruthy();
    expect(within(chart).getByLabelText('Group 1: 3 customers')).toBeTruthy();
    expect(within(chart).getByLabelText('Not enough history yet: 0 customers')).toBeTruthy();
    const card = screen.getByRole('article', { name: /Group 0/ });
    fireEvent.change(within(card).getByLabelText('Name'), { target: { value: 'Odd ones' } });
    fireEvent.click(within(card).getByRole('button', { name: 'Save name' }));
    await waitFor(() => expect(within(screen.getByRole('list', { name: 'Customers per group' })).getByLabelText('Odd ones: 3 customers')).toBeTruthy());
    expect(app.h.ctx.db.prepare('SELECT name FROM taste_group_name').pluck().all()).toEqual(['Odd ones']);
    const named = screen.getByRole('article', { name: /Odd ones/ });
    fireEvent.click(within(named).getByRole('button', { name: 'Aim shelf “Row” here' }));
    await waitFor(() => expect(within(named).getByRole('status').textContent).toContain('now reaches this group’s 3 customers'));
    const brief = app.store.getState().curation.edition!.shelves.find((s) => s.label === 'Row')!.brief;
    // A named group is aimed at by its name, which follows it across retrainings; the number is as of now.
    expect(brief.audience).toEqual({ kind: 'group', group: 0, name: 'Odd ones' });
  });

  it('refuses a range with fewer groups at most than at least, and keeps the saved one', async () => {
    plantTwoTastes();
    app.render();
    fireEvent.click(screen.getByRole('button', { name: 'Taste groups' }));
    const form = await screen.findByRole('form', { name: 'How groups are found' });
    fireEvent.change(within(form).getByLabelText('Fewest groups'), { target: { value: '3' } });
    fireEvent.change(within(form).getByLabelText('Most groups'), { target: { value: '2' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Find groups again' }));
    await waitFor(() => expect(screen.getByRole('alert').textContent).toContain('largest number of groups must be a whole number >= the smallest (3), got 2'));
    expect(app.h.ctx.db.prepare('SELECT min_k, max_k, min_history FROM taste_group_settings').raw().get()).toEqual([2, 12, 1]);
  });
});
