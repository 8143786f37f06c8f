import fs from 'node:fs';
import path from 'node:path';

/**
 * The better-sqlite3 build made for Electron's ABI by `npm run rebuild:electron`
 * (build/electron/better_sqlite3.node). Node (tests, web shell, CLI) keeps using the normal build in
 * node_modules; both coexist because better-sqlite3 accepts a `nativeBinding` path (its docs/api.md,
 * new Database options). Inside a packaged app the file sits in app.asar.unpacked, since a .node cannot
 * be loaded from inside an asar archive (electron-builder docs, asarUnpack).
 */
export function electronNativeBinding(appRoot: string): string | null {
  const candidates = [path.join(appRoot, 'build', 'electron', 'better_sqlite3.node')];
  if (appRoot.includes('app.asar')) {
    candidates.unshift(path.join(appRoot.replace('app.asar', 'app.asar.unpacked'), 'build', 'electron', 'better_sqlite3.node'));
  }
  return candidates.find((f) => fs.existsSync(f)) ?? null;
}
