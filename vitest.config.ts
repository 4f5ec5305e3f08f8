import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Unit and API tests: what `npm test` runs. Browser and reliability suites have their own configs.
// The server's worker threads, its CLI and server/index.ts are compiled once per run
// (tests/setup/compile-once.ts) and the tests start them from that build. The full demo seed (two
// 60,000-account analyses at 2,000 replicates) is in the reliability suite; here the demo
// scenario runs with a small bootstrap (tests/api/demo-seed.test.ts).
export default defineConfig({
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
      '@server': fileURLToPath(new URL('./server', import.meta.url)),
    },
  },
  test: {
    include: ['tests/unit/**/*.test.ts', 'tests/api/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['tests/setup/compile-once.ts'],
    setupFiles: ['tests/setup/use-compiled-workers.ts'],
    pool: 'forks',
    maxWorkers: 2,
    // Generous bounds: the suite must stay green on a shared 2-core machine with other work beside
    // it; a test that passes takes no longer for them.
    testTimeout: 120_000,
    hookTimeout: 120_000,
  },
});
