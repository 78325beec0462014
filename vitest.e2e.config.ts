import { defineConfig } from 'vitest/config';

/** Browser tests: Debian's Chromium driven by playwright-core against the real server. One at a time. */
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    testTimeout: 600_000,
    hookTimeout: 300_000,
    pool: 'forks',
    maxWorkers: 1,
    fileParallelism: false,
    sequence: { concurrent: false },
  },
});
