import type { DataSource } from 'typeorm';
import type { Config } from './config';
import type { Logger } from './log';
import type { Mailer } from './mail/mailer';

/** What every feature's routes and services are built with (see createApp in app.ts). */
export interface AppContext {
  config: Config;
  dataSource: DataSource;
  mailer: Mailer;
  log: Logger;
}
