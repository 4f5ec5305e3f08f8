import type { DataSource } from 'typeorm';
import { noteWriteFailure } from './write-health';

/**
 * Keeps the one SQLite connection honest after a failed COMMIT or a failed statement.
 *
 * TypeORM's better-sqlite3 driver shares one query runner, and counts transaction depth itself.
 * When SQLite gives up a transaction on its own (a COMMIT that fails with SQLITE_FULL or
 * SQLITE_IOERR rolls the whole transaction back), TypeORM's following ROLLBACK fails with "no
 * transaction is active", the failure is swallowed, and the runner keeps believing it is inside a
 * transaction: the next transaction becomes a SAVEPOINT, whose RELEASE starts an outer transaction
 * that is never committed again. Every later write was answered 201 and lost at the next stop.
 *
 * The guard wraps the shared runner:
 * - a statement that fails while the runner believes in a transaction SQLite has already dropped
 *   opens a fresh transaction at once (so nothing after it is committed on its own) and marks the
 *   unit lost: its final COMMIT refuses, and the caller's rollback discards the rest;
 * - every rollback of the outermost level ends with the connection verified out of any
 *   transaction (better-sqlite3 `inTransaction`), rolled back by hand if TypeORM's own rollback
 *   failed, and the runner's count reset to zero;
 * - a COMMIT that returns while the connection is still inside a transaction is refused;
 * - if the connection still cannot be brought out of its transaction, nothing more may be
 *   acknowledged: `onUnrecoverable` runs (the server exits for its supervisor to restart it).
 * Storage failures are recorded for /api/health (write-health.ts).
 */

interface RawConnection {
  inTransaction: boolean;
  exec(sql: string): unknown;
}

interface GuardedRunner {
  isTransactionActive: boolean;
  transactionDepth: number;
  query(...args: unknown[]): Promise<unknown>;
  commitTransaction(): Promise<void>;
  rollbackTransaction(): Promise<void>;
}

export class TransactionLostError extends Error {
  /** Classified as the failure that lost the transaction (e.g. SQLITE_FULL → 507: storage-errors.ts reads `driverError`). */
  readonly driverError: unknown;
  constructor(failure: unknown) {
    super('SQLite rolled back the transaction after a failed statement; nothing of it was stored.', { cause: failure });
    this.name = 'TransactionLostError';
    this.driverError = failure;
  }
}

export type UnrecoverableHandler = (reason: string, error: unknown) => void;

/** Logs to stderr (if it can) and exits with status 70: the supervisor starts a clean process. */
export const exitProcess: UnrecoverableHandler = (reason, error) => {
  try {
    process.stderr.write(`Scorecourt stops: ${reason}\n${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
  } catch {
    // the log target may be the thing that failed
  }
  process.exit(70);
};

const guarded = new WeakSet<object>();
const handlers = new WeakMap<DataSource, UnrecoverableHandler>();

/** What the guard does when the connection cannot be made clean (tests replace the exit). */
export function onUnrecoverable(dataSource: DataSource, handler: UnrecoverableHandler): void {
  handlers.set(dataSource, handler);
}

export function rawConnection(dataSource: DataSource): RawConnection {
  return (dataSource.driver as unknown as { databaseConnection: RawConnection }).databaseConnection;
}

export function guardConnection(dataSource: DataSource): void {
  const runner = dataSource.createQueryRunner() as unknown as GuardedRunner;
  if (guarded.has(runner)) return;
  guarded.add(runner);
  const raw = () => rawConnection(dataSource);
  const query = runner.query.bind(runner);
  const commit = runner.commitTransaction.bind(runner);
  const rollback = runner.rollbackTransaction.bind(runner);
  /** Set when SQLite dropped the transaction under the runner; the outermost COMMIT then refuses. */
  let lost: unknown = null;

  const unrecoverable = (reason: string, error: unknown) => {
    (handlers.get(dataSource) ?? exitProcess)(reason, error);
  };

  /** The runner believes in a transaction SQLite no longer has: open one, so nothing autocommits. */
  const coverLostTransaction = (error: unknown) => {
    if (!runner.isTransactionActive || raw().inTransaction) return;
    lost ??= error;
    try {
      raw().exec('BEGIN');
    } catch (beginError) {
      unrecoverable('the database connection lost its transaction and a new one could not be opened', beginError);
    }
  };

  runner.query = async (...args: unknown[]) => {
    try {
      return await query(...args);
    } catch (error) {
      noteWriteFailure(dataSource, error);
      coverLostTransaction(error);
      throw error;
    }
  };

  runner.commitTransaction = async () => {
    if (runner.transactionDepth <= 1 && lost !== null) throw new TransactionLostError(lost);
    await commit();
    if (runner.transactionDepth === 0) {
      if (raw().inTransaction) {
        // COMMIT returned, yet the connection is inside a transaction: nothing may be acknowledged.
        const error = new Error('COMMIT returned while the connection is still inside a transaction');
        runner.isTransactionActive = true;
        runner.transactionDepth = 1;
        throw error;
      }
    }
  };

  runner.rollbackTransaction = async () => {
    const outermost = runner.transactionDepth <= 1;
    let failure: unknown = null;
    try {
      await rollback();
    } catch (error) {
      failure = error;
    }
    if (!outermost) {
      if (failure !== null) runner.transactionDepth -= 1;
      if (!raw().inTransaction) coverLostTransaction(failure);
      if (failure !== null) throw failure;
      return;
    }
    lost = null;
    if (raw().inTransaction) {
      try {
        raw().exec('ROLLBACK');
      } catch (error) {
        failure ??= error;
      }
    }
    runner.isTransactionActive = false;
    runner.transactionDepth = 0;
    if (raw().inTransaction) unrecoverable('the database connection could not be brought out of a failed transaction', failure);
    // The connection is verified clean; a rollback of a transaction SQLite had already ended is not an error.
  };
}

/** True when the shared connection is inside no transaction (checked between units of work). */
export function connectionIsClean(dataSource: DataSource): boolean {
  return !rawConnection(dataSource).inTransaction;
}
