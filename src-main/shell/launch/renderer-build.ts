import fs from 'node:fs';
import path from 'node:path';

/** Newest modification time of any file under `dir` (0 when it does not exist). */
export function newestMtime(dir: string): number {
  let newest = 0;
  let entries: fs.Dirent[];
  try {
    entries = fs.readdirSync(dir, { withFileTypes: true });
  } catch {
    return 0;
  }
  for (const e of entries) {
    const full = path.join(dir, e.name);
    const t = e.isDirectory() ? newestMtime(full) : fs.statSync(full).mtimeMs;
    if (t > newest) newest = t;
  }
  return newest;
}

/**
 * True when the built page is missing or older than any renderer source (or the api contracts it
 * bundles). Kept simple on purpose: a stale check by modification time, not a content hash.
 */
export function rendererNeedsBuild(distDir: string, sourceDirs: readonly string[]): boolean {
  const index = path.join(distDir, 'index.html');
  if (!fs.existsSync(index)) return true;
  const built = fs.statSync(index).mtimeMs;
  return sourceDirs.some((d) => newestMtime(d) > built);
}
