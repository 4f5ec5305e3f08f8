import type { ResourceLimits, Worker } from 'node:worker_threads';
import { In, type DataSource } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { greatestSql } from '../db/driver';
import { AnalysisRun } from '../db/entities/index';
import { inTransaction, withWriteLock } from '../db/transaction';
import type { Logger } from '../log';
import { startWorker } from '../runtime';
import type { JobHandlers, JobOutcome } from './handlers';
import type { AnalysisJob, WorkerMessage } from './messages';

/**
 * The analysis queue. Runs are rows in analysis_runs; this takes the oldest queued one while
 * fewer than `concurrency` run, and gives each to a worker thread (analysis-worker.ts), so no
 * analysis ever runs on the thread that answers requests.
 *
 * - Progress and stage from the worker are written to the run at most every `progressEveryMs`.
 * - What a run means is not the queue's: the handlers it is given (handlers.ts; for comparisons
 *   comparisons/analysis-handlers.ts, passed in by app.ts and index.ts) add the worker's input
 *   when a run is claimed, store a run that ended in one transaction, and keep what a done run
 *   prepared.
 * - A worker that dies (an uncaught error, process.exit, out of memory, a crash) or stops without
 *   a result costs the run an attempt: it is queued again, and after `maxAttempts` attempts it is
 *   failed with the reason. An error the engine reports as the data's (a StatisticError) fails
 *   the run at once: trying again would give the same answer.
 * - At start-up a run left `running` (the server stopped or was killed meanwhile) is queued again,
 *   or failed when it has used its attempts. `stop()` (a clean shutdown) puts a running run back
 *   in the queue without counting the attempt.
 */

export interface JobRunnerOptions {
  dataSource: DataSource;
  /** The SQLite file (not `:memory:`) or PostgreSQL URL the workers open read-only. */
  databasePath: string;
  concurrency: number;
  log: Logger;
  /** What to do when a run is claimed and when it ends (handlers.ts). */
  handlers: JobHandlers;
  /** The worker's source path (see runtime.ts workerEntry); tests substitute a faulty one. */
  workerPath?: string;
  maxAttempts?: number;
  progressEveryMs?: number;
  resourceLimits?: ResourceLimits;
  /**
   * false: this runner takes no run from the table by itself and recovers none at start; runs are
   * handed to it one by one (`runById`) by a shared queue (boss-queue.ts, on PostgreSQL), which
   * decides who runs what across processes. Default true (the in-process queue).
   */
  takesQueuedRuns?: boolean;
}

/** How `runById` left a run. */
export type RunByIdOutcome = 'ended' | 'queued-again' | 'nothing-to-do';

interface ActiveRun {
  runId: number;
  attempt: number;
  worker: Worker;
  settled: boolean;
  exited: Promise<void>;
  /** Storing the result (set once settled). */
  stored: Promise<void>;
  lastProgressWrite: number;
  progressWrite: Promise<void>;
  /** When the thread last said anything (Date.now()): a shared queue renews a run's lease only while it is heard from. */
  lastHeard: number;
}

const defaultLimits: ResourceLimits = { maxOldGenerationSizeMb: 4096 };

export class JobRunner {
  readonly maxAttempts: number;
  private readonly workerPath: string;
  private readonly progressEveryMs: number;
  /** Worker threads by `runId/attempt` (an attempt taken over on a shared queue may overlap a silent one of the same run). */
  private readonly active = new Map<string, ActiveRun>();
  private started = false;
  private stopping = false;
  private pumping: Promise<void> | null = null;
  private again = false;
  /** Result handling in progress (so stop() and whenIdle() can wait for it). */
  private readonly settling = new Set<Promise<void>>();

  constructor(private readonly options: JobRunnerOptions) {
    this.maxAttempts = options.maxAttempts ?? 2;
    this.workerPath = options.workerPath ?? 'server/jobs/analysis-worker';
    this.progressEveryMs = options.progressEveryMs ?? 500;
    this.takesQueuedRuns = options.takesQueuedRuns ?? true;
  }

  private readonly takesQueuedRuns: boolean;

  /**
   * Runs run `runId` here, now, to its end (for a shared queue: `takesQueuedRuns: false`). A run
   * already done or failed is left alone. A run still marked running had its worker stop without
   * a word (a process killed, its lease expired): it is taken over as its next attempt, or failed
   * when it has used them all. Resolves once the outcome is stored: 'queued-again' when the
   * attempt failed and the run waits for another.
   */
  async runById(runId: number, onClaimed?: (attempt: number) => void): Promise<RunByIdOutcome> {
    if (!this.started || this.stopping) throw new Error('the analysis runner is not started');
    const { dataSource } = this.options;
    const claimed = await inTransaction(dataSource, async (manager) => {
      const run = await manager.findOne(AnalysisRun, { where: { id: runId } });
      if (!run || (run.status !== 'queued' && run.status !== 'running')) return null;
      if (run.status === 'running') {
        if (run.attempts >= this.maxAttempts) {
          await this.options.handlers.finished(manager, run.id, {
            status: 'failed',
            error: `The analysis stopped without a result on each of its ${run.attempts} attempts (its worker was stopped or lost); it was not tried again.`,
          });
          return 'failed' as const;
        }
        await recordAudit(manager, {
          actor: null,
          action: 'analysis.retried',
          target: { type: 'comparison', id: run.comparisonId },
          details: { runId: run.id, attempt: run.attempts, reason: 'its worker stopped without a result (lease expired)' },
        });
      }
      const attempt = run.attempts + 1;
      await manager.update(
        AnalysisRun,
        { id: run.id },
        { status: 'running', attempts: attempt, startedAt: now(), progress: 0, stage: 'Starting', engineVersion: this.options.handlers.engineVersion },
      );
      const input = await this.options.handlers.jobInput(manager);
      return { runId: run.id, attempt, job: { ...input, databasePath: this.options.databasePath, runId: run.id, attempt } };
    });
    if (claimed === 'failed') {
      this.options.handlers.afterFinished?.();
      this.options.log.warn(`analysis run ${runId}: its worker stopped on its last attempt; marked failed`);
      return 'ended';
    }
    if (claimed === null) return 'nothing-to-do';
    onClaimed?.(claimed.attempt);
    await this.launch(claimed);
    const after = await dataSource.getRepository(AnalysisRun).findOne({ where: { id: runId }, select: { id: true, status: true, attempts: true } });
    return after?.status === 'queued' ? 'queued-again' : 'ended';
  }

  /** Recovers runs a previous process left running, then starts taking queued runs. */
  async start(): Promise<void> {
    if (this.started) return;
    if (this.takesQueuedRuns) await this.recover();
    this.started = true;
    this.stopping = false;
    this.kick();
  }

  /** Looks for queued runs now (call after queueing one). */
  kick(): void {
    if (!this.started || this.stopping || !this.takesQueuedRuns) return;
    if (this.pumping) {
      this.again = true;
      return;
    }
    this.pumping = this.pump()
      .catch((error: unknown) => this.options.log.error('analysis queue: could not start a run', error))
      .finally(() => {
        this.pumping = null;
        if (this.again) {
          this.again = false;
          this.kick();
        }
      });
  }

  /**
   * Gives up attempt `attempt` of run `runId` here without storing anything (its lease on a shared
   * queue has passed, so the run is another worker's to take over): the thread is ended and the
   * run left as it is. Resolves once the thread is gone.
   */
  async abandon(runId: number, attempt: number): Promise<void> {
    const active = this.active.get(`${runId}/${attempt}`);
    if (!active || active.settled) return;
    active.settled = true;
    this.options.log.warn(`analysis run ${runId}: attempt ${attempt} passed its lease; ended here, left to another worker`);
    await active.worker.terminate();
    await active.exited;
  }

  /**
   * When attempt `attempt` of run `runId`'s thread here last said anything (Date.now() ms; its
   * start counts), or null when no such thread is running here (not started yet, or ended).
   */
  lastHeard(runId: number, attempt: number): number | null {
    const active = this.active.get(`${runId}/${attempt}`);
    return active && !active.settled ? active.lastHeard : null;
  }

  /** Runs being worked on in this process. */
  get activeRuns(): number[] {
    return [...this.active.values()].map((run) => run.runId);
  }

  /**
   * Stops taking runs and ends the workers. A run that was running goes back to the queue with
   * its attempt uncounted (a clean stop is not a failure); the next start takes it again.
   */
  async stop(): Promise<void> {
    this.stopping = true;
    await this.pumping;
    const runs = [...this.active.values()];
    for (const run of runs) run.settled = true;
    await Promise.all(runs.map((run) => run.worker.terminate().then(() => run.exited)));
    await Promise.all([...this.settling]);
    await Promise.all(runs.map((run) => run.progressWrite));
    if (runs.length > 0 && this.options.dataSource.isInitialized) {
      // Only runs still held by this process's attempt (on a shared queue another worker may have taken one over).
      await withWriteLock(this.options.dataSource, async () => {
        for (const run of runs) {
          await this.options.dataSource
            .createQueryBuilder()
            .update(AnalysisRun)
            .set({ status: 'queued', stage: 'Queued again after a server stop', progress: 0, attempts: () => greatestSql(this.options.dataSource, '"attempts" - 1', '0') })
            .where({ id: run.runId, status: 'running', attempts: run.attempt })
            .execute();
        }
      });
    }
    this.active.clear();
    this.started = false;
  }

  /**
   * Resolves when no run is queued or running (tests); rejects when `timeoutMs` pass without a run
   * finishing. A long queue on a loaded machine is not a stuck one: each finished run restarts
   * the wait, so the bound is per run, not for the whole queue.
   */
  async whenIdle(timeoutMs = 60_000): Promise<void> {
    let deadline = Date.now() + timeoutMs;
    let lastPending = Number.POSITIVE_INFINITY;
    for (;;) {
      await this.pumping;
      await Promise.all([...this.settling]);
      const pending = await this.options.dataSource.getRepository(AnalysisRun).countBy({ status: In(['queued', 'running']) });
      if (pending === 0 && this.active.size === 0) return;
      if (pending < lastPending) deadline = Date.now() + timeoutMs;
      lastPending = pending;
      if (Date.now() > deadline) throw new Error(`analysis queue made no progress for ${timeoutMs} ms (${pending} runs pending)`);
      await new Promise((resolve) => setTimeout(resolve, 25));
    }
  }

  private async recover(): Promise<void> {
    const { dataSource } = this.options;
    const left = await dataSource.getRepository(AnalysisRun).find({ where: { status: 'running' }, order: { id: 'ASC' } });
    for (const run of left) {
      if (run.attempts >= this.maxAttempts) {
        await inTransaction(dataSource, (manager) =>
          this.options.handlers.finished(manager, run.id, {
            status: 'failed',
            error: `The server stopped while this analysis was running, on each of its ${run.attempts} attempts; it was not tried again.`,
          }),
        );
        this.options.log.warn(`analysis run ${run.id}: interrupted on its last attempt; marked failed`);
      } else {
        await inTransaction(dataSource, async (manager) => {
          await manager.update(AnalysisRun, { id: run.id }, { status: 'queued', progress: 0, stage: 'Queued again after a server stop', error: 'The server stopped while this analysis was running.' });
          await recordAudit(manager, {
            actor: null,
            action: 'analysis.requeued',
            target: { type: 'comparison', id: run.comparisonId },
            details: { runId: run.id, attempts: run.attempts, reason: 'the server stopped while it was running' },
          });
        });
        this.options.log.info(`analysis run ${run.id}: interrupted by a server stop; queued again`);
      }
    }
  }

  private async pump(): Promise<void> {
    while (!this.stopping && this.active.size < this.options.concurrency) {
      const claimed = await this.claim();
      if (!claimed) return;
      void this.launch(claimed);
    }
  }

  /** Takes the oldest queued run: running, one more attempt. */
  private async claim(): Promise<{ runId: number; attempt: number; job: AnalysisJob } | null> {
    const { dataSource } = this.options;
    return inTransaction(dataSource, async (manager) => {
      const next = await manager.findOne(AnalysisRun, { where: { status: 'queued' }, order: { id: 'ASC' } });
      if (!next) return null;
      const attempt = next.attempts + 1;
      await manager.update(
        AnalysisRun,
        { id: next.id },
        { status: 'running', attempts: attempt, startedAt: now(), progress: 0, stage: 'Starting', engineVersion: this.options.handlers.engineVersion },
      );
      const input = await this.options.handlers.jobInput(manager);
      return { runId: next.id, attempt, job: { ...input, databasePath: this.options.databasePath, runId: next.id, attempt } };
    });
  }

  /** Starts the run's worker thread; resolves once the thread is gone and its outcome stored. */
  private launch({ runId, attempt, job }: { runId: number; attempt: number; job: AnalysisJob }): Promise<void> {
    const { log } = this.options;
    let worker: Worker;
    if (this.options.databasePath === ':memory:') {
      // settle() logs its own errors and is tracked in `settling` (stop() and whenIdle() wait for it).
      return this.settle(runId, attempt, { kind: 'failed', message: 'analyses need the database in a file (DATABASE_PATH), not in memory', permanent: true });
    }
    try {
      worker = startWorker(this.workerPath, { workerData: job, resourceLimits: this.options.resourceLimits ?? defaultLimits });
    } catch (error) {
      return this.settle(runId, attempt, { kind: 'crashed', reason: `the analysis worker could not start (${(error as Error).message})` });
    }
    let slotFreed: () => void = () => {};
    const freed = new Promise<void>((resolve) => (slotFreed = resolve));
    let exitedResolve: () => void = () => {};
    const active: ActiveRun = {
      runId,
      attempt,
      worker,
      settled: false,
      exited: new Promise<void>((resolve) => (exitedResolve = resolve)),
      stored: Promise.resolve(),
      lastProgressWrite: 0,
      progressWrite: Promise.resolve(),
      lastHeard: Date.now(),
    };
    this.active.set(`${runId}/${attempt}`, active);
    log.info(`analysis run ${runId}: started (attempt ${attempt})`);

    const finish = (result: Settlement) => {
      if (active.settled) return;
      active.settled = true;
      active.stored = this.settle(runId, attempt, result, active);
    };
    worker.on('message', (message: WorkerMessage) => {
      active.lastHeard = Date.now();
      if (active.settled) return;
      if (message.type === 'progress') this.progress(active, message.fraction, message.stage);
      else if (message.type === 'done') finish({ kind: 'done', message });
      else finish({ kind: 'failed', message: message.message, permanent: message.permanent });
    });
    worker.on('error', (error: Error & { code?: string }) => {
      const reason =
        error.code === 'ERR_WORKER_OUT_OF_MEMORY' ? 'the analysis ran out of memory' : `the analysis worker failed (${error.message})`;
      finish({ kind: 'crashed', reason });
    });
    worker.on('exit', (code) => {
      exitedResolve();
      finish({ kind: 'crashed', reason: `the analysis worker stopped without a result (exit code ${code})` });
      // The slot is free once the thread is gone and its result stored: never more than
      // `concurrency` runs between claim and stored result.
      void active.stored.then(() => {
        if (this.active.get(`${runId}/${attempt}`) === active) {
          this.active.delete(`${runId}/${attempt}`);
          this.kick();
        }
        slotFreed();
      });
    });
    return freed;
  }

  private progress(active: ActiveRun, fraction: number, stage: string): void {
    const now = Date.now();
    if (now - active.lastProgressWrite < this.progressEveryMs) return;
    active.lastProgressWrite = now;
    const { dataSource } = this.options;
    active.progressWrite = active.progressWrite.then(() =>
      withWriteLock(dataSource, async () => {
        if (active.settled) return;
        await dataSource.getRepository(AnalysisRun).update({ id: active.runId, status: 'running' }, { progress: fraction, stage });
      }).catch((error: unknown) => this.options.log.warn(`analysis run ${active.runId}: could not store progress`, error)),
    );
  }

  private settle(runId: number, attempt: number, result: Settlement, active?: ActiveRun): Promise<void> {
    const work = (async () => {
      await active?.progressWrite;
      if (result.kind === 'done') {
        const { message } = result;
        const run = await this.finish(runId, attempt, { status: 'done', message });
        if (run) {
          await this.options.handlers.keepPrepared?.(run, message);
          this.options.log.info(`analysis run ${runId}: done`);
        }
      } else if (result.kind === 'failed' && result.permanent) {
        await this.finish(runId, attempt, { status: 'failed', error: result.message });
        this.options.log.info(`analysis run ${runId}: failed (${result.message})`);
      } else {
        const reason = result.kind === 'failed' ? result.message : result.reason;
        await this.retryOrFail(runId, attempt, reason);
      }
      // Workers end by themselves once their message is posted; make sure.
      if (active) void active.worker.terminate();
    })().catch(async (error: unknown) => {
      this.options.log.error(`analysis run ${runId}: could not store its result`, error);
      // Marked failed with the reason by the handlers (comparisons/run-finished.ts recordUnstoredRun), not left "running".
      if (await this.options.handlers.resultNotStored(runId, error)) this.options.log.warn(`analysis run ${runId}: marked failed (result not stored)`);
    });
    this.settling.add(work);
    void work.finally(() => {
      this.settling.delete(work);
      if (!active) this.kick();
    });
    return work;
  }

  /**
   * Stores how attempt `attempt` ended, unless the run has moved on meanwhile (another worker took
   * it over after this one's lease expired, on a shared queue): then the outcome is dropped and
   * null returned, so a run is stored done exactly once.
   */
  private async finish(runId: number, attempt: number, outcome: JobOutcome): Promise<AnalysisRun | null> {
    const run = await inTransaction(this.options.dataSource, async (manager) => {
      const current = await manager.findOne(AnalysisRun, { where: { id: runId }, select: { id: true, status: true, attempts: true } });
      if (!current || current.status !== 'running' || current.attempts !== attempt) return null;
      return this.options.handlers.finished(manager, runId, outcome);
    });
    if (run === null) {
      this.options.log.warn(`analysis run ${runId}: attempt ${attempt} ended after the run was taken over or settled; its outcome was dropped`);
      return null;
    }
    this.options.handlers.afterFinished?.();
    return run;
  }

  private async retryOrFail(runId: number, attempt: number, reason: string): Promise<void> {
    if (attempt >= this.maxAttempts) {
      const error = attempt === 1 ? `The analysis failed: ${reason}.` : `The analysis failed on each of its ${attempt} attempts; the last time ${reason}.`;
      await this.finish(runId, attempt, { status: 'failed', error });
      this.options.log.warn(`analysis run ${runId}: failed after ${attempt} attempts (${reason})`);
      return;
    }
    await inTransaction(this.options.dataSource, async (manager) => {
      const run = await manager.findOneByOrFail(AnalysisRun, { id: runId });
      if (run.status !== 'running' || run.attempts !== attempt) return; // taken over meanwhile (shared queue)
      await manager.update(AnalysisRun, { id: runId }, { status: 'queued', progress: 0, stage: 'Queued again after a failed attempt', error: `Attempt ${attempt}: ${reason}.` });
      await recordAudit(manager, {
        actor: null,
        action: 'analysis.retried',
        target: { type: 'comparison', id: run.comparisonId },
        details: { runId, attempt, reason },
      });
    });
    this.options.log.warn(`analysis run ${runId}: attempt ${attempt} failed (${reason}); queued again`);
  }
}

type Settlement =
  | { kind: 'done'; message: Extract<WorkerMessage, { type: 'done' }> }
  | { kind: 'failed'; message: string; permanent: boolean }
  | { kind: 'crashed'; reason: string };
