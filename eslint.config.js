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
  // The renderer sees src-main only through the api contract (contract.ts, contracts/*) and pure core;
  // define.ts holds the contract's shared types, so it may be imported for types only.
  {
    files: ['src-renderer/**'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          {
            group: [...nodeBuiltins, 'electron', 'better-sqlite3'],
            message: 'the renderer imports only api contracts and core',
          },
          {
            regex: String.raw`(^|/)src-main/(?!core/|api/contract\.ts$|api/contracts/|api/define\.ts$)`,
            message: 'the renderer imports only api contracts and core',
          },
          {
            group: ['**/src-main/api/define.ts'],
            allowTypeImports: true,
            message: 'the renderer imports only the types of api/define.ts',
          },
        ],
      }],
    },
  },
  // The shells map a transport onto the handler table; they wire an AppContext (services) and read the
  // workspace lock's wait and words (three store modules), but never open SQLite, ingest or the renderer.
  layer(
    ['src-main/shell/**'],
    ['better-sqlite3', '**/ingest/**', '**/src-renderer/**', '**/store/**', '!**/store/workspace.ts',
      '!**/store/write-lock.ts', '!**/store/store-errors.ts'],
    'shells import api, services for wiring, and core',
  ),
  // The demo generator is a standalone Node script: it shares only pure core with the app.
  {
    files: ['demo-data/**'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['electron', 'better-sqlite3', '**/src-renderer/**'], message: 'demo-data imports only core and its own files' },
          { regex: String.raw`(^|/)src-main/(?!core/)`, message: 'demo-data imports only core and its own files' },
        ],
      }],
    },
  },
  // SQL lives only in store/ (one repository function per statement, named for what it does): no statement is
  // prepared, executed or pragma'd on a connection anywhere else. A regex's own .exec is not a connection.
  {
    files: ['src-main/**', 'src-renderer/**', 'demo-data/**'],
    ignores: ['src-main/store/**'],
    rules: {
      'no-restricted-syntax': ['error',
        { selector: "CallExpression[callee.property.name=/^(prepare|pragma)$/]", message: 'SQL only in src-main/store: call a store function' },
        { selector: "CallExpression[callee.property.name='exec'][callee.object.name=/^(db|database|conn|connection)$/]", message: 'SQL only in src-main/store: call a store function' },
      ],
    },
  },
);
