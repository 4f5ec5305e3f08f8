/**
 * What the app asks of the analysis queue, whichever runs it: the in-process queue on the
 * analysis_runs table (runner.ts, SQLite) or pg-boss on the same PostgreSQL (boss-queue.ts).
 */
export interface AnalysisQueue {
  /** Starts taking runs (recovering what a previous process left, where that is this process's job). */
  start(): Promise<void>;
  /** Stops taking runs; a run running here goes back to the queue, its attempt uncounted. */
  stop(): Promise<void>;
  /** A run was queued: look for work now (the in-process queue) or hand it to the shared queue. */
  kick(): void;
  /** Resolves when no run is queued or running (tests, the demo seed); rejects after `timeoutMs`. */
  whenIdle(timeoutMs?: number): Promise<void>;
  /** Runs being worked on in this process. */
  readonly activeRuns: number[];
}
