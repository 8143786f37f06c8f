import { defineConfig } from '@playwright/test';

/**
 * End-to-end tests drive the real application: the web shell and the built renderer over the same handler
 * table Electron uses. Each test file starts its own server (e2e/fixtures.ts), so no webServer block.
 * JSON goes to reports/ because Playwright empties test-results/ on start (notes/toolchain.md).
 */
export default defineConfig({
  testDir: 'e2e',
  timeout: 60_000,
  workers: 1,
  fullyParallel: false,
  reporter: [['list'], ['json', { outputFile: 'reports/e2e.json' }]],
  outputDir: 'test-results',
  use: {
    browserName: 'chromium',
    headless: true,
    viewport: { width: 1280, height: 800 },
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    },
  },
});
