import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Express } from 'express';
import nodemailer, { type Transporter } from 'nodemailer';
import type { DataSource } from 'typeorm';
import { type AppDeps, closeApp, createApp } from '@server/app';
import { analysisHandlers } from '@server/comparisons/analysis-handlers';
import { createPreparedCache, type PreparedCache } from '@server/comparisons/prepared-cache';
import { databaseAddress, loadConfig, type Config } from '@server/config';
import { openDatabase } from '@server/db/data-source';
import { MailMessage } from '@server/db/entities/index';
import { JobRunner, type JobRunnerOptions } from '@server/jobs/runner';
import { createLogger } from '@server/log';
import { Mailer, type MailerOptions } from '@server/mail/mailer';
import { startSmtpSink, type SmtpSink } from '@server/mail/sink';
import { seedDemo } from '@server/seed';
import { createTestDatabase, onPostgres } from '../../setup/test-database';
import type { AppContext } from '@server/context';
import { renderPackOffThread } from '@server/pack/render-thread';

/**
 * A real app on a real temporary SQLite file (or, with TEST_DATABASE_URL, a PostgreSQL database of
 * its own: tests/setup/test-database.ts), with the real local SMTP sink, for API tests.
 * bcrypt runs at cost 4 so the suite stays quick; everything else is as in production.
 */
export interface TestApp {
  app: Express;
  dataSource: DataSource;
  mailer: Mailer;
  /** The analysis queue (started). */
  jobs: JobRunner;
  /** The app's prepared swap-set cache (shared with the queue's handlers). */
  preparedCache: PreparedCache;
  sink: SmtpSink;
  config: Config;
  directory: string;
  /** What the app's routes are built with (for a service called without a request, e.g. the demo scenario). */
  context: AppContext;
  /** Waits for the outbox to deliver, then for the sink to have stored message `id` (or the newest). */
  deliveredMail(where?: { to?: string; afterId?: number }): Promise<MailMessage>;
  close(): Promise<void>;
}

function testConfig(overrides: Partial<Config> = {}, directory = mkdtempSync(join(tmpdir(), 'scorecourt-test-'))): Config {
  return {
    ...loadConfig({ NODE_ENV: 'test', PORT: '0', BCRYPT_COST: '4', LOG_LEVEL: 'silent', PUBLIC_URL: 'http://scorecourt.test' }),
    databasePath: join(directory, 'test.sqlite'),
    ...overrides,
  };
}

export async function buildTestApp(
  options: {
    seed?: boolean;
    config?: Partial<Config>;
    directory?: string;
    transport?: Transporter;
    mailer?: Partial<MailerOptions>;
    jobs?: Partial<JobRunnerOptions>;
    /** Lays out committee packs instead of the pack threads (a test that watches or fails the layout). */
    layOutPack?: AppDeps['layOutPack'];
  } = {},
): Promise<TestApp> {
  const directory = options.directory ?? mkdtempSync(join(tmpdir(), 'scorecourt-test-'));
  // A database of its own, unless the test names one (a second instance on the same PostgreSQL database).
  const database = options.config?.databaseUrl ? null : await createTestDatabase(directory);
  const config = testConfig({ databaseUrl: onPostgres ? database?.address : undefined, ...options.config }, directory);
  const log = createLogger(config.logLevel);
  const dataSource = await openDatabase(databaseAddress(config));
  if (options.seed !== false) await seedDemo(dataSource, { bcryptCost: config.bcryptCost });
  const sink = await startSmtpSink(dataSource, log);
  const transport = options.transport ?? nodemailer.createTransport({ host: sink.host, port: sink.port, secure: false, ignoreTLS: true });
  const mailer = new Mailer(dataSource, transport, { from: config.mailFrom, log, pollMs: 60_000, ...options.mailer });
  const preparedCache = createPreparedCache(dataSource);
  const jobs = new JobRunner({
    dataSource,
    databasePath: databaseAddress(config),
    concurrency: config.analysisConcurrency,
    log,
    handlers: analysisHandlers({ dataSource, mailer, publicUrl: config.publicUrl, preparedCache }),
    ...options.jobs,
  });
  await jobs.start();
  const uploadDir = join(directory, 'uploads');
  const context: AppContext = { config, dataSource, mailer, log, jobs, uploadDir, preparedCache, layOutPack: options.layOutPack ?? renderPackOffThread };
  const app = createApp({ ...context, sessionSecret: 'test-secret-that-is-long-enough-for-sessions' });

  async function deliveredMail(where: { to?: string; afterId?: number } = {}): Promise<MailMessage> {
    const deadline = Date.now() + 10_000;
    for (;;) {
      await mailer.whenIdle();
      const messages = await dataSource.getRepository(MailMessage).find({ order: { id: 'DESC' } });
      const found = messages.find(
        (message) => (!where.to || message.to.includes(where.to)) && message.id > (where.afterId ?? 0) && message.receivedAt !== null,
      );
      if (found) return found;
      if (Date.now() > deadline) throw new Error(`no delivered mail${where.to ? ` to ${where.to}` : ''} within 10 s`);
      await new Promise((resolve) => setTimeout(resolve, 20));
    }
  }

  return {
    app,
    dataSource,
    mailer,
    jobs,
    preparedCache,
    sink,
    config,
    directory,
    context,
    deliveredMail,
    async close() {
      closeApp(app);
      await jobs.stop();
      await mailer.stop();
      await sink.close();
      await dataSource.destroy();
      await database?.drop();
      if (!options.directory) rmSync(directory, { recursive: true, force: true });
    },
  };
}
