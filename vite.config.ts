import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

const here = path.dirname(fileURLToPath(import.meta.url));

/**
 * The renderer build. Relative base ('./') so the same files load from the web shell (http://127.0.0.1)
 * and from Electron (file://). Vite 8's Oxc transform handles the automatic JSX runtime without a plugin
 * (notes/toolchain.md).
 */
export default defineConfig({
  root: path.join(here, 'src-renderer'),
  base: './',
  build: {
    outDir: path.join(here, 'dist', 'renderer'),
    emptyOutDir: true,
    target: 'chrome120',
    chunkSizeWarningLimit: 1500,
  },
});
