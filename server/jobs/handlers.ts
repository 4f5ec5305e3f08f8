import type { EntityManager } from 'typeorm';
import type { AnalysisRun } from '../db/entities/index';
import type { AnalysisJob, WorkerMessage } from './messages';

/** How a run ended, as the queue reports it to its handlers. */
export type JobOutcome =
  | { status: 'done'; message: Extract<WorkerMessage, { type: 'done' }> }
  | { status: 'failed'; error: string };

/**
 * What the analysis queue (runner.ts) does not know and is given where the app is wired
 * (server/app.ts, server/index.ts; comparisons/analysis-handlers.ts makes them): what a worker
 * needs besides the run, and what happens when a run ends. The queue knows runs, attempts,
 * threads and retries; the handlers know comparisons, verdicts, policies and mail.
 */
export interface JobHandlers {
  /** The engine version stamped on a run when it is claimed. */
  engineVersion: string;
  /** The rest of the worker's input, read in the transaction that claims the run (the adoption policy). */
  jobInput(manager: EntityManager): Promise<Omit<AnalysisJob, 'databasePath' | 'runId' | 'attempt'>>;
  /** Stores a run that ended (done, or failed for good) inside the given transaction; returns the stored run. */
  finished(manager: EntityManager, runId: number, outcome: JobOutcome): Promise<AnalysisRun>;
  /**
   * A run whose result could not be stored (disk full, storage failing): mark it failed with the
   * reason, in a transaction of its own; true if that was stored.
   */
  unstored?(runId: number, cause: unknown): Promise<boolean>;
  /** After that transaction committed (e.g. deliver the e-mail it queued). */
  afterFinished?(): void;
  /** After a done run is stored: keep what the worker prepared (swap sets' data, sort orders). */
  keepPrepared?(run: AnalysisRun, message: Extract<WorkerMessage, { type: 'done' }>): Promise<void>;
}
