import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import { WORKERS } from '../electron/vite.electron.config.ts';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '../../..');

/** Package export conditions for code that runs in Node (shared with the Electron build). */
export const NODE_CONDITIONS = ['node', 'module', 'import', 'default'];

/** Where the Node build lands (gitignored); bin/launch.js looks for it there. */
export const NODE_OUT_DIR = path.join(root, 'dist-node');

/**
 * The Node build that `npm install` runs (the `prepare` script): the command line (`cli.js`), the web shell
 * (`start.js`) and every task thread as its own entry, so nothing is compiled when a command runs. One
 * build, so modules shared by the entries sit once in shared chunks. Chunks go in the same folder as the
 * entries: code in a chunk finds its worker with `siblingModule(import.meta.url, name)`, and that URL is the
 * chunk's own. better-sqlite3 and sharp (native addons) and Node's built-ins stay external; electron is never
 * imported on this path (start.ts must not load it).
 */
export default defineConfig({
  root,
  publicDir: false,
  logLevel: 'warn',
  // Node's export conditions, not a browser's: hyparquet and hyparquet-writer export their file readers and
  // writers (asyncBufferFromFile, parquetWriteFile) only under the node condition.
  resolve: { conditions: NODE_CONDITIONS },
  build: {
    outDir: process.env.SHELFWRIGHT_NODE_OUT ?? NODE_OUT_DIR,
    emptyOutDir: true,
    target: 'node20',
    minify: false,
    sourcemap: false,
    reportCompressedSize: false,
    lib: {
      entry: {
        cli: path.join(root, 'src-main/shell/cli/run.ts'),
        start: path.join(root, 'src-main/shell/start.ts'),
        ...Object.fromEntries(Object.entries(WORKERS).map(([name, file]) => [name, path.join(root, file)])),
      },
      formats: ['es'],
      fileName: (_format, name) => `${name}.js`,
    },
    rollupOptions: {
      external: ['better-sqlite3', 'sharp', ...builtinModules, ...builtinModules.map((m) => `node:${m}`)],
      output: { chunkFileNames: 'shared-[hash].js' },
    },
  },
});
