import type { Locator, Page } from '@playwright/test';
import { ensureBuilt, expect, seriousA11yViolations, test, withTrainedJourneyShop } from './fixtures.ts';
import { SHOP } from './seed.ts';

/**
 * The rotation planner through the page (issue 14): plan one shelf of the small invented shop for four weeks,
 * pin an item to a week, ban another from the horizon, lock a week, re-solve, then turn a planned week into a
 * draft edition and find it, with the planned items, on the editions screen. Every wait is on something the
 * page shows (the machine is shared and slow), never on a clock.
 */

const SLOW = { timeout: 120_000 };
const WEEKS = 4;
const SLOTS = 3;
const SHELF = 'Homepage row';
const PLAN = 'Winter rotation';

/** The calendar as item ids: grid[week - 1][slot - 1], read from the cells' data-item. */
async function grid(table: Locator): Promise<string[][]> {
  const rows = await table.locator('tbody tr').evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => (td as HTMLElement).dataset['item'] ?? '')));
  return Array.from({ length: WEEKS }, (_, w) => rows.map((r) => r[w]!));
}

/** The seeded shop's title of an item (seed.ts numbers items i-1 … i-12 in title order): known outside the page. */
const titleOf = (item: string) => SHOP.titles[Number(item.slice(2)) - 1]!;

/** Waits until the last action has finished: the busy note gone and the buttons enabled again. */
async function settled(page: Page): Promise<void> {
  await expect(page.getByRole('button', { name: 'Re-solve', exact: true })).toBeEnabled(SLOW);
}

test('plan a shelf for four weeks, pin, ban, lock, re-solve, and make a draft edition of a planned week', async ({ page, app }) => {
  test.setTimeout(600_000);
  await page.goto(app.shell.pageUrl);
  const screens = page.getByRole('navigation', { name: 'Screens' });
  const status = page.getByRole('region', { name: 'Planner' }).getByRole('status');

  // The planner plans the shelves of an edition: start one with a shelf of three slots.
  await screens.getByRole('button', { name: 'Editions', exact: true }).click();
  await page.getByLabel('Name').fill('Week 50');
  await page.getByLabel('Date').fill('2026-12-07');
  await page.getByRole('button', { name: 'Start edition' }).click();
  await page.getByLabel('Shelf name').fill(SHELF);
  await page.getByLabel('Slots').fill(String(SLOTS));
  await page.getByRole('button', { name: 'Add shelf' }).click();
  await expect(page.getByRole('article', { name: `Shelf ${SHELF}` })).toContainText(`${SLOTS} of ${SLOTS} slots filled`, SLOW);

  await screens.getByRole('button', { name: 'Planner', exact: true }).click();
  const form = page.getByRole('form', { name: 'Plan the weeks ahead' });
  await form.getByLabel('Shelf', { exact: true }).fill(SHELF);
  await form.getByLabel('First week').fill('2026-12-14');
  await form.getByLabel('Weeks', { exact: true }).fill(String(WEEKS));
  await form.getByLabel('Plan name').fill(PLAN);
  await form.getByRole('button', { name: 'Plan' }).click();
  const table = page.getByRole('table', { name: `Plan for ${SHELF}` });
  await expect(table.locator('tbody tr')).toHaveCount(SLOTS, SLOW);
  await settled(page);
  const first = await grid(table);
  // Twelve items, four weeks of three: every slot filled, no item twice in a week.
  for (const week of first) {
    expect(week.every((x) => /^i-\d+$/.test(x))).toBe(true);
    expect(new Set(week).size).toBe(SLOTS);
  }
  // The seeded shop has no trained models: the page says how items were valued instead (build.ts's notes).
  await expect(page.getByRole('list', { name: 'Notes on this plan' })).toContainText('items are valued by popularity');
  expect(await seriousA11yViolations(page)).toEqual([]);
  await page.screenshot({ path: 'test-results/planner.png', fullPage: true });

  // Pin an item to week 2 through the form: one the first plan left out, if any, else one not in week 2.
  const unused = SHOP.titles.map((_, k) => `i-${k + 1}`).filter((x) => !first.flat().includes(x));
  const pinned = unused[0] ?? first.flat().find((x) => !first[1]!.includes(x) && !first[0]!.includes(x))!;
  const pinForm = page.getByRole('form', { name: 'Pin an item to a week' });
  await pinForm.getByLabel('Item (id or title)').fill(pinned);
  await pinForm.getByLabel('Week').selectOption('2');
  await pinForm.getByRole('button', { name: 'Pin and re-solve' }).click();
  await expect(status).toHaveText(new RegExp(`^Pinned ${pinned} to week 2 of ${SHELF} and re-solved: \\d+ placements? changed\\.$`), SLOW);
  await expect(table.locator('tbody td').filter({ hasText: '(pinned)' })).toHaveCount(1, SLOW);
  await settled(page);
  const afterPin = await grid(table);
  expect(afterPin[1]).toContain(pinned);
  await expect(table.locator(`td[data-item="${pinned}"]`).filter({ hasText: '(pinned)' })).toHaveCount(1);

  // Ban an item of week 3 that is not the pinned one.
  const banned = afterPin[2]!.find((x) => x !== pinned)!;
  expect(banned).toBeDefined();
  await table.getByRole('button', { name: new RegExp(`^Ban .*\\(${banned}\\) from the plan$`) }).first().click();
  await expect(status).toHaveText(new RegExp(`^Banned ${banned} from the plan and re-solved: `), SLOW);
  await expect(table.locator(`td[data-item="${banned}"]`)).toHaveCount(0);
  await settled(page);
  const afterBan = await grid(table);

  // Lock week 1 from the keyboard: its items stay as they are.
  await table.getByRole('button', { name: `Lock week 1 of ${SHELF}` }).focus();
  await page.keyboard.press('Enter');
  await expect(status).toHaveText(new RegExp(`^Locked week 1 of ${SHELF} and re-solved: `), SLOW);
  await expect(table.getByRole('columnheader', { name: /^Week 1 / })).toContainText('(locked)');
  await settled(page);
  const locked = (await grid(table))[0]!;
  expect(locked).toEqual(afterBan[0]);

  await page.getByRole('button', { name: 'Re-solve', exact: true }).click();
  // The lock's message began "Locked week 1"; this one is the re-solve's own.
  await expect(status).toHaveText(/^Re-solved: \d+ placements? changed\.$/, SLOW);
  await settled(page);
  const last = await grid(table);
  expect(last[1]).toContain(pinned);
  expect(last.flat()).not.toContain(banned);
  expect(last[0]).toEqual(locked);
  // Re-solving with nothing new keeps the plan: the keep bonus exists so a re-solve changes as little as it can.
  await expect(status).toHaveText('Re-solved: 0 placements changed.');
  expect(last).toEqual(await grid(table));
  // Against the first plan, the edits moved little: at most half of the cells changed (common practice, no
  // source: a re-plan that reshuffles most of the calendar defeats planning ahead).
  const moved = last.flat().filter((x, k) => x !== first.flat()[k]).length;
  expect(moved).toBeLessThanOrEqual((WEEKS * SLOTS) / 2);
  console.log(`re-plan after pin, ban and lock: ${moved} of ${WEEKS * SLOTS} placements differ from the first plan`);

  // Make a draft of week 2 and find it on the editions screen with the planned items.
  await page.getByRole('button', { name: 'Make draft of week 2' }).click();
  const draft = `${PLAN} · week 2`;
  await expect(status).toHaveText(`Draft edition “${draft}” made from week 2.`, SLOW);
  await expect(page.getByRole('button', { name: `Open draft edition ${draft}` })).toBeVisible();
  expect(await seriousA11yViolations(page)).toEqual([]);
  await screens.getByRole('button', { name: 'Editions', exact: true }).click();
  const row = page.getByRole('row', { name: new RegExp(`^${draft}`) });
  await expect(row).toContainText('Draft', SLOW);
  await page.getByRole('button', { name: `Open edition ${draft}` }).click();
  const shelf = page.getByRole('article', { name: `Shelf ${SHELF}` });
  await expect(shelf).toBeVisible(SLOW);
  for (const item of last[1]!) await expect(shelf).toContainText(titleOf(item));
  expect(await seriousA11yViolations(page)).toEqual([]);
});

/**
 * The same screen on the invented garden shop with trained models (the demo build at the journey's size): the
 * plan is valued by the models' relevance, not popularity, and a pinned week becomes a draft with those items.
 */
test('on the trained demo shop: plan two shelves for six weeks with rest weeks, pin, and draft a week', async ({ page }) => {
  test.setTimeout(900_000);
  ensureBuilt();
  await withTrainedJourneyShop('sw-plan-demo-', async (pageUrl) => {
    await page.goto(pageUrl);
    const screens = page.getByRole('navigation', { name: 'Screens' });
    const status = page.getByRole('region', { name: 'Planner' }).getByRole('status');
    await screens.getByRole('button', { name: 'Editions', exact: true }).click();
    await page.getByLabel('Name').fill('Week 50');
    await page.getByLabel('Date').fill('2026-12-07');
    await page.getByRole('button', { name: 'Start edition' }).click();
    for (const [label, size] of [['Front page', '6'], ['Newsletter', '4']] as const) {
      await page.getByLabel('Shelf name').fill(label);
      await page.getByLabel('Slots').fill(size);
      await page.getByRole('button', { name: 'Add shelf' }).click();
      await expect(page.getByRole('article', { name: `Shelf ${label}` })).toContainText(`${size} of ${size} slots filled`, SLOW);
    }

    await screens.getByRole('button', { name: 'Planner', exact: true }).click();
    const form = page.getByRole('form', { name: 'Plan the weeks ahead' });
    await form.getByLabel('Shelf', { exact: true }).fill('Front page');
    await form.getByLabel('More shelves (comma-separated)').fill('Newsletter');
    await form.getByLabel('First week').fill('2026-12-14');
    await form.getByLabel('Weeks', { exact: true }).fill('6');
    await form.getByLabel('Rest weeks').fill('1');
    await form.getByLabel('Plan name').fill('Garden winter');
    await form.getByRole('button', { name: 'Plan' }).click();
    const front = page.getByRole('table', { name: 'Plan for Front page' });
    const news = page.getByRole('table', { name: 'Plan for Newsletter' });
    await expect(front.locator('tbody tr')).toHaveCount(6, SLOW);
    await expect(news.locator('tbody tr')).toHaveCount(4);
    await expect(page.getByRole('button', { name: 'Re-solve', exact: true })).toBeEnabled(SLOW);
    // Trained models value the items: no fallback note, and the meter's relevance is a number.
    await expect(page.getByRole('list', { name: 'Notes on this plan' })).toHaveCount(0);
    await expect(page.getByRole('table', { name: 'Plan meter' }).getByRole('row', { name: /^Horizon/ })).not.toContainText('–');
    const weeks = async (table: Locator) => {
      const rows = await table.locator('tbody tr').evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => (td as HTMLElement).dataset['item'] ?? '')));
      return Array.from({ length: 6 }, (_, w) => rows.map((r) => r[w]!));
    };
    const before = await weeks(front);
    // Rest weeks 1: an item shown in a week sits out the next one.
    for (let w = 1; w < 6; w++) for (const x of before[w]!) expect(before[w - 1]).not.toContain(x);

    // Pin a Front-page item of week 1 into week 4 (week 1 + rest 1 allows it).
    const pinned = before[0]!.find((x) => !before[3]!.includes(x) && !before[2]!.includes(x) && !before[4]!.includes(x))!;
    const pinForm = page.getByRole('form', { name: 'Pin an item to a week' });
    await pinForm.getByLabel('Item (id or title)').fill(pinned);
    await pinForm.getByLabel('Week').selectOption('4');
    await pinForm.getByLabel('On shelf').selectOption('Front page');
    await pinForm.getByRole('button', { name: 'Pin and re-solve' }).click();
    await expect(status).toHaveText(new RegExp(`^Pinned ${pinned} to week 4 of Front page and re-solved: `), SLOW);
    const after = await weeks(front);
    expect(after[3]).toContain(pinned);

    // The planned titles of week 4, as the calendar shows them (each cell's title line).
    const planned = await front.locator('tbody tr').evaluateAll((trs) => trs.map((tr) => tr.querySelectorAll('td')[3]!.querySelector('.cell-title')!.textContent!));
    await page.getByRole('button', { name: 'Make draft of week 4' }).click();
    const draft = 'Garden winter · week 4';
    await expect(status).toHaveText(`Draft edition “${draft}” made from week 4.`, SLOW);
    expect(await seriousA11yViolations(page)).toEqual([]);
    await page.getByRole('button', { name: `Open draft edition ${draft}` }).click();
    const shelf = page.getByRole('article', { name: 'Shelf Front page' });
    await expect(shelf).toContainText('6 of 6 slots filled', SLOW);
    // The board's card previews a few titles; the shelf editor lists every slot, in the plan's order, pinned.
    await page.getByRole('button', { name: 'Edit shelf Front page' }).click();
    const slots = page.getByRole('list', { name: 'Slots' });
    await expect(slots.getByRole('listitem', { name: /^Slot \d+:/ })).toHaveCount(6, SLOW);
    for (const [k, t] of planned.entries()) {
      const slot = slots.getByRole('listitem', { name: new RegExp(`^Slot ${k + 1}:`) });
      await expect(slot).toContainText(t);
      await expect(slot.getByText('Pinned', { exact: true })).toBeVisible();
    }
  });
});
