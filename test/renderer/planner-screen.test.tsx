// @vitest-environment happy-dom
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { planHeading } from '../../src-renderer/screens/Planner.tsx';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

const app = seededApp();

/** The items of one week's column in a shelf's calendar, top slot first. */
function column(table: HTMLElement, week: number): string[] {
  return within(table)
    .getAllByRole('row')
    .slice(1)
    .map((r) => (r.querySelectorAll('td')[week - 1] as HTMLElement).dataset['item'] ?? '(empty)');
}

describe('the planner screen', () => {
  it('plans a shelf over the weeks, pins, locks, re-solves and makes a draft of a week', async () => {
    await openRowInEditor(app.store, '2026-11-30', 3);
    app.render();
    fireEvent.click(screen.getByRole('button', { name: 'Planner' }));
    const form = screen.getByRole('form', { name: 'Plan the weeks ahead' });
    fireEvent.change(within(form).getByLabelText('Shelf'), { target: { value: 'Row' } });
    fireEvent.change(within(form).getByLabelText('First week'), { target: { value: '2026-12-07' } });
    fireEvent.change(within(form).getByLabelText('Weeks'), { target: { value: '3' } });
    fireEvent.change(within(form).getByLabelText('Plan name'), { target: { value: 'winter' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Plan' }));
    // While it solves the page says so, and the button cannot start a second solve.
    expect(screen.getByRole('status').textContent).toMatch(/^Solving…/);
    expect((within(form).getByRole('button', { name: 'Solving…' }) as HTMLButtonElement).disabled).toBe(true);
    const table = await screen.findByRole('table', { name: 'Plan for Row' });
    expect(within(table).getAllByRole('columnheader').map((h) => h.textContent?.replace('Lock', '').trim())).toEqual(['Slot', 'Week 1 2026-12-07', 'Week 2 2026-12-14', 'Week 3 2026-12-21']);
    const week1 = column(table, 1);
    expect(week1).not.toContain('(empty)');
    // 12 items, 3 weeks of 3: no item twice in a week.
    for (const w of [1, 2, 3]) expect(new Set(column(table, w)).size).toBe(3);

    fireEvent.click(within(table).getByRole('button', { name: 'Lock week 1 of Row' }));
    await waitFor(() => expect(screen.getByRole('table', { name: 'Plan for Row' }).textContent).toContain('(locked)'));
    expect(screen.getByRole('status').textContent).toMatch(/^Locked week 1 of Row and re-solved: \d+ placements? changed\.$/);
    // Banning an item of the locked week: the lock wins, and the message says so.
    fireEvent.click(screen.getByRole('button', { name: new RegExp(`^Ban .+ \\(${week1[0]}\\) from the plan$`) }));
    await waitFor(() => expect(screen.getByRole('status').textContent).toMatch(new RegExp(`^Banned ${week1[0]} from the plan and re-solved: .* It stays in locked week 1 of Row: a locked week keeps its items\\.$`)));
    expect(column(screen.getByRole('table', { name: 'Plan for Row' }), 1)).toEqual(week1);
    expect(column(screen.getByRole('table', { name: 'Plan for Row' }), 2)).not.toContain(week1[0]);
    const item = column(screen.getByRole('table', { name: 'Plan for Row' }), 2)[0]!;
    fireEvent.click(screen.getByRole('button', { name: new RegExp(`^Pin .+ \\(${item}\\) to week 2$`) }));
    await waitFor(() => expect(screen.getByRole('table', { name: 'Plan for Row' }).textContent).toContain('(pinned)'));
    fireEvent.click(screen.getByRole('button', { name: 'Re-solve' }));
    await waitFor(() => expect(screen.getByRole('status').textContent).toMatch(/^Re-solved: \d+ placements? changed\.$/));
    const after = screen.getByRole('table', { name: 'Plan for Row' });
    expect(column(after, 1)).toEqual(week1);
    expect(column(after, 2)).toContain(item);

    fireEvent.click(screen.getByRole('button', { name: 'Make draft of week 2' }));
    await waitFor(() => expect(screen.getByRole('status').textContent).toBe('Draft edition “winter · week 2” made from week 2.'));
    const slots = app.h.ctx.db
      .prepare("SELECT i.external_id FROM slot s JOIN shelf h ON h.id = s.shelf_id JOIN edition e ON e.id = h.edition_id JOIN item i ON i.id = s.item_id WHERE e.label = 'winter · week 2' ORDER BY s.slot")
      .pluck()
      .all();
    expect(slots).toEqual(column(after, 2));
  });

  it('says where shelves come from when no edition is open, and the first week defaults to a Monday', () => {
    app.render();
    fireEvent.click(screen.getByRole('button', { name: 'Planner' }));
    const form = screen.getByRole('form', { name: 'Plan the weeks ahead' });
    expect(form.textContent).toContain('No edition is open.');
    const start = (within(form).getByLabelText('First week') as HTMLInputElement).value;
    // ISO 8601: the week starts on Monday; getUTCDay() of a date-only string read as UTC is 1 for a Monday.
    expect(new Date(`${start}T00:00:00Z`).getUTCDay()).toBe(1);
    expect(screen.getByText(/^No plan yet\./)).toBeTruthy();
    fireEvent.click(within(form).getByRole('button', { name: 'go to Editions' }));
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Editions');
  });

  it('shows the error in words when the shelf does not exist', async () => {
    app.render();
    fireEvent.click(screen.getByRole('button', { name: 'Planner' }));
    const form = screen.getByRole('form', { name: 'Plan the weeks ahead' });
    fireEvent.change(within(form).getByLabelText('Shelf'), { target: { value: 'Nowhere' } });
    fireEvent.change(within(form).getByLabelText('First week'), { target: { value: '2026-12-07' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Plan' }));
    expect((await screen.findByRole('alert')).textContent).toContain("no edition has a shelf labelled 'Nowhere'");
  });

  it('heads a plan with its name, and says what it plans only once when the name already says it', () => {
    expect(planHeading({ name: 'Winter rotation', shelves: ['Homepage row'], start: '2026-12-07' })).toBe('Winter rotation: Homepage row from 2026-12-07');
    // A plan named by no one is called after its shelves (services/planning/service.ts): said once, not twice.
    expect(planHeading({ name: 'Homepage row from 2026-12-07', shelves: ['Homepage row'], start: '2026-12-07' })).toBe('Homepage row from 2026-12-07');
    expect(planHeading({ name: 'Row + Block from 2026-12-07', shelves: ['Row', 'Block'], start: '2026-12-07' })).toBe('Row, Block from 2026-12-07');
  });
});
