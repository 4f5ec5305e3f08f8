import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { guardConnection } from './connection-guard';
import { entities } from './entities/index';
import { migrations } from './migrations/index';

/**
 * The SQLite database through TypeORM on better-sqlite3: WAL journal, foreign keys on, a busy
 * timeout, schema only through migrations (`synchronize: false`).
 */
export function createDataSource(databasePath: string): DataSource {
  return new DataSource({
    type: 'better-sqlite3',
    database: databasePath,
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

/** Opens the database and brings its schema up to date. */
export async function openDatabase(databasePath: string): Promise<DataSource> {
  const dataSource = createDataSource(databasePath);
  await dataSource.initialize();
  guardConnection(dataSource);
  await dataSource.runMigrations({ transaction: 'each' });
  return dataSource;
}
