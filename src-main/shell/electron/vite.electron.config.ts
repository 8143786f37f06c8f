import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '../../..');

/**
 * Two bundles, one per `--mode`: `main` (the main process; Node built-ins, electron and better-sqlite3
 * stay external) and `preload` (one self-contained file: a sandboxed preload can require only 'electron').
 * Run: vite build --config src-main/shell/electron/vite.electron.config.ts --mode main|preload
 */
export default defineConfig(({ mode }) => {
  const entry = mode === 'preload' ? 'preload' : 'main';
  return {
    root,
    publicDir: false,
    build: {
      outDir: path.join(root, 'dist-electron'),
      emptyOutDir: false,
      target: 'node22',
      minify: false,
      sourcemap: false,
      lib: { entry: path.join(here, `${entry}.ts`), formats: ['cjs'], fileName: () => `${entry}.cjs` },
      rollupOptions: {
        external: ['electron', 'better-sqlite3', ...builtinModules, ...builtinModules.map((m) => `node:${m}`)],
      },
    },
  };
});
