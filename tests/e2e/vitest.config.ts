import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

/** Browser tests: Debian's Chromium driven by playwright-core against the test server. */
export default defineConfig({
  resolve: { alias: { '~': fileURLToPath(new URL('../../src', import.meta.url)) } },
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    testTimeout: 90_000,
    hookTimeout: 60_000,
    fileParallelism: false,
    // One retry: on a loaded 2-core machine a browser step can miss its 30 s wait; a second
    // failure is a real one. Vitest reports retried tests, so flakiness stays visible.
    retry: 1,
  },
});
