import type { DataSource } from 'typeorm';

/**
 * What PostgreSQL needs besides SQLite's setup (data-source.ts).
 *
 * Column types: the entities name SQLite's types. Three have no PostgreSQL type of that name or
 * mean something else there, and are read as:
 * - `datetime` → `timestamptz` (an instant: the server stores UTC, whatever the session's zone);
 * - `blob` → `bytea` (typed-array columns, file chunks, committee-pack PDFs);
 * - `real` → `double precision` (SQLite's REAL is 8 bytes; PostgreSQL's `real` is 4, which would
 *   round cut-offs and rates).
 * TypeORM checks the types while it initialises, so the two unknown names are accepted there and
 * every column is given its PostgreSQL type right after (before any query).
 */

export const postgresColumnTypes: Record<string, string> = {
  datetime: 'timestamptz',
  blob: 'bytea',
  real: 'double precision',
};

/** Call on a new PostgreSQL data source, before `initialize()`. */
export function portableColumnTypes(dataSource: DataSource): void {
  const driver = dataSource.driver as unknown as { supportedDataTypes: string[] };
  for (const type of Object.keys(postgresColumnTypes)) if (!driver.supportedDataTypes.includes(type)) driver.supportedDataTypes.push(type);
  const initialize = dataSource.initialize.bind(dataSource);
  dataSource.initialize = async () => {
    await initialize();
    for (const metadata of dataSource.entityMetadatas) {
      for (const column of metadata.columns) {
        const mapped = typeof column.type === 'string' ? postgresColumnTypes[column.type] : undefined;
        if (mapped) column.type = mapped as typeof column.type;
      }
    }
    return dataSource;
  };
}

/** The advisory-lock keys Scorecourt takes (any 64-bit numbers, fixed here so they never collide). */
export const advisoryLocks = {
  /** Held while the migrations run (one instance at a time). */
  migrations: 18_640_001,
  /** Held by every write unit (db/transaction.ts): the writes of all instances in one order, as SQLite's one writer. */
  writes: 18_640_002,
} as const;

/** Runs the pending migrations, each in its own transaction, holding the migrations lock on a connection of its own. */
export async function runMigrationsLocked(dataSource: DataSource): Promise<void> {
  const runner = dataSource.createQueryRunner();
  await runner.connect();
  try {
    await runner.query('SELECT pg_advisory_lock($1)', [advisoryLocks.migrations]);
    try {
      await dataSource.runMigrations({ transaction: 'each' });
    } finally {
      await runner.query('SELECT pg_advisory_unlock($1)', [advisoryLocks.migrations]);
    }
  } finally {
    await runner.release();
  }
}
