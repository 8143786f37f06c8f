import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';

/**
 * Where Electron's binary is, or null. Never `require('electron')`: since Electron 42 that starts a
 * download at run time (notes/toolchain.md, Electron). Instead: resolve electron/package.json, read the
 * path.txt its installer writes beside it, and check dist/<path> exists.
 */
export function findElectronBinary(fromDir: string): string | null {
  let pkgJson: string;
  try {
    pkgJson = createRequire(path.join(fromDir, 'noop.js')).resolve('electron/package.json');
  } catch {
    return null;
  }
  const dir = path.dirname(pkgJson);
  let rel: string;
  try {
    rel = fs.readFileSync(path.join(dir, 'path.txt'), 'utf8').trim();
  } catch {
    return null;
  }
  if (rel === '') return null;
  const binary = path.join(dir, 'dist', rel);
  try {
    return fs.statSync(binary).isFile() ? binary : null;
  } catch {
    return null;
  }
}
