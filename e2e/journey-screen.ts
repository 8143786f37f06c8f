import AxeBuilder from '@axe-core/playwright';
import { expect, type Page } from '@playwright/test';
import type { DemoFiles } from './fixtures.ts';

// What the journey's steps share: the options, sidebar navigation, the counts, and the per-screen check.

/** Calls the api the page uses (handler table for the web shell, the preload bridge in Electron). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- results are checked field by field below
export type Api = (method: string, payload: unknown) => Promise<any>;

export interface JourneyOptions {
  files: DemoFiles;
  api: Api;
  /** performance.now() when the app was started, for the first-screen time. */
  startedAt: number;
  /** Prefix of the screenshot files under test-results/. */
  shots: string;
}

const screens = (page: Page) => page.getByRole('navigation', { name: 'Screens' });
export const nav = (page: Page, name: string | RegExp) => screens(page).getByRole('button', { name, exact: typeof name === 'string' }).click();
export const counts = (page: Page) => page.getByLabel('What this workspace holds').getByRole('definition');
export const ms = (t0: number) => `${(performance.now() - t0).toFixed(0)} ms`;

/** Screenshot and axe-core check (no serious or critical violations) of the screen as it stands. */
export async function checkScreen(page: Page, shots: string, name: string): Promise<void> {
  await page.screenshot({ path: `test-results/${shots}-${name}.png`, fullPage: true });
  const axe = await new AxeBuilder({ page }).analyze();
  const bad = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${name}: ${v.id}: ${v.help}`);
  expect(bad).toEqual([]);
}
