import type { DataSource } from 'typeorm';
import type { Config } from './config';
import type { JobRunner } from './jobs/runner';
import type { Logger } from './log';
import type { Mailer } from './mail/mailer';

/** What every feature's routes and services are built with (see createApp in app.ts). */
export interface AppContext {
  config: Config;
  dataSource: DataSource;
  mailer: Mailer;
  log: Logger;
  /** The analysis queue: `jobs.kick()` after queueing a run. */
  jobs: JobRunner;
  /** Where uploads are streamed before they are read and stored (files are removed afterwards). */
  uploadDir: string;
}
