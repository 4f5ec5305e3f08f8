import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Unit and API tests: what `npm test` runs. Browser and reliability suites have their own configs.
// The server's worker threads, its CLI and server/index.ts are compiled once per run
// (tests/setup/compile-once.ts) and the tests start them from that build. The full demo seed (two
// 60,000-account analyses at 2,000 replicates) is in the reliability suite only.
export default defineConfig({
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
      '@server': fileURLToPath(new URL('./server', import.meta.url)),
    },
  },
  test: {
    include: ['tests/unit/**/*.test.{ts,tsx}', 'tests/api/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['tests/setup/compile-once.ts'],
    setupFiles: ['tests/setup/use-compiled-workers.ts', 'tests/setup/dom-tests.ts'],
    pool: 'forks',
    maxWorkers: 2,
    // Each worker keeps its loaded modules from one test file to the next instead of importing the
    // server (TypeORM, Express, the engine) afresh for every file: on ten API files this cut the CPU
    // time 2.3× (63 s → 27 s, measured back to back on the shared machine). Test files share no
    // state through modules: every app, database, cache and lock belongs to its own DataSource.
    // For the same reason vi.mock is refused by lint in tests: a module an earlier file loaded stays real.
    isolate: false,
    // Generous bounds, one for the whole suite (tests set a longer one only where they need more):
    // the suite must stay green on a shared 2-core machine with other work beside it (at load 40 a
    // 15-second test took 95 s); a test that passes takes no longer for them.
    testTimeout: 300_000,
    hookTimeout: 300_000,
  },
});
