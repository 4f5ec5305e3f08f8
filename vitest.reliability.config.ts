import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// The reliability suites (`npm run test:reliability`, which builds first): bad input as property
// tests, faults (dying workers, SIGKILL of the compiled server, SMTP down), load on loopback, and
// security checks generated from the route registry. One file at a time, so the load figures are
// not measured against the other suites.
export default defineConfig({
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
      '@server': fileURLToPath(new URL('./server', import.meta.url)),
    },
  },
  test: {
    include: ['tests/reliability/**/*.test.ts'],
    environment: 'node',
    pool: 'forks',
    maxWorkers: 1,
    fileParallelism: false,
    testTimeout: 180_000,
    hookTimeout: 120_000,
  },
});
