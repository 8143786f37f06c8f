/**
 * The README's pictures, from a real (demo) workspace: `npx tsx e2e/docs-screenshots.ts WORKSPACE`
 * writes docs/screenshots/overview.png, board-1280.png, shelf-editor.png, groups.png and planner.png at 1280×800, and
 * board-800.png, shelf-editor-800.png and planner-800.png (in an 800-pixel-wide window). It works on a copy of the
 * workspace, so the original is never changed. A script, not a test: run it when the screens change.
 */
import path from 'node:path';
import type { Locator, Page } from '@playwright/test';
import { openScreenshotSession } from './screenshot-session.ts';

/** Waits until a button is enabled again (the page disables them while it works): on state, not on time. */
async function expectEnabled(button: Locator): Promise<void> {
  await button.waitFor();
  await button.page().waitForFunction((el) => el !== null && !(el as HTMLButtonElement).disabled, await button.elementHandle(), { timeout: 180_000 });
}

/** Waits for the item pictures to be drawn (the page asks for them after it renders its lists), on state. */
async function picturesShown(page: Page): Promise<void> {
  await page.locator('img.thumb').first().waitFor({ timeout: 60_000 });
  await page.waitForFunction(() => [...document.querySelectorAll<HTMLImageElement>('img.thumb')].every((i) => i.complete), undefined, { timeout: 60_000 });
}

async function main(): Promise<void> {
  const { page, out, close } = await openScreenshotSession('docs-screenshots.ts', process.argv[2]);
  try {
    await page.getByText(/^Signals from /).waitFor();
    await page.screenshot({ path: path.join(out, 'overview.png') });

    const screens = page.getByRole('navigation', { name: 'Screens' });
    await screens.getByRole('button', { name: 'Editions', exact: true }).click();
    await page.getByLabel('Name').fill('Garden week');
    await page.getByLabel('Date').fill('2026-11-30');
    await page.getByRole('button', { name: 'Start edition' }).click();
    const refused = page.getByRole('alert');
    await Promise.race([page.getByLabel('Shelf name').waitFor(), refused.waitFor()]);
    if (await refused.isVisible()) throw new Error(`could not start the edition: ${await refused.innerText()}`);
    // The board: two shelves as cards with their readings, the edition meter below.
    for (const [label, size] of [['Homepage row', '8'], ['Newsletter block', '6']] as const) {
      await page.getByLabel('Shelf name').fill(label);
      await page.getByLabel('Slots').fill(size);
      await page.getByRole('button', { name: 'Add shelf' }).click();
      await page.getByRole('article', { name: `Shelf ${label}` }).getByText(`${size} of ${size} slots filled`).waitFor({ timeout: 60_000 });
    }
    await picturesShown(page);
    await page.screenshot({ path: path.join(out, 'board-1280.png') });
    await page.setViewportSize({ width: 800, height: 800 });
    await page.screenshot({ path: path.join(out, 'board-800.png') });
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.getByRole('button', { name: 'Edit shelf Homepage row' }).click();
    const slots = page.getByRole('list', { name: 'Slots' });
    await slots.getByRole('listitem', { name: /^Slot 2:/ }).getByRole('button', { name: 'Pin' }).click();
    await slots.getByText('Pinned', { exact: true }).waitFor();
    const pool = page.getByRole('list', { name: 'Candidates for this slot' });
    await pool.getByRole('listitem').first().hover();
    await page.getByText(/^If .* went into slot 1:/).waitFor();
    await picturesShown(page);
    await page.screenshot({ path: path.join(out, 'shelf-editor.png') });
    await page.setViewportSize({ width: 800, height: 800 });
    // At 800 px the side panels go below the slots: the top of the screen, as the editor first sees it.
    await page.mouse.move(5, 5);
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.screenshot({ path: path.join(out, 'shelf-editor-800.png') });
    await page.setViewportSize({ width: 1280, height: 800 });

    await screens.getByRole('button', { name: 'Taste groups', exact: true }).click();
    await page.getByRole('list', { name: 'Customers per group' }).waitFor({ timeout: 60_000 });
    await page.screenshot({ path: path.join(out, 'groups.png') });

    // The Planner: the shelf set up above, planned for six weeks from the edition's date; one item pinned by
    // hand and the first week locked, so the calendar shows both marks.
    await screens.getByRole('button', { name: 'Planner', exact: true }).click();
    const form = page.getByRole('form', { name: 'Plan the weeks ahead' });
    await form.getByLabel('Shelf', { exact: true }).fill('Homepage row');
    await form.getByLabel('First week').fill('2026-12-07');
    await form.getByLabel('Weeks', { exact: true }).fill('6');
    await form.getByLabel('Rest weeks').fill('1');
    await form.getByLabel('Plan name').fill('Winter rotation');
    await form.getByRole('button', { name: 'Plan' }).click();
    const calendar = page.getByRole('table', { name: 'Plan for Homepage row' });
    const resolve = page.getByRole('button', { name: 'Re-solve', exact: true });
    await calendar.waitFor({ timeout: 180_000 });
    await expectEnabled(resolve);
    await calendar.getByRole('button', { name: /^Pin .* to week 3$/ }).nth(1).click();
    await page.getByRole('status').filter({ hasText: /^Pinned / }).waitFor({ timeout: 180_000 });
    await expectEnabled(resolve);
    await calendar.getByRole('button', { name: 'Lock week 1 of Homepage row' }).click();
    await page.getByRole('status').filter({ hasText: /^Locked week 1/ }).waitFor({ timeout: 180_000 });
    await expectEnabled(resolve);
    // From the status line down: what the last edit did, then the plan and its calendar.
    const top = page.getByRole('region', { name: 'Planner' }).getByRole('status');
    await top.evaluate((h) => h.scrollIntoView({ block: 'start' }));
    await page.screenshot({ path: path.join(out, 'planner.png') });
    await page.setViewportSize({ width: 800, height: 800 });
    await top.evaluate((h) => h.scrollIntoView({ block: 'start' }));
    await page.screenshot({ path: path.join(out, 'planner-800.png') });
    console.log(`wrote ${out}/overview.png, board-1280.png, board-800.png, shelf-editor.png, shelf-editor-800.png, groups.png, planner.png and planner-800.png`);
  } finally {
    await close();
  }
}

await main();
