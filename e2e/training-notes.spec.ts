import os from 'node:os';
import path from 'node:path';
import { TUNE_BUDGET } from '../src-main/core/models/tune-budget.ts';
import { trainingOutlook } from '../src-main/services/train/outlook.ts';
import { trainingSizes } from '../src-main/store/stats.ts';
import { modelWords } from '../src-main/core/models/model-words.ts';
import { ensureBuilt, expect, seriousA11yViolations, test, withTrainedJourneyShop } from './fixtures.ts';

/**
 * What the command line says about a training, said on the Models screen too: the notice of a training
 * predicted long (services/train/outlook.ts, the CLI's `note: ...`) beside the progress bar until the next job,
 * and the tuner's notes beside each model's tuning. Every wait is on what the page shows, never on time.
 */

test('a training predicted long says so beside its bar, in words, and the notice stays after it ends', async ({ page, app }) => {
  // The outlook reads counts only, the signal count standing for the matrix's entries (an upper bound: repeats
  // of one pair are one entry). So the small shop with each of its 30 pairs seen again and again is predicted
  // minutes of item-kNN and tuning, while the fit itself stays quick (each repeat one millisecond after the last): a notice to read without a large log.
  const db = app.ctx.db;
  const REPEATS = 400_000;
  db.transaction(() => {
    const pairs = db.prepare('SELECT customer_id, item_id, kind, at FROM signal ORDER BY id').all() as { customer_id: number; item_id: number; kind: number; at: number }[];
    const add = db.prepare('INSERT INTO signal (customer_id, item_id, kind, at) VALUES (?, ?, ?, ?)');
    for (let k = 0; k < REPEATS; k++) {
      const p = pairs[k % pairs.length]!;
      add.run(p.customer_id, p.item_id, p.kind, p.at + 1 + Math.floor(k / pairs.length)); // a signal is one per moment
    }
  })();
  // What the api will announce for its default training (tuning first, within the default budget), and without tuning.
  const { notice } = trainingOutlook(trainingSizes(db), { tuneBudget: TUNE_BUDGET.default });
  const { notice: untuned } = trainingOutlook(trainingSizes(db), { tuneBudget: 0 });
  expect(notice).not.toBeNull();
  expect(untuned).not.toBeNull();
  const said = (n: string) => `${n.charAt(0).toUpperCase()}${n.slice(1)}.`;

  await page.goto(app.shell.pageUrl);
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Models', exact: true }).click();
  const panel = page.getByRole('region', { name: 'Training' });
  await expect(panel.getByTestId('train-plan')).toHaveText(/^Nothing is tuned yet: will first search each model's settings/);
  await panel.getByRole('button', { name: 'Train models' }).click();
  const box = panel.getByRole('note', { name: 'How long this training takes' });
  await expect(box).toContainText(said(notice!));
  await expect(box).toContainText('item-kNN at least');
  await expect(box).toContainText('tick “Skip tuning” and train again');
  await expect(panel.getByRole('button', { name: 'Train models' })).toBeEnabled({ timeout: 120_000 });
  await expect(panel.getByRole('progressbar')).toHaveAttribute('value', '1');
  await expect(box).toBeVisible();
  await page.screenshot({ path: path.join(os.tmpdir(), 'shelfwright-training-notice-1280.png') });
  expect(await seriousA11yViolations(page)).toEqual([]);

  // Skipping the search: this run's own notice, which counts no tuning, replaces the last.
  await panel.getByRole('checkbox', { name: /^Skip tuning/ }).check();
  await expect(panel.getByTestId('train-plan')).toHaveText(/^Will train every model with its default settings, without searching/);
  await panel.getByRole('button', { name: 'Train models' }).click();
  await expect(panel.getByText(/^trained \d+ models in/)).toBeVisible({ timeout: 120_000 });
  await expect(box).toContainText(said(untuned!));
  await expect(box).not.toContainText('Skip tuning');
});

test('the tuning of each model, with the tuner notes beside it, after the Train button tuned as the command line does', async ({ page }) => {
  test.setTimeout(300_000);
  ensureBuilt(); // this test has no `app` fixture, which builds the page when its sources changed
  // The journey-size demo, trained without tuning: the default training must search first.
  await withTrainedJourneyShop('sw-tuning-notes-', async (pageUrl) => {
    await page.goto(pageUrl);
    await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Models', exact: true }).click();
    const panel = page.getByRole('region', { name: 'Training' });
    const models = page.getByRole('region', { name: 'Trained models' });
    await expect(models.getByRole('row').nth(1)).toBeVisible();
    await expect(panel.getByTestId('train-plan')).toHaveText(/^Nothing is tuned yet: will first search/);
    await panel.getByRole('button', { name: 'Train models' }).click();
    await expect(panel.getByText(/^tuned \(/)).toBeVisible({ timeout: 280_000 });
    // iALS trials run fewer sweeps than its training (services/tune/grid.ts IALS_SEARCH_ITERATIONS 3 of 15): the tuner says so.
    const ials = models.getByRole('list', { name: 'Tuning notes: iALS' });
    await expect(ials).toContainText('iALS trials ran 3 of the 15 training sweeps each');
    await expect(ials.locator('xpath=ancestor::td')).toContainText(/factors \d+.* · NDCG@10 0\.\d{3} on held-out signals · tuned /);
    // Content has no grid: a dash, not an empty cell.
    const content = models.getByRole('row').filter({ has: page.getByRole('rowheader', { name: modelWords('content'), exact: true }) });
    await expect(content.locator('td.tuning-cell')).toHaveText('–');
    // Now every tuned model saw today's data: the next training reuses the tuning, and the panel says so.
    await expect(panel.getByTestId('train-plan')).toHaveText(/^The data is unchanged since the last tuning/);
    // The table as the editor sees it at 1280 px (the shell's sidebar is fixed, so a full-page shot would misplace it).
    await models.evaluate((el) => el.scrollIntoView());
    await page.screenshot({ path: path.join(os.tmpdir(), 'shelfwright-models-tuning-1280.png') });
    expect(await seriousA11yViolations(page)).toEqual([]);
    // At 800 px the table scrolls sideways in its own region (as the evaluation's does), never the page.
    await page.setViewportSize({ width: 800, height: 800 });
    await expect.poll(() => page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    const scroller = models.getByRole('region', { name: "Each model's training and tuning" });
    const [inner, outer] = await Promise.all([scroller.boundingBox(), models.boundingBox()]);
    expect(inner!.x + inner!.width).toBeLessThanOrEqual(outer!.x + outer!.width);
    await models.evaluate((el) => el.scrollIntoView());
    await page.screenshot({ path: path.join(os.tmpdir(), 'shelfwright-models-tuning-800.png') });
  });
});
