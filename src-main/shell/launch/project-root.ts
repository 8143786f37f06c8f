import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The project folder (the nearest one holding package.json) above a module. A fixed `../..` would differ
 * between the source (src-main/shell/start.ts) and the Node build (dist-node/start.js), so it is searched.
 */
export function projectRoot(moduleUrl: string): string {
  let dir = path.dirname(fileURLToPath(moduleUrl));
  for (;;) {
    if (fs.existsSync(path.join(dir, 'package.json'))) return dir;
    const up = path.dirname(dir);
    if (up === dir) throw new Error(`no package.json above ${fileURLToPath(moduleUrl)}`);
    dir = up;
  }
}
