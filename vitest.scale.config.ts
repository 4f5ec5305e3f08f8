import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// `npm run test:scale` (after `npm run build:server`): two servers and two worker processes on one
// PostgreSQL database (TEST_DATABASE_URL; `.ci/run` starts one). Started from dist/.
export default defineConfig({
  resolve: {
    alias: {
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
      '@server': fileURLToPath(new URL('./server', import.meta.url)),
    },
  },
  test: {
    include: ['tests/scale/**/*.test.ts'],
    environment: 'node',
    pool: 'forks',
    maxWorkers: 1,
    testTimeout: 2_400_000,
    hookTimeout: 600_000,
  },
});
