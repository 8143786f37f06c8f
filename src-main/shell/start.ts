/**
 * `npm start`: build the page if needed, make sure a workspace exists, then open the app: Electron when
 * its binary is installed, otherwise the loopback web shell in a Chromium app window (or just its URL).
 * DESIGN.md, Shells. This file must never load Electron: the Node path runs where Electron cannot.
 */
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.ts';
import { createHandlerTable } from '../api/handler-table.ts';
import { AppContext } from '../services/context.ts';
import { makeTempFolder, sweepTempFolders } from '../services/temp-folders.ts';
import { APP_BLOCKING_WAIT_MS } from '../store/workspace.ts';
import { parseStartArgs, type StartArgs } from './launch/args.ts';
import { openAppWindow } from './launch/app-window.ts';
import { chromiumAppArgs, findChromium } from './launch/browser.ts';
import { ensureDemo } from './launch/demo.ts';
import { writeLaunchPage } from './launch/launch-page.ts';
import { projectRoot } from './launch/project-root.ts';
import { electronNativeBinding } from './electron/native-binding.ts';
import { findElectronBinary } from './launch/electron.ts';
import { rendererNeedsBuild } from './launch/renderer-build.ts';
import { startWebShell } from './web/server.ts';

// The same folder from src-main/shell/start.ts (tsx) and from dist-node/start.js (the Node build).
const ROOT = projectRoot(import.meta.url);
const RENDERER_DIST = path.join(ROOT, 'dist', 'renderer');
const VITE = path.join(ROOT, 'node_modules', 'vite', 'bin', 'vite.js');

function viteBuild(extra: readonly string[] = []): void {
  const args = [VITE, 'build', '--logLevel', 'warn', ...extra];
  const r = spawnSync(process.execPath, args, { cwd: ROOT, stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`vite build failed (exit ${r.status ?? r.signal})`);
}

function ensureRenderer(): void {
  const sources = ['src-renderer', 'src-main/api', 'src-main/core'].map((d) => path.join(ROOT, d));
  if (!rendererNeedsBuild(RENDERER_DIST, sources)) return;
  console.log('Building the page (vite build)...');
  viteBuild();
}

function launchElectron(binary: string, workspace: string): void {
  const mainJs = path.join(ROOT, 'dist-electron', 'main.cjs');
  const config = path.join(ROOT, 'src-main/shell/electron/vite.electron.config.ts');
  for (const mode of ['main', 'preload']) viteBuild(['--config', config, '--mode', mode]);
  console.log(`Opening Shelfwright (Electron) on ${workspace}`);
  const child = spawn(binary, [mainJs, '--workspace', workspace], { cwd: ROOT, stdio: 'inherit' });
  child.on('exit', (code) => process.exit(code ?? 0));
}

async function launchWeb(args: StartArgs, workspace: string): Promise<void> {
  // A synchronous write waiting for another process blocks the page's every request: kept short here.
  const ctx = new AppContext({ blockingWaitMs: APP_BLOCKING_WAIT_MS });
  ctx.open(workspace, { create: true });
  // Files the page streams to POST /upload land in the context's store; ctx.close() removes them.
  const shell = await startWebShell({ table: createHandlerTable(ctx), uploads: ctx.uploads, staticDir: RENDERER_DIST, port: args.port });
  console.log(`Shelfwright is running at ${shell.pageUrl}`);
  console.log('Press Ctrl+C to stop.');
  const stop = async () => {
    await shell.close();
    ctx.close();
    process.exit(0);
  };
  process.on('SIGINT', () => void stop());
  process.on('SIGTERM', () => void stop());
  if (args.noBrowser) return;
  const browser = findChromium(process.env.PATH);
  if (!browser) {
    console.log('No Chromium or Chrome found on PATH: open the address above in a browser.');
    return;
  }
  const profile = makeTempFolder('profile');
  // The browser is started on a private forwarding page, never on the address with the token: its command
  // line is visible to every account on the machine (launch/launch-page.ts).
  openAppWindow({
    browser,
    args: chromiumAppArgs(writeLaunchPage(profile, shell.pageUrl), profile),
    say: (line) => console.log(line),
    onGone: () => fs.rmSync(profile, { recursive: true, force: true }),
    // Closing the app window ends the session; a window that never opened does not (launch/app-window.ts).
    onClosed: () => void stop(),
  });
}

async function main(): Promise<void> {
  const args = parseStartArgs(process.argv.slice(2));
  const workspace = path.resolve(args.workspace ?? path.join(ROOT, '.workspaces', 'demo.sqlite'));
  sweepTempFolders(); // what a killed earlier run left behind (services/temp-folders.ts)
  ensureRenderer();
  if (!fs.existsSync(workspace)) console.log(`First launch: building the demo workspace at ${workspace}`);
  await ensureDemo(workspace);
  let electron = args.web || args.noBrowser ? null : findElectronBinary(ROOT);
  if (electron && !electronNativeBinding(ROOT)) {
    // Without its own better-sqlite3 build Electron would fail to load the Node one (ABI mismatch).
    console.log('Electron is installed but build/electron/better_sqlite3.node is missing: run `npm run rebuild:electron`. Using the web shell.');
    electron = null;
  }
  if (electron) launchElectron(electron, workspace);
  else await launchWeb(args, workspace);
}

main().catch((e: unknown) => {
  console.error(e instanceof InputError ? e.describe() : `shelfwright: ${(e as Error).message}`);
  process.exit(1);
});
