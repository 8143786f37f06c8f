import fs from 'node:fs';
import { parse } from 'csv-parse/sync';
import { expect, type Page } from '@playwright/test';
import { checkScreen, counts, nav, type JourneyOptions } from './journey-screen.ts';

/** The journey's last steps: publish and export, history, forgetting a customer. */
function checkCsv(csv: string, promoted: Set<string>): void {
  const rows = parse(csv, { relax_column_count: true }) as string[][];
  const header = rows[0]!;
  const [item, sponsored] = [header.indexOf('item'), header.indexOf('sponsored')];
  const slotRows = rows.slice(1).filter((r) => r.length === header.length);
  expect(slotRows).toHaveLength(14);
  for (const r of slotRows) expect(r[sponsored]).toBe(promoted.has(r[item]!) ? 'Sponsored' : '');
  // No cell may start a spreadsheet formula (OWASP, "CSV Injection": = + - @ tab carriage return).
  for (const r of rows) for (const c of r) expect(c).not.toMatch(/^[=+\-@\t\r]/);
}

export async function publishAndExport(page: Page, o: JourneyOptions): Promise<void> {
  await nav(page, 'Edition: Week 1');
  const shown = await o.api('edition.show', { edition: 'Week 1' });
  type Slot = { item: string | null; title: string | null; promoted: boolean };
  const all: Slot[] = shown.shelves.flatMap((s: { slots: Slot[] }) => s.slots);
  const promoted = new Set(all.filter((s) => s.promoted && s.item).map((s) => s.item as string));
  // The demo shop promotes about one item in twelve: a 14-slot edition shows some, labelled in words.
  expect(promoted.size).toBeGreaterThan(0);
  await expect(page.locator('.shelf-card .sponsored').first()).toHaveText('Sponsored');

  await page.getByRole('button', { name: 'Publish edition' }).click();
  await page.getByRole('alertdialog').getByRole('button', { name: 'Publish now' }).click();
  await expect(page.getByRole('heading', { name: /Published/ })).toBeVisible();
  for (const format of ['csv', 'html'] as const) {
    const download = page.waitForEvent('download');
    await page.getByLabel('Format').selectOption(format);
    await page.getByRole('button', { name: 'Export edition' }).click();
    const text = fs.readFileSync((await (await download).path())!, 'utf8');
    await expect(page.getByText(`Saved Week-1.${format}`, { exact: false })).toBeVisible();
    if (format === 'csv') checkCsv(text, promoted);
    else {
      expect(text.toLowerCase()).not.toContain('<script');
      for (const s of all.filter((x) => x.promoted && x.title)) {
        const at = text.indexOf(s.title!.replaceAll('&', '&amp;'));
        expect(at).toBeGreaterThan(-1);
        expect(text.slice(at, at + 400)).toContain('Sponsored');
      }
    }
  }
  await checkScreen(page, o.shots, 'board-published');
}

export async function compareHistory(page: Page, o: JourneyOptions): Promise<void> {
  await nav(page, 'Editions');
  await checkScreen(page, o.shots, 'editions');
  const next = new Date(Date.parse(`${o.files.editionDate}T00:00:00Z`) + 7 * 86_400_000).toISOString().slice(0, 10);
  await page.getByLabel('Name').fill('Week 2');
  await page.getByLabel('Date').fill(next);
  await page.getByLabel('Copy shelves and briefs from').selectOption('Week 1');
  await page.getByRole('button', { name: 'Start edition' }).click();
  await expect(page.getByRole('article', { name: 'Shelf Newsletter block' })).toBeVisible();
  await nav(page, 'History');
  await expect(page.getByText(/^Week 1 · .* · published/)).toBeVisible();
  await page.getByLabel('Earlier edition').selectOption('Week 1');
  await page.getByLabel('Later edition').selectOption('Week 2');
  await page.getByRole('button', { name: 'Compare' }).click();
  const table = page.getByRole('table').last();
  await expect(table.getByRole('row')).toHaveCount(3);
  await expect(table).toContainText('Homepage row');
  await expect(table).toContainText('Newsletter block');
  await checkScreen(page, o.shots, 'history');
}

export async function forgetCustomer(page: Page, o: JourneyOptions): Promise<void> {
  await nav(page, 'Overview');
  const customers = fs.readFileSync(o.files.customers, 'utf8').split('\n').length - 2;
  const who = fs.readFileSync(o.files.holdout, 'utf8').trimEnd().split('\n').at(-1)!.split(',')[0]!;
  const panel = page.getByRole('form', { name: 'Forget a customer' });
  await expect(panel).toContainText('stays on this machine');
  await expect(panel).toContainText('follow your local law and your data-protection adviser');
  await panel.getByLabel('Customer id').fill(who);
  await panel.getByRole('button', { name: 'Forget this customer…' }).click();
  await expect(panel.getByRole('group', { name: 'Confirm forgetting' })).toContainText(`Erase customer ${who}`);
  await panel.getByRole('button', { name: `Yes, erase ${who}` }).click();
  await expect(panel.getByRole('status')).toContainText(new RegExp(`Customer ${who} erased: [\\d,]+ signals removed`));
  await expect(counts(page).nth(1)).toHaveText((customers - 1).toLocaleString('en'));
  // An unknown id is refused where the editor typed it, and nothing is erased.
  await panel.getByLabel('Customer id').fill('zz-nobody');
  await panel.getByRole('button', { name: 'Forget this customer…' }).click();
  await panel.getByRole('button', { name: 'Yes, erase zz-nobody' }).click();
  await expect(panel.getByRole('alert')).toContainText('Could not forget that customer');
  await expect(counts(page).nth(1)).toHaveText((customers - 1).toLocaleString('en'));
  await checkScreen(page, o.shots, 'overview');
}
