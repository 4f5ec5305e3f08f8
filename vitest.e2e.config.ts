import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Browser tests (`npm run test:e2e`, which builds first): the compiled server on a free port with
// a temporary database, driven through Debian's chromium by playwright-core. One file at a time.
export default defineConfig({
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    environment: 'node',
    pool: 'forks',
    maxWorkers: 1,
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
