import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.{ts,tsx}'],
    environment: 'node',
    pool: 'forks',
    setupFiles: ['test/setup-fast-check.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
