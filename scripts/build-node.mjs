// `npm run build:node`, also the `prepare` step of `npm install` / `npm ci`: compiles the command line, the web
// shell and the task threads into dist-node/ (src-main/shell/node-build/vite.node.config.ts), so no command
// compiles TypeScript when it runs. Takes seconds, needs no network and no Electron.
// The stamp written last records when the build *started*: bin/launch.js runs the build only while no source
// under STAMPED_SOURCES is newer than that, so an edit made during a build still counts as unbuilt.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const outDir = path.resolve(process.argv[2] ?? path.join(root, 'dist-node'));
const started = Date.now();

let vite;
try {
  vite = await import('vite');
} catch {
  // An install without devDependencies has no bundler; the launcher then runs the sources through tsx.
  console.warn('shelfwright: vite is not installed, so the command line is not built (it will run from sources).');
  process.exit(0);
}
fs.rmSync(path.join(outDir, 'built.json'), { force: true });
process.env.SHELFWRIGHT_NODE_OUT = outDir;
await vite.build({ configFile: path.join(root, 'src-main/shell/node-build/vite.node.config.ts'), logLevel: 'warn' });
fs.writeFileSync(path.join(outDir, 'built.json'), `${JSON.stringify({ started })}\n`);
console.log(`shelfwright: built the command line into ${path.relative(process.cwd(), outDir) || '.'} in ${((Date.now() - started) / 1000).toFixed(1)} s`);
