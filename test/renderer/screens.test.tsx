// @vitest-environment happy-dom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Client } from '../../src-renderer/client/client.ts';
import { createAppStore } from '../../src-renderer/state/store.ts';
import { seededApp } from './app-harness.tsx';
import { openRowInEditor } from './seed.ts';

const app = seededApp();


describe('overview screen', () => {
  it('shows the counts of the open workspace', async () => {
    app.render();
    const counts = await screen.findByLabelText('What this workspace holds');
    await waitFor(() => expect(within(counts).getAllByRole('definition').map((d) => d.textContent)).toEqual(['12', '6', '30']));
  });

  it('names the workspace by its file name, with the full path on hover and under "Where it is"', async () => {
    app.render();
    const name = await screen.findByRole('heading', { name: 'Workspace w.sqlite' });
    expect(name.getAttribute('title')).toBe(app.h.file);
    const where = screen.getByText('Where it is').closest('details')!;
    expect(where.open).toBe(false);
    expect(where.querySelector('code')?.textContent).toBe(app.h.file);
    // The sidebar names the same file the same way.
    expect(screen.getByRole('navigation', { name: 'Screens' }).querySelector('.sidebar-file')?.textContent).toBe('w.sqlite');
  });

  it('shows the error beside the open form when the file does not exist', async () => {
    app.render();
    await screen.findByText(app.h.file);
    fireEvent.change(screen.getByLabelText('Workspace file (path on this computer)'), { target: { value: `${app.h.dir}/gone.sqlite` } });
    fireEvent.click(screen.getByRole('button', { name: 'Open' }));
    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toBe(`Could not open that file: no workspace at ${app.h.dir}/gone.sqlite`);
    expect(screen.getByLabelText('Workspace file (path on this computer)').getAttribute('aria-invalid')).toBe('true');
  });
});

describe('in a shell that takes no paths (the web shell)', () => {
  it('offers no path field anywhere: uploads only, and another workspace is chosen at launch', async () => {
    const { createClient } = await import('../../src-renderer/client/client.ts');
    const { invoke, createHandlerTable } = await import('../../src-main/api/handler-table.ts');
    const table = createHandlerTable(app.h.ctx);
    app.store = createAppStore(createClient((m, p) => invoke(table, m, p, { serverPaths: 'refuse' })));
    app.render();
    await screen.findByText(app.h.file);
    expect(screen.getByRole('heading', { name: 'Another workspace' })).toBeTruthy();
    expect(screen.queryByLabelText('Workspace file (path on this computer)')).toBeNull();
    app.store.getState().go('import');
    expect(await screen.findByLabelText('Upload a file (CSV, JSON, JSON Lines)')).toBeTruthy();
    expect(screen.queryByLabelText('Path on this computer')).toBeNull();
  });
});

describe('shelf editor', () => {
  it('labels sponsored items in words and pins an item from its slot', async () => {
    await openRowInEditor(app.store, '2026-12-07', 12);
    app.render();
    const slots = await screen.findByRole('list', { name: 'Slots' });
    // Two of the twelve invented items are promoted; a 12-slot shelf holds the whole catalogue.
    expect(within(slots).getAllByText('Sponsored')).toHaveLength(2);
    const second = within(slots).getByRole('listitem', { name: /^Slot 2:/ });
    fireEvent.click(within(second).getByRole('button', { name: 'Pin' }));
    await waitFor(() => expect(within(second).getByText('Pinned')).toBeTruthy());
    expect(within(second).getByRole('button', { name: 'Unpin' })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Undo' }).hasAttribute('disabled')).toBe(false);
    expect(screen.getByText(/^Pinned .* to slot 2$/, { selector: '.history li' })).toBeTruthy();
  });

  it('marks and says what an action changed: a pin to slot 1 shifts the items above it down by one', async () => {
    await openRowInEditor(app.store, '2026-12-07', 12);
    app.render();
    const slots = await screen.findByRole('list', { name: 'Slots' });
    const before = app.store.getState().curation.edition!.shelves[0]!.slots.map((x) => x.title);
    const fifth = app.store.getState().curation.edition!.shelves[0]!.slots[4]!;
    await app.store.getState().act({ kind: 'pin', slot: 1, item: fifth.item! });
    const first = await within(slots).findByRole('listitem', { name: new RegExp(`^Slot 1: ${fifth.title}$`) });
    expect(within(first).getByText('Was slot 5')).toBeTruthy();
    expect(within(within(slots).getByRole('listitem', { name: /^Slot 2:/ })).getByText('Was slot 1')).toBeTruthy();
    // Slots 6 to 12 kept their items and carry no mark.
    expect(within(within(slots).getByRole('listitem', { name: /^Slot 6:/ })).queryByText(/^Was slot|^New here/)).toBeNull();
    const said = screen.getByText(/^Moved /, { selector: '.changes-line' });
    expect(said.textContent).toContain(`${fifth.title}, slot 5 → 1`);
    expect(said.textContent).toContain(`${before[0]}, slot 1 → 2`);
    expect(said.getAttribute('aria-live')).toBe('polite');
  });

  it('lists a banned item with a button that lifts the ban, and Ctrl+Z / Ctrl+Shift+Z undo and redo', async () => {
    await openRowInEditor(app.store, '2026-12-07', 6);
    app.render();
    const slots = await screen.findByRole('list', { name: 'Slots' });
    const third = within(slots).getByRole('listitem', { name: /^Slot 3:/ });
    const title = app.store.getState().curation.edition!.shelves[0]!.slots[2]!.title!;
    fireEvent.click(within(third).getByRole('button', { name: 'Ban' }));
    const lift = await screen.findByRole('button', { name: `Lift the ban on ${title}` });
    fireEvent.keyDown(window, { key: 'z', ctrlKey: true });
    await waitFor(() => expect(screen.queryByRole('button', { name: `Lift the ban on ${title}` })).toBeNull());
    fireEvent.keyDown(window, { key: 'Z', ctrlKey: true, shiftKey: true });
    fireEvent.click(await screen.findByRole('button', { name: `Lift the ban on ${title}` }));
    await waitFor(() => expect(screen.getByText(`Lifted the ban on ${title}`, { selector: '.history li' })).toBeTruthy());
    expect(lift.isConnected).toBe(false);
  });

  it('says why items are missing from the pool: here, added after a back-dated edition', async () => {
    // The seed adds item k (0-based) on 1 October 2026 + k days: on 5 October, seven of twelve are still to come.
    await openRowInEditor(app.store, '2026-10-05', 4, 'Early');
    app.render();
    expect(await screen.findByText(/Left out of the pool: 7 added after the edition date$/)).toBeTruthy();
  });
});

describe('import screen', () => {
  it('does not read a big file into the page; where the shell cannot stream it, asks for its path', async () => {
    app.store.getState().go('import');
    app.render();
    const input = await screen.findByLabelText('…or upload a file (CSV, JSON, JSON Lines)');
    const big = new File(['customer,item,kind\n'], 'clicks.csv', { type: 'text/csv' });
    Object.defineProperty(big, 'size', { value: 42 * 1024 * 1024 }); // a 1M-row signal file is about this size
    let read = false;
    big.text = async () => {
      read = true;
      return '';
    };
    fireEvent.change(input, { target: { files: [big] } });
    expect((await screen.findByRole('alert')).textContent).toMatch(/^clicks\.csv is 42 MB: files over 24 MB are not sent through the window here\. Type its path/);
    expect(read).toBe(false);
    expect(screen.getByRole('button', { name: 'Preview' }).hasAttribute('disabled')).toBe(true);
  });

  it('asks the kind of every row for a signal file without a kind column, and imports it so', async () => {
    // Issue 10 item 7: a shop's export of purchases (customer, item, count) has no kind column.
    app.store.getState().go('import');
    app.render();
    fireEvent.change(await screen.findByLabelText('What the file holds'), { target: { value: 'signals' } });
    const plays = new File(['customer,item,count\nc-1,i-2,3\nc-2,i-3,1\n'], 'plays.csv', { type: 'text/csv' });
    fireEvent.change(screen.getByLabelText('…or upload a file (CSV, JSON, JSON Lines)'), { target: { files: [plays] } });
    const preview = screen.getByRole('button', { name: 'Preview' });
    await waitFor(() => expect(preview.hasAttribute('disabled')).toBe(false));
    fireEvent.click(preview);
    const every = await screen.findByLabelText('The file has no kind column: every row is a…');
    const run = within(screen.getByRole('region', { name: 'Preview' })).getByRole('button', { name: 'Import' });
    expect(run.hasAttribute('disabled')).toBe(true);
    fireEvent.change(every, { target: { value: 'purchase' } });
    // Looked at again with the kind: the missing-column problem is gone.
    await waitFor(() => expect(screen.queryByRole('list', { name: 'Problems found in the preview' })).toBeNull());
    await waitFor(() => expect(run.hasAttribute('disabled')).toBe(false));
    fireEvent.click(run);
    const report = await screen.findByRole('region', { name: 'Import report' });
    await waitFor(() => expect(report.textContent).toMatch(/2 rows read · 2 added/));
    const kinds = app.h.ctx.db.prepare('SELECT k.name AS kind, count(*) AS n FROM signal s JOIN signal_kind k ON k.code = s.kind GROUP BY k.name ORDER BY k.name').all();
    expect(kinds).toEqual([{ kind: 'purchase', n: 12 }, { kind: 'view', n: 20 }]); // the seed holds 10 purchases and 20 views
  });

  it('shows the warning about signals dated after today beside the counts', async () => {
    app.store.getState().go('import');
    app.render();
    fireEvent.change(await screen.findByLabelText('What the file holds'), { target: { value: 'signals' } });
    const late = new File(['customer,item,kind,at\nc-1,i-2,view,2999-01-01T00:00:00Z\n'], 'late.csv', { type: 'text/csv' });
    fireEvent.change(screen.getByLabelText('…or upload a file (CSV, JSON, JSON Lines)'), { target: { files: [late] } });
    const preview = screen.getByRole('button', { name: 'Preview' });
    await waitFor(() => expect(preview.hasAttribute('disabled')).toBe(false));
    fireEvent.click(preview);
    fireEvent.click(within(await screen.findByRole('region', { name: 'Preview' })).getByRole('button', { name: 'Import' }));
    const report = await screen.findByRole('region', { name: 'Import report' });
    await waitFor(() => expect(report.textContent).toContain('Warning: 1 signal is dated after today (the latest 2999-01-01)'));
  });

  it('does not ask for a kind when the signal file has a kind column', async () => {
    app.store.getState().go('import');
    app.render();
    fireEvent.change(await screen.findByLabelText('What the file holds'), { target: { value: 'signals' } });
    const clicks = new File(['customer,item,kind\nc-1,i-2,view\n'], 'clicks.csv', { type: 'text/csv' });
    fireEvent.change(screen.getByLabelText('…or upload a file (CSV, JSON, JSON Lines)'), { target: { files: [clicks] } });
    const preview = screen.getByRole('button', { name: 'Preview' });
    await waitFor(() => expect(preview.hasAttribute('disabled')).toBe(false));
    fireEvent.click(preview);
    const region = await screen.findByRole('region', { name: 'Preview' });
    expect(screen.queryByLabelText('The file has no kind column: every row is a…')).toBeNull();
    expect(within(region).getByRole('button', { name: 'Import' }).hasAttribute('disabled')).toBe(false);
  });

  it('streams a big file ahead where the shell can, and previews it by the id it got back', async () => {
    const sent: File[] = [];
    const requests: [string, unknown][] = [];
    const upload = 'ab'.repeat(16);
    // The page's side only: the main side's upload and its import by id have their own tests (test/shell).
    const client: Client = {
      serverPaths: false, // the web shell: the one with an upload route
      async call(method, payload) {
        requests.push([method, payload]);
        if (method === 'import.preview' && (payload as { upload?: string }).upload === upload) {
          return app.h.client.call('import.preview', { fileName: 'clicks.csv', content: 'customer,item,kind\nc-1,i-1,view\n', target: 'signals' }) as never;
        }
        return app.h.client.call(method, payload);
      },
      upload: async (file) => {
        sent.push(file);
        return { upload, bytes: file.size };
      },
    };
    cleanup();
    app.store = createAppStore(client);
    app.store.getState().go('import');
    app.render();
    const big = new File(['customer,item,kind\n'], 'clicks.csv', { type: 'text/csv' });
    Object.defineProperty(big, 'size', { value: 42 * 1024 * 1024 });
    big.text = async () => {
      throw new Error('a big file must not be read into the page');
    };
    fireEvent.change(await screen.findByLabelText('Upload a file (CSV, JSON, JSON Lines)'), { target: { files: [big] } });
    await waitFor(() => expect(sent).toEqual([big]));
    const preview = screen.getByRole('button', { name: 'Preview' });
    await waitFor(() => expect(preview.hasAttribute('disabled')).toBe(false));
    fireEvent.click(preview);
    expect(await screen.findByRole('region', { name: 'Preview' })).toBeTruthy();
    expect(requests.find(([m]) => m === 'import.preview')?.[1]).toMatchObject({ upload, target: 'items' });
  });
});

