import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import AxeBuilder from '@axe-core/playwright';
import { test as base, type Page } from '@playwright/test';
import { createHandlerTable } from '../src-main/api/handler-table.ts';
import { AppContext } from '../src-main/services/context.ts';
import { buildDemoWorkspace } from '../src-main/services/demo.ts';
import { rendererNeedsBuild } from '../src-main/shell/launch/renderer-build.ts';
import { startWebShell, type WebShell } from '../src-main/shell/web/server.ts';
import { seedSmallShop } from './seed.ts';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
export const DIST = path.join(ROOT, 'dist', 'renderer');

/** Builds the renderer once per run when it is missing or older than its sources. */
export function ensureBuilt(): void {
  const sources = ['src-renderer', 'src-main/api', 'src-main/core'].map((d) => path.join(ROOT, d));
  if (!rendererNeedsBuild(DIST, sources)) return;
  const r = spawnSync(process.execPath, [path.join(ROOT, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'], {
    cwd: ROOT,
    stdio: 'inherit',
  });
  if (r.status !== 0) throw new Error('vite build failed');
}

export interface App {
  shell: WebShell;
  ctx: AppContext;
  dir: string;
  workspace: string;
  /** Milliseconds from server start to now, for the timing lines the tests print. */
  startedAt: number;
}

/**
 * A fresh temp workspace holding the small invented shop (seed.ts) and a web shell on a random port, for each
 * test: no test sees another's editions or models, so any order, `--repeat-each` and one spec alone all pass.
 * Seeding 12 items and starting the shell takes milliseconds, far less than sharing costs in flaky reruns.
 */
export const test = base.extend<{ app: App }>({
  // eslint-disable-next-line no-empty-pattern -- Playwright reads a fixture's dependencies from this pattern; it has none
  app: async ({}, use) => {
    ensureBuilt();
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-e2e-'));
    const workspace = path.join(dir, 'e2e.sqlite');
    const ctx = new AppContext();
    ctx.open(workspace, { create: true });
    seedSmallShop(ctx.db);
    const startedAt = performance.now();
    const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: DIST });
    await use({ shell, ctx, dir, workspace, startedAt });
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  },
});

export { expect } from '@playwright/test';

/** axe-core on the current page: no serious or critical violations (WCAG 2 A/AA rules that axe checks). */
export async function seriousA11yViolations(page: Page): Promise<string[]> {
  const axe = await new AxeBuilder({ page }).analyze();
  return axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`);
}

/** The demo shop's files as the journey uploads them: the signals split in time into imported and held-out rows. */
export interface DemoFiles {
  items: string;
  customers: string;
  signals: string;
  /** The last tenth of the signals (never imported), plus one unknown customer and one unknown item row. */
  holdout: string;
  /** Day after the last imported signal (YYYY-MM-DD): the journey's edition date. */
  editionDate: string;
}

export interface FreshApp {
  shell: WebShell;
  ctx: AppContext;
  files: DemoFiles;
  /** performance.now() just before the server started, for the first-screen time. */
  startedAt: number;
}

/** Size of the journey's shop: small enough for a 3-minute run, big enough for real models (brief of issue 5). */
export const JOURNEY_SHOP = { seed: 11, items: 300, customers: 1500, signals: 30_000 } as const;

export async function demoFiles(dir: string): Promise<DemoFiles> {
  const { generateDemoShop } = await import('../demo-data/generator/index.ts');
  const out = path.join(dir, 'shop');
  const summary = await generateDemoShop({ ...JOURNEY_SHOP, outDir: out });
  const lines = fs.readFileSync(summary.files.signals, 'utf8').trimEnd().split('\n');
  const [header, ...rows] = lines;
  const atCol = header!.split(',').indexOf('at');
  rows.sort((a, b) => (a.split(',')[atCol]! < b.split(',')[atCol]! ? -1 : 1));
  const cut = Math.floor(rows.length * 0.9);
  const [c0, i0] = rows[0]!.split(',');
  const signals = path.join(out, 'signals-train.csv');
  const holdout = path.join(out, 'holdout.csv');
  fs.writeFileSync(signals, [header, ...rows.slice(0, cut)].join('\n') + '\n');
  const extra = [`zz-nobody,${i0},view,,${rows[cut]!.split(',')[atCol]}`, `${c0},zz-nothing,view,,${rows[cut]!.split(',')[atCol]}`];
  fs.writeFileSync(holdout, [header, ...rows.slice(cut), ...extra].join('\n') + '\n');
  const last = rows[cut - 1]!.split(',')[atCol]!.slice(0, 10);
  const next = new Date(Date.parse(`${last}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
  return { items: summary.files.items, customers: summary.files.customers, signals, holdout, editionDate: next };
}

/**
 * A new user's first launch: an empty workspace in a temp folder, the demo shop's CSV files beside it (to
 * upload through the page), and a web shell of its own. Test-scoped: the journey starts from nothing.
 */
export const journeyTest = base.extend<{ fresh: FreshApp }>({
  // eslint-disable-next-line no-empty-pattern -- Playwright reads a fixture's dependencies from this pattern; it has none
  fresh: async ({}, use) => {
    ensureBuilt();
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-journey-'));
    const files = await demoFiles(dir);
    const ctx = new AppContext();
    ctx.open(path.join(dir, 'journey.sqlite'), { create: true });
    const startedAt = performance.now();
    const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: DIST });
    await use({ shell, ctx, files, startedAt });
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  },
});

/**
 * The invented garden shop at the journey's size, trained (no tuning), behind a web shell of its own for one
 * test: `use` gets the shell's page address; the shell, the workspace and its temp folder are closed after.
 */
export async function withTrainedJourneyShop(prefix: string, use: (pageUrl: string) => Promise<void>): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), prefix));
  const file = path.join(dir, 'demo.sqlite');
  const { seed, items, customers, signals } = JOURNEY_SHOP;
  await buildDemoWorkspace(file, { seed, size: { items, customers, signals }, tune: false });
  const ctx = new AppContext();
  ctx.open(file, { create: false });
  const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: DIST });
  try {
    await use(shell.pageUrl);
  } finally {
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
