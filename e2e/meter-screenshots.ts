/**
 * The meter's pictures for the README, from a real (demo) workspace: `npx tsx e2e/meter-screenshots.ts
 * WORKSPACE` writes docs/screenshots/meter-1280.png and meter-800.png (the shelf editor with its meter and a
 * what-if under the pointer) and meter-800-scrolled.png (the strip still in view further down). It works on
 * a copy of the workspace, so the original is never changed. A script, not a test: run it when the meter changes.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium } from '@playwright/test';
import { createHandlerTable } from '../src-main/api/handler-table.ts';
import { AppContext } from '../src-main/services/context.ts';
import { startWebShell } from '../src-main/shell/web/server.ts';
import { ensureBuilt, ROOT } from './fixtures.ts';
import config from '../playwright.config.ts';

async function main(): Promise<void> {
  const source = process.argv[2];
  if (!source || !fs.existsSync(source)) throw new Error('usage: npx tsx e2e/meter-screenshots.ts WORKSPACE.sqlite (an existing, trained workspace)');
  ensureBuilt();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-meter-'));
  const copy = path.join(dir, path.basename(source));
  for (const suffix of ['', '-wal', '-shm']) if (fs.existsSync(source + suffix)) fs.copyFileSync(source + suffix, copy + suffix);
  const ctx = new AppContext();
  ctx.open(copy, { create: false });
  const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: path.join(ROOT, 'dist', 'renderer') });
  const browser = await chromium.launch(config.use?.launchOptions);
  const out = path.join(ROOT, 'docs', 'screenshots');
  fs.mkdirSync(out, { recursive: true });
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await page.goto(shell.pageUrl);
    await page.getByText(/models? trained/).waitFor({ timeout: 60_000 });
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
    await browser.close();
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
