import { randomBytes } from 'node:crypto';
import { openDatabase } from '../../server/db/data-source';
import { onServer, testDatabaseUrl, urlWithDatabase } from './test-database';

/**
 * Global set-up of the database tests on PostgreSQL (vitest.postgres.config.ts): runs the
 * migrations once, through openDatabase as a server would, into a template database; each test's
 * database is then a copy of it (tests/setup/test-database.ts), made in a few tens of
 * milliseconds instead of migrating every time. The template is named to the test processes in
 * TEST_DATABASE_TEMPLATE (set before they start) and dropped after the run. The schema test still
 * migrates an empty database itself.
 */
export default async function postgresTemplate(): Promise<() => Promise<void>> {
  if (!testDatabaseUrl) throw new Error('tests/setup/postgres-template.ts needs TEST_DATABASE_URL');
  const name = `scorecourt_template_${randomBytes(6).toString('hex')}`;
  await onServer(`CREATE DATABASE "${name}"`);
  const dataSource = await openDatabase(urlWithDatabase(testDatabaseUrl, name));
  // No connection may stay on a template while it is copied.
  await dataSource.destroy();
  process.env.TEST_DATABASE_TEMPLATE = name;
  return async () => {
    await onServer(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  };
}
