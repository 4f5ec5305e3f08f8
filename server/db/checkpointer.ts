import type { Worker } from 'node:worker_threads';
import type { DataSource } from 'typeorm';
import type { Logger } from '../log';
import { startWorker } from '../runtime';

/**
 * WAL checkpoints off the request thread. SQLite normally checkpoints at the end of the commit that
 * takes the WAL past 1000 pages: on our single connection that is a synchronous copy of the WAL
 * into the database file (and an fsync) on the thread that answers requests — a few hundred
 * milliseconds after a large write such as a holdout's columns. With the checkpointer running, the
 * connection's automatic checkpoints are off (`wal_autocheckpoint = 0`) and a worker thread with
 * its own connection runs a passive checkpoint every second (jobs/checkpoint-worker.ts). If that
 * worker stops, automatic checkpoints come back on. Not for a database in memory.
 */
export class WalCheckpointer {
  private worker: Worker | null = null;

  constructor(
    private readonly dataSource: DataSource,
    private readonly databasePath: string,
    private readonly log: Logger,
    private readonly everyMs = 1000,
  ) {}

  async start(): Promise<void> {
    if (this.worker || this.databasePath === ':memory:') return;
    const worker = startWorker('server/jobs/checkpoint-worker', { workerData: { databasePath: this.databasePath, everyMs: this.everyMs } });
    this.worker = worker;
    worker.on('message', (message: { error?: string }) => {
      if (message.error) this.log.warn(`WAL checkpoint: ${message.error}`);
    });
    worker.on('error', (error) => this.log.error('the WAL checkpointer failed', error));
    worker.once('exit', () => {
      if (this.worker !== worker) return;
      this.worker = null;
      // Back to SQLite's own checkpoints, so the WAL cannot grow without bound.
      if (this.dataSource.isInitialized) void this.dataSource.query('PRAGMA wal_autocheckpoint = 1000').catch(() => undefined);
    });
    await this.dataSource.query('PRAGMA wal_autocheckpoint = 0');
  }

  async stop(): Promise<void> {
    const worker = this.worker;
    if (!worker) return;
    this.worker = null;
    const exited = new Promise<void>((resolve) => worker.once('exit', () => resolve()));
    worker.postMessage('stop');
    const timeout = setTimeout(() => void worker.terminate(), 5000);
    await exited;
    clearTimeout(timeout);
    if (this.dataSource.isInitialized) await this.dataSource.query('PRAGMA wal_autocheckpoint = 1000');
  }
}
