import { AsyncLocalStorage } from 'node:async_hooks';
import type { DataSource, EntityManager } from 'typeorm';
import { connectionIsClean, rawConnection } from './connection-guard';

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
 */

const queues = new WeakMap<DataSource, Promise<unknown>>();
const current = new AsyncLocalStorage<{ dataSource: DataSource; manager: EntityManager | null }>();

/**
 * Rolls back a transaction a unit left open behind TypeORM's back (the runner believes in none, the
 * connection is in one); true if one was. A transaction TypeORM knows of is left to its owner.
 */
function leftOpen(dataSource: DataSource): boolean {
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
    leftOpen(dataSource);
    throw error;
  }
  if (leftOpen(dataSource)) throw new Error('A unit of work left the database connection inside a transaction; it was rolled back and nothing of it was stored.');
  return result;
}

function enqueue<T>(dataSource: DataSource, unit: () => Promise<T>): Promise<T> {
  const previous = queues.get(dataSource) ?? Promise.resolve();
  const work = () => checked(dataSource, unit);
  const run = previous.then(work, work);
  queues.set(
    dataSource,
    run.then(
      () => undefined,
      () => undefined,
    ),
  );
  return run;
}

/** Runs `work` in one transaction: all of it is stored, or none of it. */
export function inTransaction<T>(dataSource: DataSource, work: (manager: EntityManager) => Promise<T>): Promise<T> {
  const outer = current.getStore();
  if (outer && outer.dataSource === dataSource) {
    if (outer.manager) return work(outer.manager);
    return dataSource.transaction((manager) => current.run({ dataSource, manager }, () => work(manager)));
  }
  return enqueue(dataSource, () =>
    dataSource.transaction((manager) => current.run({ dataSource, manager }, () => work(manager))),
  );
}

/** Runs a single write (or a few that need no atomicity) in turn with the transactions. */
export function withWriteLock<T>(dataSource: DataSource, work: () => Promise<T>): Promise<T> {
  const outer = current.getStore();
  if (outer && outer.dataSource === dataSource) return work();
  return enqueue(dataSource, () => current.run({ dataSource, manager: null }, work));
}
