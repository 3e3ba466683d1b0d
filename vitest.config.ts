import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    globalSetup: ['test/buildOnce.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    // Two cores: numeric tests are CPU-bound, more workers only thrash.
    maxWorkers: 2,
  },
});
