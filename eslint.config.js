// One lint setup for the whole repository. The layer blocks below enforce DESIGN.md's architecture:
// each layer imports only from layers above it. A waiver needs a comment saying why.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';

const nodeBuiltins = ['node:*', 'fs', 'path', 'os', 'child_process', 'worker_threads', 'crypto', 'stream', 'url'];
const layer = (files, banned, message) => ({
  files,
  rules: {
    'no-restricted-imports': ['error', { patterns: [{ group: banned, message }] }],
  },
});

export default tseslint.config(
  { ignores: ['node_modules/**', 'dist/**', 'dist-electron/**', 'dist-node/**', 'release/**', 'test-results/**', 'reports/**', 'demo-data/out/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  // Plain JavaScript files are Node scripts (the bin launcher, CI helpers).
  {
    files: ['**/*.js', '**/*.mjs'],
    languageOptions: { globals: { process: 'readonly', console: 'readonly', URL: 'readonly' } },
  },
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'no-constant-condition': ['error', { checkLoops: false }],
    },
  },
  layer(
    ['src-main/core/**'],
    [...nodeBuiltins, 'electron', 'better-sqlite3', '**/store/**', '**/ingest/**', '**/services/**', '**/api/**', '**/shell/**'],
    'core is pure TypeScript: no Node, DOM, store or service imports',
  ),
  layer(
    ['src-main/store/**'],
    ['electron', '**/ingest/**', '**/services/**', '**/api/**', '**/shell/**'],
    'store imports only core',
  ),
  layer(
    ['src-main/ingest/**'],
    ['electron', '**/services/**', '**/api/**', '**/shell/**'],
    'ingest imports only core and store',
  ),
  layer(['src-main/services/**'], ['electron', '**/api/**', '**/shell/**'], 'services import core, store and ingest'),
  layer(['src-main/api/**'], ['electron', '**/shell/**'], 'api imports services and below'),
  layer(
    ['src-renderer/**'],
    [...nodeBuiltins, 'electron', 'better-sqlite3', '**/store/**', '**/ingest/**', '**/services/**', '**/shell/**'],
    'the renderer imports only api contracts and core',
  ),
);
