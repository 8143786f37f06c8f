// Starts one entry of the Node build (dist-node/<name>.js, written by `npm run build:node`, which `npm install`
// runs) when that build is newer than every source it was made from; otherwise runs the TypeScript source
// through tsx, saying so in one line on stderr, so an edited source never runs as stale built code.
// SHELFWRIGHT_FROM_SOURCE=1 runs the source without the note (the test suite sets it: tests run the sources).
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
/** Everything the build reads from the repository: the main-process sources and the demo shop's generator. */
export const BUILD_INPUTS = ['src-main', 'demo-data/generator'];

/** The newest mtime (ms) under `p`: files and folders (a deleted file changes its folder's mtime). */
function newest(p) {
  let stat;
  try {
    stat = fs.statSync(p);
  } catch {
    return 0;
  }
  let t = stat.mtimeMs;
  if (stat.isDirectory()) for (const e of fs.readdirSync(p)) t = Math.max(t, newest(path.join(p, e)));
  return t;
}

/** Why dist-node/ cannot be used (a short phrase), or null when it is up to date. */
export function staleReason(distDir = path.join(ROOT, 'dist-node')) {
  let started;
  try {
    started = JSON.parse(fs.readFileSync(path.join(distDir, 'built.json'), 'utf8')).started;
  } catch {
    return 'the command line is not built';
  }
  const edited = BUILD_INPUTS.map((p) => newest(path.join(ROOT, p)));
  return Math.max(...edited) > started ? 'sources changed since the last build' : null;
}

/** Runs dist-node/<name>.js, or `source` (relative to the project folder) through tsx. */
export async function launch(name, source) {
  const fromSource = process.env.SHELFWRIGHT_FROM_SOURCE === '1';
  const reason = fromSource ? 'SHELFWRIGHT_FROM_SOURCE=1' : staleReason();
  if (reason === null) {
    await import(pathToFileURL(path.join(ROOT, 'dist-node', `${name}.js`)).href);
    return;
  }
  if (!fromSource) process.stderr.write(`shelfwright: ${reason}; running from sources (slower; \`npm run build:node\` builds it)\n`);
  let tsx;
  try {
    tsx = await import('tsx/esm/api');
  } catch {
    process.stderr.write('shelfwright: tsx is not installed either: run `npm install` in the project folder\n');
    process.exit(1);
  }
  tsx.register();
  await import(pathToFileURL(path.join(ROOT, source)).href);
}
