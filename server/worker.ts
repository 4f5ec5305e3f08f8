import nodemailer from 'nodemailer';
import { analysisHandlers } from './comparisons/analysis-handlers';
import { redactedUrl, type Config } from './config';
import { openDatabase } from './db/data-source';
import { createAnalysisQueue } from './jobs/create-queue';
import type { Logger } from './log';
import { Mailer } from './mail/mailer';
import { startProcess, stopOnSignals } from './start-up';

/**
 * `npm run worker`: an analysis worker process for a PostgreSQL deployment (DATABASE_URL). It
 * serves no requests: it takes analysis jobs from pg-boss on the shared database and runs
 * ANALYSIS_CONCURRENCY of them at once, each on its own thread, storing every result in the
 * database (jobs/boss-queue.ts). The e-mails a finished analysis causes are written to the outbox;
 * the servers deliver them. SIGTERM or SIGINT: the analyses running here go back to the queue.
 * Killed (SIGKILL, a lost machine): its analyses are retried by another worker once their lease
 * (ANALYSIS_LEASE_SECONDS) has passed.
 */

async function main(config: Config, log: Logger): Promise<void> {
  const dataSource = await openDatabase(config.databaseUrl!);
  // Queues mail in the outbox only: delivery is the servers' (their mailers poll the outbox).
  const mailer = new Mailer(dataSource, nodemailer.createTransport({ jsonTransport: true }), { from: config.mailFrom, log });
  await mailer.stop();
  const jobs = await createAnalysisQueue({
    config,
    dataSource,
    log,
    handlers: analysisHandlers({ dataSource, mailer, publicUrl: config.publicUrl }),
    workers: config.analysisConcurrency,
  });
  await jobs.start();
  console.log(
    `Scorecourt analysis worker ${process.pid} is running: ${config.analysisConcurrency} at once, PostgreSQL at ${redactedUrl(config.databaseUrl!)}, lease ${config.analysisLeaseSeconds} s`,
  );

  stopOnSignals(log, {
    announce: (signal) => `${signal}: worker ${process.pid} stopping; its analyses go back to the queue`,
    graceMs: 15_000,
    failure: 'error while stopping the worker',
    async stop() {
      await jobs.stop();
      await dataSource.destroy();
    },
  });
}

startProcess(
  {
    failure: 'The Scorecourt worker could not start:',
    requires: (config) => (config.databaseUrl ? null : 'DATABASE_URL: required by `npm run worker` (workers share a PostgreSQL database with the servers)'),
  },
  main,
);
