// `npm run dist`: the web shell everywhere, the desktop packages where Electron's binary is installed
// (src-main/shell/packaging/dist-plan.ts decides and words it). `npm run dist -- --desktop` requires the
// desktop packages: without Electron it exits 1 instead of 0.
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { planDist } from '../src-main/shell/packaging/dist-plan.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const requireDesktop = process.argv.includes('--desktop');
const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm';

function step(what: string, cmd: string, args: string[]): void {
  console.log(`dist: ${what}`);
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) {
    console.error(`dist: ${what} failed (exit ${r.status ?? r.signal}); nothing after it was built`);
    process.exit(r.status ?? 1);
  }
}

step('the renderer (dist/renderer)', npm, ['run', 'build']);
step('the command line, web shell and task threads (dist-node/)', process.execPath, [path.join(root, 'scripts/build-node.mjs')]);
const plan = planDist(root);
if (plan.builderArgs) {
  step('the Electron main process, preload and threads (dist-electron/)', npm, ['run', 'build:electron']);
  step("better-sqlite3 for Electron's ABI (build/electron/)", npm, ['run', 'rebuild:electron']);
  step(`electron-builder ${plan.builderArgs.join(' ')}`, process.execPath, [path.join(root, 'node_modules/electron-builder/cli.js'), ...plan.builderArgs]);
}
console.log('dist: web shell: built (dist/renderer, dist-node/); `npm start` serves it on any machine with Node 20');
console.log(`dist: ${plan.desktopNote}`);
process.exit(!plan.builderArgs && requireDesktop ? 1 : 0);
