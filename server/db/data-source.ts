import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { guardConnection } from './connection-guard';
import { isPostgresAddress } from './driver';
import { entities } from './entities/index';
import { migrations } from './migrations/index';
import { portableColumnTypes, runMigrationsLocked } from './postgres';

/**
 * The database through TypeORM: SQLite on better-sqlite3 (a file path; the embedded default) or
 * PostgreSQL through `pg` (a `postgres://` URL, DATABASE_URL). The same entities and the same
 * migrations on both (postgres.ts and migrations/portable.ts say what differs). Schema only
 * through migrations (`synchronize: false`).
 *
 * SQLite: WAL journal, foreign keys on, a busy timeout.
 */
export function createDataSource(address: string): DataSource {
  if (isPostgresAddress(address)) {
    const dataSource = new DataSource({
      type: 'postgres',
      url: address,
      entities,
      migrations,
      migrationsTableName: 'migrations',
      synchronize: false,
      logging: false,
      applicationName: 'scorecourt',
      extra: { max: 10 },
    });
    portableColumnTypes(dataSource);
    return dataSource;
  }
  return new DataSource({
    type: 'better-sqlite3',
    database: address,
    entities,
    migrations,
    migrationsTableName: 'migrations',
    synchronize: false,
    enableWAL: true,
    timeout: 5000,
    prepareDatabase: (db: { pragma(source: string): unknown }) => {
      db.pragma('busy_timeout = 5000');
      db.pragma('synchronous = NORMAL');
    },
    logging: false,
  });
}

/**
 * Opens the database and brings its schema up to date. On PostgreSQL several instances may start
 * at once: the migrations run under an advisory lock, by one instance at a time (the others then
 * find nothing left to run).
 */
export async function openDatabase(address: string): Promise<DataSource> {
  const dataSource = createDataSource(address);
  await dataSource.initialize();
  if (dataSource.options.type === 'postgres') {
    await runMigrationsLocked(dataSource);
    return dataSource;
  }
  guardConnection(dataSource);
  await dataSource.runMigrations({ transaction: 'each' });
  return dataSource;
}
