/**
 * What the README's screenshot scripts share: a copy of an existing, trained workspace (so the original is never
 * changed) served by the web shell to a Chromium page at 1280×800 that has waited for the models, and the folder the
 * pictures go to. `close` ends the page, the shell and the workspace and removes the copy.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Page } from '@playwright/test';
import { createHandlerTable } from '../src-main/api/handler-table.ts';
import { AppContext } from '../src-main/services/context.ts';
import { startWebShell } from '../src-main/shell/web/server.ts';
import { ensureBuilt, ROOT } from './fixtures.ts';
import config from '../playwright.config.ts';

export interface ScreenshotSession {
  page: Page;
  /** docs/screenshots, made if missing. */
  out: string;
  close(): Promise<void>;
}

/** `script` names the calling script in the usage error; `source` is the workspace file given to it. */
export async function openScreenshotSession(script: string, source: string | undefined): Promise<ScreenshotSession> {
  if (!source || !fs.existsSync(source)) throw new Error(`usage: npx tsx e2e/${script} WORKSPACE.sqlite (an existing, trained workspace)`);
  ensureBuilt();
  // The copy keeps the source's file name, which the pictures show (Overview, the sidebar); the folder says whose it is.
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'shelfwright-screenshots-'));
  const copy = path.join(dir, path.basename(source));
  for (const suffix of ['', '-wal', '-shm']) if (fs.existsSync(source + suffix)) fs.copyFileSync(source + suffix, copy + suffix);
  const ctx = new AppContext();
  ctx.open(copy, { create: false });
  const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: path.join(ROOT, 'dist', 'renderer') });
  const browser = await chromium.launch(config.use?.launchOptions);
  const out = path.join(ROOT, 'docs', 'screenshots');
  fs.mkdirSync(out, { recursive: true });
  const close = async () => {
    await browser.close();
    await shell.close();
    ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  };
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await page.goto(shell.pageUrl);
    await page.getByText(/models? trained/).waitFor({ timeout: 60_000 });
    return { page, out, close };
  } catch (e) {
    await close();
    throw e;
  }
}
