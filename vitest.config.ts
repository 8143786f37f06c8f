import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.{ts,tsx}'],
    environment: 'node',
    pool: 'forks',
    setupFiles: ['test/setup-fast-check.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    // Tests run the TypeScript sources: bin/shelfwright.js skips the Node build (dist-node/) and its note
    // about a stale build. test/cli/built-cli.test.ts clears it to test the build.
    env: { SHELFWRIGHT_FROM_SOURCE: '1' },
  },
});
