import type { Server } from 'node:http';
import { comparisonStateLabels } from '@shared/comparisons';
import { verifyWholeAuditChain } from './audit/chain-state';
import { closeApp, createApp } from './app';
import { ConfigError, loadConfig, type Config } from './config';
import { openDatabase } from './db/data-source';
import { WalCheckpointer } from './db/checkpointer';
import { storedSessionSecret } from './db/settings';
import { clearUploadDir, uploadDirFor } from './holdouts/upload-dir';
import { JobRunner } from './jobs/runner';
import { createLogger, guardStandardStreams } from './log';
import { Mailer } from './mail/mailer';
import { createMailTransport } from './mail/transport';
import { databaseIsEmpty, demoPassword, presentDemoPeople, seedDemo, type SeedResult } from './seed';
import { formatFixed } from '@shared/format';
import { analysisHandlers } from './comparisons/analysis-handlers';

/**
 * `node dist/server/index.js`: opens the database and migrates it, starts mail (the local sink
 * unless SMTP_URL is set) and the analysis queue, seeds an empty database with the demo (not in
 * production: the demo people and, unless DEMO_SCENARIO=false, the demo's three comparisons, whose
 * analyses run before the server listens), listens, prints where, and shuts down cleanly on
 * SIGTERM or SIGINT.
 */

function readConfig(): Config {
  try {
    return loadConfig();
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(error.message);
      process.exit(1);
    }
    throw error;
  }
}

async function main(): Promise<void> {
  guardStandardStreams();
  const config = readConfig();
  const log = createLogger(config.logLevel);

  const dataSource = await openDatabase(config.databasePath);
  // WAL checkpoints on their own thread, not after a large commit on this one.
  const checkpointer = new WalCheckpointer(dataSource, config.databasePath, log);
  await checkpointer.start();
  const sessionSecret = config.sessionSecret ?? (await storedSessionSecret(dataSource));

  const mail = await createMailTransport(config, dataSource, log);
  const mailer = new Mailer(dataSource, mail.transport, { from: config.mailFrom, log });
  await mailer.start();

  // Re-queues (or fails) analyses a previous process left running, then starts the queue.
  const jobs = new JobRunner({
    dataSource,
    databasePath: config.databasePath,
    concurrency: config.analysisConcurrency,
    log,
    handlers: analysisHandlers({ dataSource, mailer, publicUrl: config.publicUrl }),
  });
  await jobs.start();

  // Uploads a killed process left half-received are removed (they were never stored).
  const uploadDir = uploadDirFor(config.databasePath);
  const leftovers = clearUploadDir(uploadDir);
  if (leftovers > 0) log.info(`removed ${leftovers} unfinished upload(s) from ${uploadDir}`);

  // The demo, on an empty database only, before anyone can sign in (the scenario replays the
  // past weeks' timestamps, which no request may see: clock.ts).
  let seeded: SeedResult | null = null;
  if (!config.isProduction && (await databaseIsEmpty(dataSource))) {
    const started = performance.now();
    if (config.demoScenario) console.log('The database is empty: adding the demo people and the demo comparisons, whose analyses run now (a few seconds)…');
    try {
      seeded = await seedDemo(dataSource, { bcryptCost: config.bcryptCost, scenario: config.demoScenario ? { config, dataSource, mailer, log, jobs, uploadDir } : null });
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

  const app = createApp({ config, dataSource, mailer, sessionSecret, log, jobs, uploadDir });
  const server: Server = await new Promise((resolve, reject) => {
    const listening = config.host ? app.listen(config.port, config.host) : app.listen(config.port);
    listening.once('listening', () => resolve(listening));
    listening.once('error', reject);
  });
  const address = server.address();
  const port = address && typeof address === 'object' ? address.port : config.port;

  const lines = [
    '',
    `Scorecourt is running at http://localhost:${port} (ready ${Math.round(performance.now())} ms after the process started)`,
    `  database: ${config.databasePath}`,
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

  let stopping = false;
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info(`${signal}: shutting down`);
    const force = setTimeout(() => {
      log.warn('shutdown took longer than 10 s; exiting');
      process.exit(1);
    }, 10_000);
    force.unref();
    server.close(() => {
      (async () => {
        closeApp(app);
        await jobs.stop();
        await mailer.stop();
        await mail.sink?.close();
        await checkpointer.stop();
        await dataSource.destroy();
      })().then(
        () => process.exit(0),
        (error: unknown) => {
          log.error('error while shutting down', error);
          process.exit(1);
        },
      );
    });
    server.closeIdleConnections();
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}

main().catch((error: unknown) => {
  console.error('Scorecourt could not start:', error);
  process.exit(1);
});
