import type { Server } from 'node:http';
import { comparisonStateLabels } from '@shared/comparisons';
import { verifyWholeAuditChain } from './audit/chain-state';
import { closeApp, createApp } from './app';
import { databaseAddress, redactedUrl, type Config } from './config';
import { openDatabase } from './db/data-source';
import { WalCheckpointer } from './db/checkpointer';
import { storedSessionSecret } from './db/settings';
import { startUploadStaging } from './holdouts/staged-uploads';
import { uploadDirFor } from './holdouts/upload-dir';
import { createAnalysisQueue } from './jobs/create-queue';
import type { Logger } from './log';
import { Mailer } from './mail/mailer';
import { createMailTransport } from './mail/transport';
import { databaseIsEmpty, demoPassword, presentDemoPeople, seedDemo, type SeedResult } from './seed';
import { formatFixed } from '@shared/format';
import { analysisHandlers } from './comparisons/analysis-handlers';
import { createPreparedCache } from './comparisons/prepared-cache';
import { stopPackThreads } from './pack/render-thread';
import { startProcess, stopOnSignals } from './start-up';
import { renderPackOffThread } from './pack/render-thread';

/**
 * `node dist/server/index.js`: opens the database and migrates it, starts mail (the local sink
 * unless SMTP_URL is set) and the analysis queue, seeds an empty database with the demo (not in
 * production: the demo people and, unless DEMO_SCENARIO=false, the demo's three comparisons, whose
 * analyses run before the server listens), listens, prints where, and shuts down cleanly on
 * SIGTERM or SIGINT.
 */

async function main(config: Config, log: Logger): Promise<void> {
  const dataSource = await openDatabase(databaseAddress(config));
  // SQLite: WAL checkpoints on their own thread, not after a large commit on this one.
  const checkpointer = config.databaseUrl ? null : new WalCheckpointer(dataSource, config.databasePath, log);
  await checkpointer?.start();
  const sessionSecret = config.sessionSecret ?? (await storedSessionSecret(dataSource));

  const mail = await createMailTransport(config, dataSource, log);
  const mailer = new Mailer(dataSource, mail.transport, { from: config.mailFrom, log });
  await mailer.start();

  // Done runs' data prepared for swap sets: filled by the queue's handlers, read by the routes.
  const preparedCache = createPreparedCache(dataSource);
  // SQLite: re-queues (or fails) analyses a previous process left running, then starts the queue.
  // PostgreSQL: pg-boss on the same database; this server runs analyses too unless ANALYSIS_IN_SERVER=false.
  const jobs = await createAnalysisQueue({
    config,
    dataSource,
    log,
    handlers: analysisHandlers({ dataSource, mailer, publicUrl: config.publicUrl, preparedCache }),
    workers: config.databaseUrl && !config.analysisInServer ? 0 : config.analysisConcurrency,
  });
  await jobs.start();

  // Uploads a stopped process left: stored or removed (holdouts/staged-uploads.ts).
  const uploadDir = config.uploadDir ?? uploadDirFor(config.databasePath);
  const stagedWatch = await startUploadStaging({ config, dataSource, log, uploadDir });

  // The demo, on an empty database only, before anyone can sign in (the scenario replays the
  // past weeks' timestamps, which no request may see: clock.ts).
  let seeded: SeedResult | null = null;
  if (!config.isProduction && (await databaseIsEmpty(dataSource))) {
    const started = performance.now();
    if (config.demoScenario) console.log('The database is empty: adding the demo people and the demo comparisons, whose analyses run now (a few seconds)…');
    try {
      seeded = await seedDemo(dataSource, { bcryptCost: config.bcryptCost, scenario: config.demoScenario ? { config, dataSource, mailer, log, jobs, uploadDir, preparedCache, layOutPack: renderPackOffThread } : null });
      if (seeded.comparisons.length > 0) console.log(`The demo is ready (${formatFixed((performance.now() - started) / 1000, 1)} s).`);
    } catch (error) {
      log.error(
        `The demo scenario could not be completed; the server starts with what was added. To try again, stop the server and remove ${config.databasePath} (and its -wal and -shm files).`,
        error,
      );
    }
  }

  // The whole audit chain once at start-up; later calls verify only the events appended since.
  void verifyWholeAuditChain(dataSource).then(
    (check) => {
      if (check.ok) log.info(`audit chain verified: ${check.events} events`);
      else log.error(`THE AUDIT CHAIN IS BROKEN at event ${check.brokenAt}: ${check.reason}. Every audit trail reports it until the chain is restored.`);
    },
    (error: unknown) => log.error('the audit chain could not be verified at start-up', error),
  );

  const app = createApp({ config, dataSource, mailer, sessionSecret, log, jobs, uploadDir, preparedCache });
  const server: Server = await new Promise((resolve, reject) => {
    const listening = config.host ? app.listen(config.port, config.host) : app.listen(config.port);
    listening.once('listening', () => resolve(listening));
    listening.once('error', reject);
  });
  // Idle keep-alive connections stay open longer than a load balancer's (commonly 60 s) or a
  // client's own idle timeout: Node's default of 5 s closes them first, and a request already on
  // its way over such a connection fails (ECONNRESET / EPIPE at the client: test:scale's uploads).
  server.keepAliveTimeout = 65_000;
  server.headersTimeout = 66_000;
  const address = server.address();
  const port = address && typeof address === 'object' ? address.port : config.port;

  const lines = [
    '',
    `Scorecourt is running at http://localhost:${port} (ready ${Math.round(performance.now())} ms after the process started)`,
    `  database: ${config.databaseUrl ? `PostgreSQL at ${redactedUrl(config.databaseUrl)}` : config.databasePath}`,
    `  mail:     ${mail.description}`,
  ];
  if (!config.isProduction) {
    const demo = await presentDemoPeople(dataSource);
    if (seeded?.seeded) {
      const comparisons = seeded.comparisons.map((comparison) => `${comparisonStateLabels[comparison.state].padEnd(10)} ${comparison.name}`);
      lines.push('', `The database was empty: added ${seeded.people.length} demo people${comparisons.length > 0 ? ` and ${comparisons.length} comparisons:` : '.'}`);
      for (const comparison of comparisons) lines.push(`  ${comparison}`);
    }
    if (demo.length > 0) {
      lines.push('', `Demo sign-ins (password "${demoPassword}"):`);
      for (const person of demo) lines.push(`  ${person.email.padEnd(28)} ${person.roles.join(', ')}`);
    }
  }
  console.log(lines.join('\n') + '\n');

  stopOnSignals(log, {
    announce: (signal) => `${signal}: shutting down`,
    graceMs: 10_000,
    overrun: 'shutdown took longer than 10 s; exiting',
    failure: 'error while shutting down',
    async stop() {
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeIdleConnections();
      await closed;
      closeApp(app);
      await stagedWatch.stop();
      await jobs.stop();
      await stopPackThreads();
      await mailer.stop();
      await mail.sink?.close();
      await checkpointer?.stop();
      await dataSource.destroy();
    },
  });
}

startProcess({ failure: 'Scorecourt could not start:' }, main);
