/**
 * `npm run rebuild:electron`: builds a second better-sqlite3 for Electron's ABI into
 * build/electron/better_sqlite3.node, leaving node_modules' Node build untouched (tests and the web shell
 * keep working). It copies the package's sources to a scratch project and runs @electron/rebuild there,
 * so the in-place rebuild that tool normally does cannot replace the Node build.
 * Needs Electron's headers (downloaded by node-gyp from electronjs.org) or a compiler plus a cached copy.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

async function main(): Promise<void> {
  const electronPkg = JSON.parse(fs.readFileSync(path.join(ROOT, 'node_modules/electron/package.json'), 'utf8')) as { version: string };
  const source = path.join(ROOT, 'node_modules/better-sqlite3');
  const scratch = fs.mkdtempSync(path.join(os.tmpdir(), 'sw-electron-native-'));
  try {
    const copy = path.join(scratch, 'node_modules/better-sqlite3');
    fs.cpSync(source, copy, { recursive: true, filter: (f) => !f.includes(`${path.sep}build${path.sep}`) && !f.endsWith(`${path.sep}build`) });
    fs.writeFileSync(path.join(scratch, 'package.json'), JSON.stringify({ name: 'scratch', version: '0.0.0', dependencies: { 'better-sqlite3': '*' } }));
    const { rebuild } = (await import('@electron/rebuild')) as typeof import('@electron/rebuild');
    console.log(`Building better-sqlite3 for Electron ${electronPkg.version} in ${scratch}...`);
    await rebuild({ buildPath: scratch, electronVersion: electronPkg.version, onlyModules: ['better-sqlite3'], force: true, buildFromSource: true });
    const built = path.join(copy, 'build/Release/better_sqlite3.node');
    if (!fs.existsSync(built)) throw new Error(`the rebuild finished but ${built} is missing`);
    const target = path.join(ROOT, 'build/electron/better_sqlite3.node');
    fs.mkdirSync(path.dirname(target), { recursive: true });
    fs.copyFileSync(built, target);
    console.log(`Wrote ${path.relative(ROOT, target)}`);
  } finally {
    fs.rmSync(scratch, { recursive: true, force: true });
  }
}

main().catch((e: unknown) => {
  console.error(`rebuild:electron failed: ${(e as Error).message}`);
  process.exit(1);
});
