import Database from 'better-sqlite3';
import pg from 'pg';
import { isPostgresAddress, numberedPlaceholders } from './driver';

/**
 * A read-only connection of its own to the database at `address` (a SQLite file or a
 * `postgres://` URL), for worker threads and processes that load a run's columns or a holdout's
 * chunks without going through the main thread's TypeORM data source. SQLite: a read-only
 * better-sqlite3 handle (WAL lets it read while the main thread writes). PostgreSQL: one `pg`
 * client in a read-only session. Queries are written with `?` placeholders.
 */
export interface ReaderConnection {
  all<T>(sql: string, parameters?: unknown[]): Promise<T[]>;
  close(): Promise<void>;
}

export async function openReader(address: string): Promise<ReaderConnection> {
  if (isPostgresAddress(address)) {
    const client = new pg.Client({ connectionString: address, application_name: 'scorecourt-reader' });
    await client.connect();
    await client.query('SET SESSION CHARACTERISTICS AS TRANSACTION READ ONLY');
    return {
      all: async <T>(sql: string, parameters: unknown[] = []) => (await client.query(numberedPlaceholders(sql), parameters)).rows as T[],
      close: () => client.end(),
    };
  }
  const db = new Database(address, { readonly: true, fileMustExist: true });
  db.pragma('busy_timeout = 5000');
  return {
    all: <T>(sql: string, parameters: unknown[] = []) => {
      try {
        return Promise.resolve(db.prepare(sql).all(...parameters) as T[]);
      } catch (error) {
        return Promise.reject(error instanceof Error ? error : new Error(String(error)));
      }
    },
    close: () => {
      db.close();
      return Promise.resolve();
    },
  };
}
