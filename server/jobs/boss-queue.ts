import PgBoss from 'pg-boss';
import { In, type DataSource } from 'typeorm';
import { AnalysisRun } from '../db/entities/index';
import type { Logger } from '../log';
import type { AnalysisQueue } from './queue';
import type { JobRunner, RunByIdOutcome } from './runner';

/**
 * The analysis queue on PostgreSQL: pg-boss (an existing, maintained job queue on the same
 * database) decides which process runs which analysis; the run itself is still a row of
 * analysis_runs (status, attempts, progress: visible from every instance), and the work is done
 * by the same runner as on SQLite (runner.ts `runById`: a worker thread, the result stored in one
 * transaction).
 *
 * - Queueing a run (`kick`) sends one pg-boss job per queued run, keyed by the run's id. The queue
 *   is a `singleton` queue: at most one job per run is active at a time, in all processes. A run
 *   left `running` with no job at all (its job ended for good elsewhere) gets one too.
 * - A worker (a server with ANALYSIS_WORKERS > 0, or `npm run worker`) fetches a job (pg-boss's
 *   fetch: one row taken with SKIP LOCKED) and runs the run to its end. Done, or failed for good:
 *   the job completes. An attempt that failed and left the run queued again: the job fails, and
 *   pg-boss retries it after `retryDelay`.
 * - The lease. pg-boss 10 has no heartbeat: a job is expired by its supervisor `expireInSeconds`
 *   after it was fetched, whoever holds it. So the process holding a job renews it: every quarter
 *   lease it moves the job's expiry to `leaseSeconds` from now (the job row's `expire_in`, the one
 *   column pg-boss's expiry reads), for as long as the analysis's thread is heard from (it reports
 *   progress several times a second while it computes) within `stallSeconds`. A live worker on a
 *   loaded machine keeps its run however long the analysis takes; a worker process killed mid-run
 *   (nothing renews) loses its job within `leaseSeconds` plus one supervisor round, and the job is
 *   retried by whichever worker fetches it next; that worker finds the run still marked running,
 *   records the lost attempt and takes it over as its next attempt (or fails it once all attempts
 *   are used). A thread silent for `stallSeconds` in a live process is ended here and its job left
 *   to expire the same way; a renewal that finds the job no longer this delivery's (expired while
 *   this process was stalled) ends the attempt here too.
 * - Exactly once: a run's outcome is stored only by the attempt that holds it (runner.ts `finish`
 *   checks the attempt number in the storing transaction, under the write lock), so a worker that
 *   lost its lease while merely slow cannot store a second result; a duplicate job finds the run
 *   done and does nothing.
 * pg-boss's own `work()` is not used: it races each handler against the job's expiry as fetched
 * (ending the job while the analysis still runs), which is the lease this module renews.
 */

export const analysisQueueName = 'scorecourt-analysis';

export interface BossQueueOptions {
  dataSource: DataSource;
  /** The PostgreSQL URL (pg-boss keeps its own small pool). */
  databaseUrl: string;
  /** Runs analyses handed to it (made with `takesQueuedRuns: false`). */
  runner: JobRunner;
  log: Logger;
  /** Analyses this process runs at once; 0: this process only queues (a server beside worker processes). */
  workers: number;
  /** A job's lease: renewed while its analysis is heard from; a process silent this long (killed) loses it to another worker. */
  leaseSeconds: number;
  /** An analysis thread that says nothing for this long is taken as lost (default: `leaseSeconds`). */
  stallSeconds?: number;
  /** How often idle workers look for a job. */
  pollSeconds?: number;
  /** How often pg-boss's supervisor expires jobs whose lease ran out. */
  superviseSeconds?: number;
}

/** pg-boss's schema beside the app's: `pgboss` for the default schema, `<schema>_pgboss` otherwise (a database shared by several deployments, each in its own schema through the URL's search_path). */
async function bossSchemaFor(dataSource: DataSource): Promise<string> {
  const [row] = (await dataSource.query('SELECT current_schema() AS "schema"')) as { schema: string }[];
  return row.schema === 'public' ? 'pgboss' : `${row.schema}_pgboss`;
}

/** One delivery of a job to this process: pg-boss's job id and its retry count at the fetch (a redelivery counts one more). */
interface Delivery {
  id: string;
  retryCount: number;
  runId: number;
}

export class BossQueue implements AnalysisQueue {
  private boss: PgBoss | null = null;
  private bossSchema = 'pgboss';
  private loops: Promise<void>[] = [];
  private stopping = false;
  /** Idle worker slots' waits, ended early when a job is sent or the queue stops. */
  private readonly wakers = new Set<() => void>();
  private sending: Promise<void> = Promise.resolve();

  constructor(private readonly options: BossQueueOptions) {}

  private get stallMs(): number {
    return (this.options.stallSeconds ?? this.options.leaseSeconds) * 1000;
  }

  async start(): Promise<void> {
    if (this.boss) return;
    const { dataSource, log } = this.options;
    this.bossSchema = await bossSchemaFor(dataSource);
    const boss = new PgBoss({
      connectionString: this.options.databaseUrl,
      schema: this.bossSchema,
      application_name: 'scorecourt-queue',
      max: 3 + this.options.workers,
      supervise: true,
      maintenanceIntervalSeconds: this.options.superviseSeconds ?? 30,
      schedule: false,
    });
    boss.on('error', (error: Error) => log.error('analysis queue (pg-boss)', error));
    await boss.start();
    const queue = {
      name: analysisQueueName,
      policy: 'singleton' as const,
      // Attempts are counted on the run (runner.ts maxAttempts); pg-boss only redelivers.
      retryLimit: 100,
      retryDelay: 1,
      expireInSeconds: this.options.leaseSeconds,
    };
    await boss.createQueue(analysisQueueName, queue);
    await boss.updateQueue(analysisQueueName, queue);
    this.boss = boss;
    this.stopping = false;
    await this.options.runner.start();
    for (let i = 0; i < this.options.workers; i++) this.loops.push(this.fetchLoop(boss));
    // Runs queued while no queue was running (or whose job was completed by a stopping worker).
    await this.sendQueued();
  }

  /** One worker slot: fetch a job, run it to its end, again, until stopped. */
  private async fetchLoop(boss: PgBoss): Promise<void> {
    const pollMs = (this.options.pollSeconds ?? 1) * 1000;
    while (!this.stopping) {
      let delivery: Delivery | null = null;
      try {
        const [job] = await boss.fetch<{ runId: number }>(analysisQueueName, { batchSize: 1, includeMetadata: true });
        if (job) delivery = { id: job.id, retryCount: job.retryCount, runId: job.data.runId };
      } catch (error) {
        this.options.log.error('analysis queue: could not fetch a job', error);
      }
      if (delivery) await this.runDelivery(boss, delivery);
      else if (!this.stopping) {
        await new Promise<void>((resolve) => {
          const wake = () => {
            clearTimeout(timer);
            this.wakers.delete(wake);
            resolve();
          };
          const timer = setTimeout(wake, pollMs);
          this.wakers.add(wake);
        });
      }
    }
  }

  /**
   * Moves the job's expiry to a lease from now, if this delivery still holds it; false when it
   * does not (expired and retried, or completed elsewhere).
   */
  private async renew(delivery: Delivery): Promise<boolean> {
    const rows = (await this.options.dataSource.query(
      `UPDATE "${this.bossSchema}"."job" SET "expire_in" = (now() - "started_on") + make_interval(secs => $4)
        WHERE "name" = $1 AND "id" = $2 AND "retry_count" = $3 AND "state" = 'active' RETURNING "id"`,
      [analysisQueueName, delivery.id, delivery.retryCount, this.options.leaseSeconds],
    )) as unknown[];
    // TypeORM's PostgreSQL driver answers an UPDATE … RETURNING with [rows, count].
    const returned = Array.isArray(rows[0]) ? (rows[0] as unknown[]) : rows;
    return returned.length > 0;
  }

  private async runDelivery(boss: PgBoss, delivery: Delivery): Promise<void> {
    const { runner, log } = this.options;
    const { runId } = delivery;
    let attempt = 0;
    let lost = false;
    const fetchedAt = Date.now();
    // The attempt is ended here, its job left to expire: another worker takes the run over.
    const giveUp = (why: string) => {
      if (lost) return;
      lost = true;
      log.warn(`analysis run ${runId}: ${why}; attempt ${attempt || '(not started)'} ended here, left to another worker after the lease`);
      if (attempt) void runner.abandon(runId, attempt);
    };
    const heartbeat = async () => {
      if (lost) return;
      const heard = attempt ? runner.lastHeard(runId, attempt) : null;
      if (Date.now() - (heard ?? fetchedAt) > this.stallMs && (heard !== null || !attempt)) {
        giveUp(`its analysis said nothing for ${Math.round((Date.now() - (heard ?? fetchedAt)) / 1000)} s`);
        return;
      }
      try {
        if (!(await this.renew(delivery))) giveUp('its job lease had passed (this process was too slow to renew it)');
      } catch (error) {
        log.warn(`analysis run ${runId}: could not renew its job lease`, error);
      }
    };
    let beating: Promise<void> = heartbeat();
    const timer = setInterval(() => {
      beating = beating.then(heartbeat);
    }, Math.max(1000, (this.options.leaseSeconds * 1000) / 4));
    let outcome: RunByIdOutcome | 'error';
    try {
      await beating;
      outcome = lost
        ? 'nothing-to-do'
        : await runner.runById(runId, (claimed) => {
            attempt = claimed;
          });
    } catch (error) {
      log.error(`analysis run ${runId}: could not be run`, error);
      outcome = 'error';
    } finally {
      clearInterval(timer);
    }
    await beating;
    // Lost: the job is not this process's to end any more.
    if (lost) return;
    try {
      if (!(await this.renew(delivery))) return;
      // pg-boss retries a failed job: the run waits in the queue for another attempt (or, stopped
      // here, went back to the queue: runner.stop). The retry finds it queued, or settled and does nothing.
      if (outcome === 'queued-again' || outcome === 'error' || this.stopping) await boss.fail(analysisQueueName, delivery.id, { outcome });
      else await boss.complete(analysisQueueName, delivery.id, { outcome });
    } catch (error) {
      log.error(`analysis run ${runId}: could not end its job (it expires after the lease and finds the run settled)`, error);
    }
  }

  kick(): void {
    if (!this.boss || this.stopping) return;
    this.sending = this.sending
      .then(() => this.sendQueued())
      .catch((error: unknown) => this.options.log.error('analysis queue: could not hand queued runs to pg-boss', error));
  }

  /**
   * One job per queued run, and per run left running with no job at all (a run already queued in
   * pg-boss gets a second job only in a race, and that job finds it settled).
   */
  private async sendQueued(): Promise<void> {
    const boss = this.boss;
    if (!boss) return;
    const waiting = await this.options.dataSource
      .getRepository(AnalysisRun)
      .find({ where: { status: In(['queued', 'running']) }, select: { id: true }, order: { id: 'ASC' } });
    if (waiting.length === 0) return;
    const pending = new Set(
      (
        (await this.options.dataSource.query(
          `SELECT "singleton_key" AS "key" FROM "${this.bossSchema}"."job" WHERE "name" = $1 AND "state" IN ('created', 'retry', 'active')`,
          [analysisQueueName],
        )) as { key: string | null }[]
      ).map((row) => row.key),
    );
    for (const run of waiting) {
      const key = `run-${run.id}`;
      if (pending.has(key)) continue;
      await boss.send(analysisQueueName, { runId: run.id }, { singletonKey: key });
    }
    this.wakeAll();
  }

  private wakeAll(): void {
    for (const wake of [...this.wakers]) wake();
  }

  get activeRuns(): number[] {
    return this.options.runner.activeRuns;
  }

  async whenIdle(timeoutMs = 60_000): Promise<void> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      await this.sending;
      const pending = await this.options.dataSource.getRepository(AnalysisRun).countBy({ status: In(['queued', 'running']) });
      if (pending === 0) return;
      if (Date.now() > deadline) throw new Error(`analysis queue not idle after ${timeoutMs} ms (${pending} runs pending)`);
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
  }

  /** Stops fetching, ends this process's analyses (their runs go back to the queue, and get a job again), stops pg-boss. */
  async stop(): Promise<void> {
    const boss = this.boss;
    if (!boss) return;
    this.stopping = true;
    this.wakeAll();
    await this.options.runner.stop();
    await Promise.all(this.loops);
    this.loops = [];
    await this.sending;
    try {
      if (this.options.dataSource.isInitialized) await this.sendQueued();
    } finally {
      this.boss = null;
      await boss.stop({ graceful: false, wait: true, timeout: 5000 });
    }
  }
}
