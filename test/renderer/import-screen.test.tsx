// @vitest-environment happy-dom
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { FIELDS, REQUIRED } from '../../src-main/ingest/fields.ts';
import { EXPECTED_COLUMNS } from '../../src-renderer/components/import-columns.ts';
import { seededApp } from './app-harness.tsx';

const app = seededApp();

describe('import screen', () => {
  it('lists the columns each kind of file should have, the same fields and required ones the import reads', async () => {
    for (const target of ['items', 'customers', 'signals'] as const) {
      expect(EXPECTED_COLUMNS[target].map((c) => c.field)).toEqual([...FIELDS[target]]);
      expect(EXPECTED_COLUMNS[target].filter((c) => c.required).map((c) => c.field)).toEqual([...REQUIRED[target]]);
    }
    app.store.getState().go('import');
    app.render();
    const form = await screen.findByRole('form', { name: '1. Choose a file' });
    const table = within(form).getByRole('table', { name: /^Columns this file should have/ });
    expect(within(table).getAllByRole('rowheader').map((h) => h.textContent)).toEqual([...FIELDS.items]);
    fireEvent.change(screen.getByLabelText('What the file holds'), { target: { value: 'signals' } });
    const rows = within(within(form).getByRole('table', { name: /^Columns this file should have/ })).getAllByRole('row').slice(1);
    expect(rows.map((r) => [...r.children].slice(0, 2).map((c) => c.textContent))).toEqual([
      ['customer', 'required'],
      ['item', 'required'],
      ['kind', 'required'],
      ['value', 'optional'],
      ['at', 'optional'],
    ]);
  });

  it('marks the cell an import rejected, in words, in the rows of the file shown', async () => {
    app.store.getState().go('import');
    app.render();
    // Line 3 (the second data row) has a negative price; the quoted title on line 2 spans two lines, so rows
    // and lines do not line up one to one and the cell is found by the line the import reports.
    const file = new File(['id,title,price\nn-1,"Two\nlines",4\nn-2,Plain,-3\n'], 'items.csv', { type: 'text/csv' });
    fireEvent.change(await screen.findByLabelText('…or upload a file (CSV, JSON, JSON Lines)'), { target: { files: [file] } });
    const previewButton = screen.getByRole('button', { name: 'Preview' });
    await waitFor(() => expect(previewButton.hasAttribute('disabled')).toBe(false));
    fireEvent.click(previewButton);
    const preview = await screen.findByRole('region', { name: 'Preview' });
    fireEvent.click(within(preview).getByRole('button', { name: 'Import' }));
    const report = await screen.findByRole('region', { name: 'Import report' });
    await waitFor(() => expect(within(report).getByRole('heading').textContent).toBe('Nothing was imported'));
    const problem = app.store.getState().importer.report!.errors[0]!;
    expect(problem).toMatchObject({ line: 4, column: 3 });
    // The report names the column by its header too.
    expect(within(report).getByText('3 (price)')).toBeTruthy();
    const sample = within(preview).getByRole('table', { name: 'First rows of the file' });
    const marked = sample.querySelectorAll('td[aria-invalid="true"]');
    expect(marked).toHaveLength(1);
    expect(marked[0]!.textContent).toBe(`-3 (rejected: ${problem.reason})`);
    // It is the price cell of the second data row.
    const second = within(sample).getAllByRole('row')[2]!;
    expect(second.children[2]).toBe(marked[0]);
  });
});

describe('after an import that changed the data', () => {
  it('offers to retrain, and the offer starts the training and opens the models screen', async () => {
    app.store.getState().go('import');
    app.render();
    const file = new File(['id,title,category\nnew-1,Willow basket,garden\n'], 'items.csv', { type: 'text/csv' });
    fireEvent.change(await screen.findByLabelText('…or upload a file (CSV, JSON, JSON Lines)'), { target: { files: [file] } });
    const previewButton = screen.getByRole('button', { name: 'Preview' });
    await waitFor(() => expect(previewButton.hasAttribute('disabled')).toBe(false));
    fireEvent.click(previewButton);
    const preview = await screen.findByRole('region', { name: 'Preview' });
    fireEvent.click(within(preview).getByRole('button', { name: 'Import' }));
    const report = await screen.findByRole('region', { name: 'Import report' });
    await waitFor(() => expect(within(report).getByRole('heading').textContent).toBe('Imported'));
    const offer = within(report).getByTestId('retrain-offer');
    fireEvent.click(within(offer).getByRole('button', { name: /^(Re)?[tT]rain the models now$/ }));
    await waitFor(() => expect(app.store.getState().nav.screen).toBe('models'));
    await waitFor(() => expect(app.store.getState().models.job).not.toBeNull());
    // Let the training end before the workspace closes.
    await waitFor(() => expect(app.store.getState().models.job?.state).not.toBe('running'), { timeout: 120_000 });
  }, 150_000);
});
