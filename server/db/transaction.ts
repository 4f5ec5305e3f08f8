import { AsyncLocalStorage } from 'node:async_hooks';
import type { DataSource, EntityManager } from 'typeorm';
import { connectionIsClean, rawConnection } from './connection-guard';
import { isPostgres } from './driver';
import { advisoryLocks } from './postgres';
import { noteWriteFailure } from './write-health';

/**
 * Writes to the database go through here.
 *
 * TypeORM's better-sqlite3 driver has one connection and one shared query runner, so two
 * transactions that overlap in time (an `await` on something slow inside one of them) would nest
 * into each other, and a plain write made meanwhile would join the open transaction. Every write
 * therefore waits its turn on one queue per data source. A call made while already inside
 * `inTransaction` joins the outer transaction instead of waiting for itself.
 *
 * Keep transactions short: no password hashing, network or file I/O inside them.
 *
 * After every unit of work in the queue the connection is verified to be inside no transaction
 * (connection-guard.ts keeps TypeORM's runner honest after a failed COMMIT). A unit that leaves one
 * open is rolled back and refused, so the next unit never joins a transaction that will not commit.
 *
 * On PostgreSQL each transaction has a connection of its own from the pool, and several server
 * instances and worker processes write to the same database. The code was written for SQLite's one
 * writer (the audit chain reads the last hash and appends the next one; claiming a run reads the
 * oldest queued one and marks it; four-eyes checks read then write), so the writes of every
 * process keep one order there too: each unit first takes the `writes` advisory lock
 * (postgres.ts) — a transaction with `pg_advisory_xact_lock` (released at its COMMIT or ROLLBACK),
 * a `withWriteLock` unit with a session lock on a connection held for it (its writes autocommit on
 * other connections, as on SQLite). Reads take no lock and see what is committed. The queue
 * in this process stays, so one process never holds more than one pool connection waiting for the
 * lock. A transaction opened inside a `withWriteLock` unit runs under the lock that unit holds.
 */

/**
 * A data source's write lock: the queue of its units and the unit running now. It is kept on the
 * data source object itself (the one openDatabase made, which the app's context holds), not in
 * this module: it lives and ends with the connection it guards, and every copy of this module
 * (each bundled entry point, a test loading the sources) finds the same lock, so two copies can
 * never write at once or miss that a unit is already inside one.
 */
interface WriteLock {
  tail: Promise<unknown>;
  current: AsyncLocalStorage<{ manager: EntityManager | null }>;
}

const lockKey = Symbol.for('scorecourt.writeLock');

function writeLockOf(dataSource: DataSource): WriteLock {
  const holder = dataSource as DataSource & { [lockKey]?: WriteLock };
  let lock = holder[lockKey];
  if (!lock) {
    lock = { tail: Promise.resolve(), current: new AsyncLocalStorage() };
    Object.defineProperty(holder, lockKey, { value: lock, enumerable: false });
  }
  return lock;
}

/**
 * Rolls back a transaction a unit left open behind TypeORM's back (the runner believes in none, the
 * connection is in one); true if one was. A transaction TypeORM knows of is left to its owner.
 */
function leftOpen(dataSource: DataSource): boolean {
  if (isPostgres(dataSource)) return false;
  if (!dataSource.isInitialized || connectionIsClean(dataSource)) return false;
  const runner = dataSource.createQueryRunner();
  if (runner.isTransactionActive) return false;
  rawConnection(dataSource).exec('ROLLBACK');
  return true;
}

async function checked<T>(dataSource: DataSource, work: () => Promise<T>): Promise<T> {
  let result: T;
  try {
    result = await work();
  } catch (error) {
    // SQLite's failures are noted by the connection guard; PostgreSQL's here (disk full, I/O error).
    if (isPostgres(dataSource)) noteWriteFailure(dataSource, error);
    else leftOpen(dataSource);
    throw error;
  }
  if (leftOpen(dataSource)) throw new Error('A unit of work left the database connection inside a transaction; it was rolled back and nothing of it was stored.');
  return result;
}

function enqueue<T>(dataSource: DataSource, unit: () => Promise<T>): Promise<T> {
  const lock = writeLockOf(dataSource);
  const work = () => checked(dataSource, unit);
  const run = lock.tail.then(work, work);
  lock.tail = run.then(
    () => undefined,
    () => undefined,
  );
  return run;
}

/** Runs `work` in one transaction: all of it is stored, or none of it. */
export function inTransaction<T>(dataSource: DataSource, work: (manager: EntityManager) => Promise<T>): Promise<T> {
  const { current } = writeLockOf(dataSource);
  const outer = current.getStore();
  if (outer) {
    if (outer.manager) return work(outer.manager);
    // Inside a withWriteLock unit: on PostgreSQL that unit already holds the writes lock.
    return dataSource.transaction((manager) => current.run({ manager }, () => work(manager)));
  }
  const locked = isPostgres(dataSource);
  return enqueue(dataSource, () =>
    dataSource.transaction(async (manager) => {
      if (locked) await manager.query('SELECT pg_advisory_xact_lock($1)', [advisoryLocks.writes]);
      return current.run({ manager }, () => work(manager));
    }),
  );
}

/** Runs a single write (or a few that need no atomicity) in turn with the transactions. */
export function withWriteLock<T>(dataSource: DataSource, work: () => Promise<T>): Promise<T> {
  const { current } = writeLockOf(dataSource);
  if (current.getStore()) return work();
  if (!isPostgres(dataSource)) return enqueue(dataSource, () => current.run({ manager: null }, work));
  return enqueue(dataSource, async () => {
    const holder = dataSource.createQueryRunner();
    await holder.connect();
    try {
      await holder.query('SELECT pg_advisory_lock($1)', [advisoryLocks.writes]);
      try {
        return await current.run({ manager: null }, work);
      } finally {
        await holder.query('SELECT pg_advisory_unlock($1)', [advisoryLocks.writes]);
      }
    } finally {
      await holder.release();
    }
  });
}

/** True inside a unit of work (`inTransaction` or `withWriteLock`) on this data source. */
export function insideUnitOfWork(dataSource: DataSource): boolean {
  return writeLockOf(dataSource).current.getStore() !== undefined;
}
