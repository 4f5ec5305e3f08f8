// Writes docs/routes.md from the route registry: `npm run docs:routes`. The app is built as the
// tests build it (a temporary database, a mail transport that sends nothing, a queue that is never
// started), only to read `routeTable(app)`; tests/api/route-docs.test.ts checks the file.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import nodemailer from 'nodemailer';
import { closeApp, createApp, routeTable } from '../server/app';
import { loadConfig } from '../server/config';
import { openDatabase } from '../server/db/data-source';
import { routesMarkdown } from '../server/http/route-docs';
import { JobRunner } from '../server/jobs/runner';
import { createLogger } from '../server/log';
import { Mailer } from '../server/mail/mailer';
import { projectRoot } from '../server/runtime';
import { analysisHandlers } from '../server/comparisons/analysis-handlers';

const directory = mkdtempSync(join(tmpdir(), 'scorecourt-routes-'));
try {
  const config = { ...loadConfig({ NODE_ENV: 'test', PORT: '0', LOG_LEVEL: 'silent' }), databasePath: join(directory, 'db.sqlite') };
  const log = createLogger('silent');
  const dataSource = await openDatabase(config.databasePath);
  const mailer = new Mailer(dataSource, nodemailer.createTransport({ jsonTransport: true }), { from: config.mailFrom, log, pollMs: 60_000 });
  const jobs = new JobRunner({ dataSource, databasePath: config.databasePath, concurrency: 1, log, handlers: analysisHandlers({ dataSource, mailer }) });
  const app = createApp({ config, dataSource, mailer, sessionSecret: 'x'.repeat(40), log, jobs, uploadDir: join(directory, 'uploads') });
  const routes = routeTable(app);
  writeFileSync(join(projectRoot, 'docs', 'routes.md'), routesMarkdown(routes));
  closeApp(app);
  await dataSource.destroy();
  console.log(`wrote docs/routes.md (${routes.length} routes)`);
} finally {
  rmSync(directory, { recursive: true, force: true });
}
