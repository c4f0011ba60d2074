import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

/** Fault drills: they kill and restart processes and their own PostgreSQL, one file at a time. */
export default defineConfig({
  resolve: { alias: { '~': fileURLToPath(new URL('../../src', import.meta.url)) } },
  test: {
    include: ['tests/faults/**/*.test.ts'],
    testTimeout: 240_000,
    hookTimeout: 120_000,
    fileParallelism: false,
  },
});
