import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import pg from 'pg';

/**
 * The database a test opens: a SQLite file in the test's folder, or, when TEST_DATABASE_URL names a
 * PostgreSQL server (`.ci/run` starts one), a fresh database of its own on it (dropped afterwards).
 * Its own database, not a schema of a shared one: PostgreSQL's advisory locks belong to a database,
 * so the write lock (db/transaction.ts) and the migrations lock of one test file never wait for
 * another file's running beside it, and the app runs in the `public` schema as in production.
 *
 * Under vitest.postgres.config.ts the migrations run once per run into a template database
 * (tests/setup/postgres-template.ts, which names it in TEST_DATABASE_TEMPLATE) and each test's
 * database is a copy of it (`CREATE DATABASE … TEMPLATE …`): openDatabase then finds every migration
 * applied. `{ empty: true }` gives an empty database instead, where openDatabase runs the real
 * migrations (the schema test, and the scale test and benchmark, which have no template).
 */

export const testDatabaseUrl: string | undefined = process.env.TEST_DATABASE_URL || undefined;

export const onPostgres = testDatabaseUrl !== undefined;

export interface TestDatabase {
  /** What openDatabase / DATABASE_URL take. */
  address: string;
  /** Removes the PostgreSQL database (SQLite files go with the test's folder). */
  drop(): Promise<void>;
}

/** `url` with its database name replaced by `database`. */
export function urlWithDatabase(url: string, database: string): string {
  const parsed = new URL(url);
  parsed.pathname = `/${encodeURIComponent(database)}`;
  return parsed.toString();
}

/** Runs `sql` on the server's maintenance connection (TEST_DATABASE_URL's own database). */
export async function onServer(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: testDatabaseUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export async function createTestDatabase(directory: string, file = 'test.sqlite', options: { empty?: boolean } = {}): Promise<TestDatabase> {
  if (!testDatabaseUrl) return { address: join(directory, file), drop: async () => undefined };
  const name = `test_${randomBytes(6).toString('hex')}`;
  const template = options.empty ? undefined : process.env.TEST_DATABASE_TEMPLATE;
  // Without a template, PostgreSQL copies template1: an empty database.
  await onServer(`CREATE DATABASE "${name}"${template ? ` TEMPLATE "${template}"` : ''}`);
  return {
    address: urlWithDatabase(testDatabaseUrl, name),
    // FORCE ends what a test left connected (a killed process's sessions, an unclosed pool).
    drop: () => onServer(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`),
  };
}

/** Drops a trigger as an attacker with database access would (PostgreSQL names its table too). */
export async function dropTrigger(dataSource: { query(sql: string): Promise<unknown> }, table: string, trigger: string): Promise<void> {
  await dataSource.query(onPostgres ? `DROP TRIGGER "${trigger}" ON "${table}"` : `DROP TRIGGER "${trigger}"`);
}
