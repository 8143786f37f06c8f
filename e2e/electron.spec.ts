import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { _electron as electron, test } from '@playwright/test';
import { electronNativeBinding } from '../src-main/shell/electron/native-binding.ts';
import { findElectronBinary } from '../src-main/shell/launch/electron.ts';
import { demoFiles, ensureBuilt, ROOT } from './fixtures.ts';
import { runJourney } from './journey-steps.ts';

const binary = findElectronBinary(ROOT);
const native = binary ? electronNativeBinding(ROOT) : null;

/**
 * The same journey as journey.spec.ts in the Electron app, through Playwright's Electron support. It needs
 * Electron's binary (downloaded by electron's own installer, which machines without internet skip) and
 * better-sqlite3 rebuilt for Electron (`npm run rebuild:electron`); without them it is skipped, saying why.
 */
test.describe('Electron app', () => {
  test.skip(binary === null, "Electron's binary is not installed (node_modules/electron has no dist/): the web shell journey covers the screens");
  test.skip(binary !== null && native === null, 'better-sqlite3 is not rebuilt for Electron: run `npm run rebuild:electron`');

  test('a new user imports, trains, curates, publishes and exports in the Electron window', async () => {
    test.setTimeout(170_000);
    ensureBuilt();
    const config = path.join(ROOT, 'src-main/shell/electron/vite.electron.config.ts');
    for (const mode of ['main', 'preload']) {
      const r = spawnSync(process.execPath, [path.join(ROOT, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn', '--config', config, '--mode', mode], { cwd: ROOT, stdio: 'inherit' });
      if (r.status !== 0) throw new Error(`vite build of the Electron ${mode} failed`);
    }
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-electron-'));
    const files = await demoFiles(dir);
    const startedAt = performance.now();
    const app = await electron.launch({
      executablePath: binary!,
      args: [path.join(ROOT, 'dist-electron', 'main.cjs'), '--workspace', path.join(dir, 'journey.sqlite')],
      cwd: ROOT,
    });
    try {
      const page = await app.firstWindow();
      await page.setViewportSize({ width: 1280, height: 800 });
      // The api as the window's own preload bridge answers it.
      const api = async (method: string, payload: unknown) => {
        const r = await page.evaluate(([m, p]) => window.shelfwright!.invoke(m as string, p), [method, payload] as const);
        if (!r.ok) throw new Error(`${method}: ${r.error.message}`);
        return r.value;
      };
      await runJourney(page, { files, api, startedAt, shots: 'electron' });
    } finally {
      await app.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
