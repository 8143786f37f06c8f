/**
 * The meter's pictures for the README, from a real (demo) workspace: `npx tsx e2e/meter-screenshots.ts
 * WORKSPACE` writes docs/screenshots/meter-1280.png and meter-800.png (the shelf editor with its meter and a
 * what-if under the pointer) and meter-800-scrolled.png (the strip still in view further down). It works on
 * a copy of the workspace, so the original is never changed. A script, not a test: run it when the meter changes.
 */
import path from 'node:path';
import { openScreenshotSession } from './screenshot-session.ts';

async function main(): Promise<void> {
  const { page, out, close } = await openScreenshotSession('meter-screenshots.ts', process.argv[2]);
  try {
    const screens = page.getByRole('navigation', { name: 'Screens' });
    await screens.getByRole('button', { name: 'Editions', exact: true }).click();
    await page.getByLabel('Name').fill('Garden week');
    await page.getByLabel('Date').fill('2026-11-30');
    await page.getByRole('button', { name: 'Start edition' }).click();
    await page.getByLabel('Shelf name').fill('Homepage row');
    await page.getByLabel('Slots').fill('8');
    await page.getByRole('button', { name: 'Add shelf' }).click();
    await page.getByRole('button', { name: 'Edit shelf Homepage row' }).click();
    const details = page.getByRole('region', { name: 'Meter in detail' });
    await details.getByText('Set targets for this shelf').click();
    await details.getByLabel('Novelty, at least').fill('0.3');
    await details.getByLabel('Calibration gap, at most').fill('0.3');
    await details.getByRole('button', { name: 'Save targets' }).click();
    await page.locator('.gauge', { hasText: 'Novelty' }).getByText(/≥ 0\.30/).waitFor();
    await details.getByText('Set targets for this shelf').click();
    await page.getByLabel('For slot').selectOption('2');
    const pool = page.getByRole('list', { name: 'Candidates for this slot' });
    await pool.getByRole('listitem').first().getByRole('button', { name: /into slot 2$/ }).waitFor();
    for (const width of [1280, 800]) {
      await page.setViewportSize({ width, height: 800 });
      await page.evaluate(() => window.scrollTo(0, 0));
      await pool.getByRole('listitem').nth(1).hover();
      await page.getByText(/^If .* went into slot 2:/).waitFor();
      await page.screenshot({ path: path.join(out, `meter-${width}.png`) });
    }
    await page.mouse.move(5, 5);
    await details.getByRole('heading', { name: 'Meter in detail' }).scrollIntoViewIfNeeded();
    await page.evaluate(() => window.scrollBy(0, 200));
    await page.screenshot({ path: path.join(out, 'meter-800-scrolled.png') });
    console.log(`wrote ${out}/meter-1280.png, meter-800.png and meter-800-scrolled.png`);
  } finally {
    await close();
  }
}

await main();
