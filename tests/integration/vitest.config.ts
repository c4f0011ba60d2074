import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

/** Integration tests: the real PostgreSQL test database and the test server that `npm test` starts. */
export default defineConfig({
  resolve: { alias: { '~': fileURLToPath(new URL('../../src', import.meta.url)) } },
  test: {
    include: ['tests/integration/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
