import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';
import base from './vitest.config';

// The tests that touch the database, run again on PostgreSQL (`.ci/run` starts a local one and
// sets TEST_DATABASE_URL): every API test, and every unit test that opens its database through
// tests/setup/test-database.ts (found by reading the files, so a new one is run here too). Each
// test file gets a database of its own, copied from a template the migrations ran into once
// (tests/setup/postgres-template.ts). Left out, as they concern SQLite's file or no database: the
// server's start-up on a database file (server-start; `npm run test:scale` starts servers on
// PostgreSQL) and the route-docs drift check; the unit tests of the WAL checkpointer, the
// failed-COMMIT guard and the disk-full writer open SQLite files directly. The
// base config's other settings are kept; its `include` is replaced, not extended (mergeConfig
// would concatenate the lists).
if (!process.env.TEST_DATABASE_URL) {
  throw new Error('vitest.postgres.config.ts runs the database tests on PostgreSQL: set TEST_DATABASE_URL=postgres://user@127.0.0.1:port/database (.ci/run starts one).');
}

const root = fileURLToPath(new URL('.', import.meta.url));

/** The unit tests that open a database through tests/setup/test-database.ts (paths from the project's root). */
function unitTestsOnTheDatabase(dir = join(root, 'tests', 'unit')): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) return unitTestsOnTheDatabase(path);
    return /\.test\.tsx?$/.test(entry.name) && /setup\/test-database['"]/.test(readFileSync(path, 'utf8')) ? [relative(root, path)] : [];
  });
}

export default defineConfig({
  ...base,
  test: {
    ...base.test,
    include: ['tests/api/**/*.test.ts', ...unitTestsOnTheDatabase()],
    globalSetup: [...[base.test?.globalSetup ?? []].flat(), 'tests/setup/postgres-template.ts'],
    exclude: ['**/node_modules/**', 'tests/api/server-start.test.ts', 'tests/api/route-docs.test.ts'],
  },
});
