import { ConfigError, loadConfig, type Config } from './config';
import { createLogger, guardStandardStreams, type Logger } from './log';

/**
 * What the server (`node dist/server/index.js`, index.ts) and the analysis worker process
 * (`npm run worker`, worker.ts) share at start-up and shut-down: the standard streams guarded,
 * the configuration read (a bad one printed and exit 1, before anything is opened), the logger,
 * a failed start printed and exit 1; and one shut-down on SIGTERM or SIGINT that runs the
 * process's own steps once, exits 0 when they finish and 1 when they fail or outlast the grace.
 */

export interface StartOptions {
  /** Printed before the error when the start fails. */
  failure: string;
  /** A setting this process cannot run without: the message when it is missing (the config is refused as a bad one). */
  requires?: (config: Config) => string | null;
}

function readConfig(requires: StartOptions['requires']): Config {
  try {
    const config = loadConfig();
    const missing = requires?.(config);
    if (missing) throw new ConfigError([missing]);
    return config;
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(error.message);
      process.exit(1);
    }
    throw error;
  }
}

export function startProcess(options: StartOptions, main: (config: Config, log: Logger) => Promise<void>): void {
  const run = async () => {
    guardStandardStreams();
    const config = readConfig(options.requires);
    await main(config, createLogger(config.logLevel));
  };
  run().catch((error: unknown) => {
    console.error(options.failure, error);
    process.exit(1);
  });
}

export interface ShutdownOptions {
  /** The log line when a signal arrives. */
  announce: (signal: string) => string;
  /** How long the steps may take before the process exits 1 anyway. */
  graceMs: number;
  /** The log line when they outlast it (none: exit silently). */
  overrun?: string;
  /** The log line when a step fails. */
  failure: string;
  /** The process's shut-down steps, in order. */
  stop: () => Promise<void>;
}

export function stopOnSignals(log: Logger, options: ShutdownOptions): void {
  let stopping = false;
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info(options.announce(signal));
    const force = setTimeout(() => {
      if (options.overrun) log.warn(options.overrun);
      process.exit(1);
    }, options.graceMs);
    force.unref();
    options.stop().then(
      () => process.exit(0),
      (error: unknown) => {
        log.error(options.failure, error);
        process.exit(1);
      },
    );
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}
