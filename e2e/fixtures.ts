import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import AxeBuilder from '@axe-core/playwright';
import { test as base, type Page } from '@playwright/test';
import { createHandlerTable } from '../src-main/api/handler-table.ts';
import { AppContext } from '../src-main/services/context.ts';
import { rendererNeedsBuild } from '../src-main/shell/launch/renderer-build.ts';
import { startWebShell, type WebShell } from '../src-main/shell/web/server.ts';
import { seedSmallShop } from './seed.ts';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DIST = path.join(ROOT, 'dist', 'renderer');

/** Builds the renderer once per run when it is missing or older than its sources. */
function ensureBuilt(): void {
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
 * A fresh temp workspace holding the small invented shop (seed.ts) and a web shell on a random port, once
 * per worker. Tests that change it use labels of their own, so the order of files does not matter.
 */
export const test = base.extend<object, { app: App }>({
  app: [
    // eslint-disable-next-line no-empty-pattern -- Playwright reads a fixture's dependencies from this pattern; it has none
    async ({}, use) => {
      ensureBuilt();
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-e2e-'));
      const workspace = path.join(dir, 'e2e.sqlite');
      const ctx = new AppContext();
      ctx.open(workspace, { create: true });
      seedSmallShop(ctx.db);
      const startedAt = performance.now();
      const shell = await startWebShell({ table: createHandlerTable(ctx), staticDir: DIST });
      await use({ shell, ctx, dir, workspace, startedAt });
      await shell.close();
      ctx.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
    { scope: 'worker' },
  ],
});

export { expect } from '@playwright/test';

/** axe-core on the current page: no serious or critical violations (WCAG 2 A/AA rules that axe checks). */
export async function seriousA11yViolations(page: Page): Promise<string[]> {
  const axe = await new AxeBuilder({ page }).analyze();
  return axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`);
}
