import type { DataSource } from 'typeorm';
import type { Config } from './config';
import type { PreparedCache } from './comparisons/prepared-cache';
import type { AnalysisQueue } from './jobs/queue';
import type { Logger } from './log';
import type { Mailer } from './mail/mailer';
import type { PackInput } from './pack/sections';

/** What every feature's routes and services are built with (see createApp in app.ts). */
export interface AppContext {
  config: Config;
  dataSource: DataSource;
  mailer: Mailer;
  log: Logger;
  /** The analysis queue: `jobs.kick()` after queueing a run. */
  jobs: AnalysisQueue;
  /** Where uploads are streamed before they are read and stored (files are removed afterwards). */
  uploadDir: string;
  /**
   * Done runs' data prepared for swap sets, kept in this process (comparisons/prepared-cache.ts);
   * shared with the analysis queue's handlers, which hand over what a finished analysis prepared.
   * Another instance that lacks a run prepares it again from the stored columns.
   */
  preparedCache: PreparedCache;
  /**
   * Lays out a committee pack's PDF (pack/render-thread.ts `renderPackOffThread`: on a pack thread,
   * kept between packs). Given in the context so a test can watch or fail the layout without
   * replacing a module (the unit suite shares modules between test files).
   */
  layOutPack: (input: PackInput) => Promise<Buffer>;
}
