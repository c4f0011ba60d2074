import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

/** Unit tests: pure code, no database. Integration and browser suites have their own configs. */
export default defineConfig({
  resolve: { alias: { '~': fileURLToPath(new URL('./src', import.meta.url)) } },
  test: {
    include: ['tests/unit/**/*.test.ts'],
    testTimeout: 30_000,
  },
});
