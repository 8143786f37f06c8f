import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '../../..');

/**
 * The task threads, started by `siblingModule(import.meta.url, name)` (services/train/worker-task.ts): in
 * the bundle that URL is dist-electron/main.cjs (or a worker's own file), so each worker must sit beside
 * it as `<name>.js`, an ES module (package.json says "type": "module").
 */
export const WORKERS: Record<string, string> = {
  'train-worker': 'src-main/services/train/train-worker.ts',
  'ials-worker': 'src-main/services/train/ials-worker.ts',
  'ease-worker': 'src-main/services/train/ease-worker.ts',
  'ease-inverse-worker': 'src-main/services/train/ease-inverse-worker.ts',
  'offline-worker': 'src-main/services/tune/offline-worker.ts',
  'signal-worker': 'src-main/ingest/signal-worker.ts',
};

const external = ['electron', 'better-sqlite3', 'sharp', ...builtinModules, ...builtinModules.map((m) => `node:${m}`)];

/**
 * Three builds, one per `--mode`: `main` (the main process; Node built-ins, electron and better-sqlite3
 * stay external), `preload` (one self-contained file: a sandboxed preload can require only 'electron') and
 * `workers` (the task threads).
 * Run: vite build --config src-main/shell/electron/vite.electron.config.ts --mode main|preload|workers
 */
export default defineConfig(({ mode }) => {
  const entry = mode === 'preload' ? 'preload' : 'main';
  const lib =
    mode === 'workers'
      ? {
          entry: Object.fromEntries(Object.entries(WORKERS).map(([name, file]) => [name, path.join(root, file)])),
          formats: ['es' as const],
          fileName: (_format: string, name: string) => `${name}.js`,
        }
      : { entry: path.join(here, `${entry}.ts`), formats: ['cjs' as const], fileName: () => `${entry}.cjs` };
  return {
    root,
    publicDir: false,
    // Node's export conditions (hyparquet's file reader and writer exist only under 'node').
    resolve: { conditions: ['node', 'module', 'import', 'default'] },
    build: {
      outDir: path.join(root, 'dist-electron'),
      emptyOutDir: false,
      target: 'node22',
      minify: false,
      sourcemap: false,
      lib,
      rollupOptions: { external },
    },
  };
});
