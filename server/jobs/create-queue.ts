import type { DataSource } from 'typeorm';
import { databaseAddress, type Config } from '../config';
import type { Logger } from '../log';
import type { JobHandlers } from './handlers';
import type { AnalysisQueue } from './queue';
import { JobRunner } from './runner';

/**
 * The analysis queue for this process. SQLite: the in-process queue (runner.ts), ANALYSIS_CONCURRENCY
 * analyses at once. PostgreSQL: pg-boss (boss-queue.ts); `workers` analyses at once in this
 * process (0: it only queues them, for worker processes to run).
 */
export async function createAnalysisQueue(deps: { config: Config; dataSource: DataSource; log: Logger; handlers: JobHandlers; workers: number }): Promise<AnalysisQueue> {
  const { config, dataSource, log, handlers } = deps;
  const runner = new JobRunner({
    dataSource,
    databasePath: databaseAddress(config),
    concurrency: Math.max(1, deps.workers),
    log,
    handlers,
    takesQueuedRuns: !config.databaseUrl,
  });
  if (!config.databaseUrl) return runner;
  // pg-boss is loaded only for PostgreSQL: a SQLite server starts without it.
  const { BossQueue } = await import('./boss-queue');
  // The supervisor that expires leases runs a few times per lease (pg-boss takes an advisory lock: one process at a time).
  const superviseSeconds = Math.max(1, Math.min(30, Math.floor(config.analysisLeaseSeconds / 4)));
  return new BossQueue({
    dataSource,
    databaseUrl: config.databaseUrl,
    runner,
    log,
    workers: deps.workers,
    leaseSeconds: config.analysisLeaseSeconds,
    stallSeconds: config.analysisStallSeconds,
    superviseSeconds,
  });
}
