import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import { writeLaunchPage } from '../src-main/shell/launch/launch-page.ts';
import { expect, test } from './fixtures.ts';
import { SHOP } from './seed.ts';

test('overview of a small workspace shows its real counts and passes an accessibility check', async ({ page, app }) => {
  const t0 = performance.now();
  await page.goto(app.shell.pageUrl);
  const counts = page.getByRole('definition');
  await expect(page.getByRole('heading', { name: 'Workspace overview' })).toBeVisible();
  await expect(counts).toHaveText([String(SHOP.items), String(SHOP.customers), String(SHOP.signals)]);
  console.log(`timing: first screen with counts ${(performance.now() - t0).toFixed(0)} ms after navigation`);
  // By its file name; the full path is folded under "Where it is" (layout.spec.ts opens it).
  await expect(page.getByRole('heading', { name: `Workspace ${path.basename(app.workspace)}` })).toBeVisible();
  await expect(page.getByText(app.workspace)).toBeAttached();

  const axe = await new AxeBuilder({ page }).analyze();
  const bad = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  expect(bad.map((v) => `${v.id}: ${v.help}`)).toEqual([]);
  await page.screenshot({ path: 'test-results/overview.png', fullPage: true });
});

test('the web page names no file on this computer: no path fields, and another workspace is chosen at launch', async ({ page, app }) => {
  await page.goto(app.shell.pageUrl);
  await expect(page.getByRole('definition').first()).toHaveText(String(SHOP.items));
  await expect(page.getByRole('heading', { name: 'Another workspace' })).toBeVisible();
  await expect(page.getByText('npm start -- --workspace FILE')).toBeVisible();
  await expect(page.getByLabel('Workspace file (path on this computer)')).toHaveCount(0);
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Import' }).click();
  await expect(page.getByLabel('Upload a file (CSV, JSON, JSON Lines)')).toBeVisible();
  await expect(page.getByLabel('Path on this computer')).toHaveCount(0);
  // And the shell behind it refuses a path even with the token (test/shell/web-path-fields.test.ts tries them all).
  const res = await page.request.post(`${app.shell.origin}api/workspace.open`, {
    headers: { 'x-shelfwright-token': app.shell.token },
    data: { file: `${app.dir}/elsewhere.sqlite`, create: true },
  });
  expect(res.status()).toBe(400);
  expect((await res.json()).error.message).toMatch(/^file: the web shell takes no paths/);
});

test('the api refuses a call that lacks the launch token', async ({ page, app }) => {
  const res = await page.request.post(`${app.shell.origin}api/workspace.info`, { data: {} });
  expect(res.status()).toBe(401);
  expect(await res.json()).toEqual({ ok: false, error: { code: 'input', message: 'missing or wrong launch token' } });
});

test('the private launch page opens the app, the token leaves the address bar, and a reload still works', async ({ page, app }) => {
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-launch-'));
  try {
    // What `npm start` hands the browser: a file address, so the token is never on a command line.
    await page.goto(writeLaunchPage(profile, app.shell.pageUrl));
    await expect(page.getByRole('definition').first()).toHaveText(String(SHOP.items));
    expect(page.url()).toBe(app.shell.origin);
    expect(page.url()).not.toContain(app.shell.token);
    await page.reload();
    await expect(page.getByRole('definition').first()).toHaveText(String(SHOP.items));
  } finally {
    fs.rmSync(profile, { recursive: true, force: true });
  }
});

test('the page served without the fragment holds no token and asks for the address the launcher printed', async ({ page, app }) => {
  const res = await page.goto(app.shell.origin);
  expect(await res?.text()).not.toContain(app.shell.token);
  await expect(page.getByRole('alert')).toContainText('This page needs the address Shelfwright printed when it started');
});
