import { describe, expect, it } from 'vitest';
import { openDatabase } from '@server/db/data-source';

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
});
