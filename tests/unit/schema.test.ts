import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { openDatabase } from '@server/db/data-source';
import { createTestDatabase, onPostgres } from '../setup/test-database';

describe('database schema', () => {
  it('after the migrations, matches the entities exactly (TypeORM finds nothing to change)', async () => {
    const dataSource = await openDatabase(':memory:');
    const pending = await dataSource.driver.createSchemaBuilder().log();
    expect(pending.upQueries.map((query) => query.query)).toEqual([]);
    await dataSource.destroy();
  });

  it('runs with foreign keys on and every migration applied once', async () => {
    const dataSource = await openDatabase(':memory:');
    expect(await dataSource.query('PRAGMA foreign_keys')).toEqual([{ foreign_keys: 1 }]);
    expect(await dataSource.showMigrations()).toBe(false);
    await dataSource.destroy();
  });

  // The same history on PostgreSQL (TEST_DATABASE_URL): the schema TypeORM would make from the
  // entities (read with PostgreSQL's types: db/postgres.ts) is the one the migrations made.
  it.runIf(onPostgres)('on PostgreSQL, the same migrations give the entities’ schema, run once by instances starting together', async () => {
    const directory = mkdtempSync(join(tmpdir(), 'scorecourt-schema-'));
    // An empty database (not the suite's migrated template): the real migrations run here.
    const database = await createTestDatabase(directory, 'test.sqlite', { empty: true });
    try {
      // Three instances starting at once: the advisory lock lets one migrate, the others find nothing left.
      const sources = await Promise.all([0, 1, 2].map(() => openDatabase(database.address)));
      const [dataSource] = sources;
      const pending = await dataSource.driver.createSchemaBuilder().log();
      expect(pending.upQueries.map((query) => query.query)).toEqual([]);
      expect(await dataSource.showMigrations()).toBe(false);
      const applied = (await dataSource.query('SELECT "name" FROM "migrations" ORDER BY "id"')) as { name: string }[];
      expect(applied.map((row) => row.name)).toEqual(dataSource.migrations.map((migration) => migration.name));
      const types = (await dataSource.query(
        `SELECT "table_name", "column_name", "data_type" FROM information_schema.columns WHERE table_schema = current_schema() AND ` +
          `("table_name", "column_name") IN (('audit_events', 'createdAt'), ('holdout_chunks', 'data'), ('cutoff_scenarios', 'approvalRate'))`,
      )) as { table_name: string; data_type: string }[];
      expect(Object.fromEntries(types.map((row) => [row.table_name, row.data_type]))).toEqual({
        audit_events: 'timestamp with time zone',
        holdout_chunks: 'bytea',
        cutoff_scenarios: 'double precision',
      });
      for (const source of sources) await source.destroy();
    } finally {
      await database.drop();
      rmSync(directory, { recursive: true, force: true });
    }
  });
});
