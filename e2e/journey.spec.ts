import { createHandlerTable, invoke } from '../src-main/api/handler-table.ts';
import { journeyTest as test } from './fixtures.ts';
import { runJourney } from './journey-steps.ts';

/**
 * A new user's whole journey in the web shell on a fresh workspace: import (a broken file first), train,
 * evaluate against a file, an edition with two shelves, pin / boost / ban with the meter, anchors,
 * similar items, backtest, audience, publish, export CSV and HTML, history, forget a customer.
 */
test('a new user imports, trains, curates, publishes and exports through the screens', async ({ page, fresh }) => {
  test.setTimeout(170_000);
  const table = createHandlerTable(fresh.ctx);
  const api = async (method: string, payload: unknown) => {
    const r = await invoke(table, method, payload);
    if (!r.ok) throw new Error(`${method}: ${r.error.message}`);
    return r.value;
  };
  await page.goto(fresh.shell.pageUrl);
  await runJourney(page, { files: fresh.files, api, startedAt: fresh.startedAt, shots: 'journey' });
});
