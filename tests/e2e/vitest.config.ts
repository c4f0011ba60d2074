import { defineConfig } from 'vitest/config';

/** Browser tests: Debian's Chromium driven by playwright-core against the test server. */
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    testTimeout: 90_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
