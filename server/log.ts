import { writeSync } from 'node:fs';
import type { LogLevel } from './config';

/**
 * A small leveled logger writing one line per event to stdout/stderr. Errors keep their stack
 * here, on the server, and never in a response.
 *
 * A log target that fails (a full disk under a redirected log: ENOSPC; a closed pipe: EPIPE) never
 * stops the server: stdout and stderr always have an 'error' listener (without one, Node turns the
 * stream's error event into an uncaught exception and the process ends mid-line), lines that
 * cannot be written are dropped and counted, and once the stream has given up, lines go straight
 * to its file descriptor, so logging resumes when space is freed.
 */
export interface Logger {
  debug(message: string, extra?: unknown): void;
  info(message: string, extra?: unknown): void;
  warn(message: string, extra?: unknown): void;
  error(message: string, extra?: unknown): void;
}

const order: Record<LogLevel, number> = { debug: 10, info: 20, warn: 30, error: 40, silent: 100 };

function describe(extra: unknown): string {
  if (extra === undefined) return '';
  if (extra instanceof Error) return `\n${extra.stack ?? extra.message}`;
  try {
    return ` ${JSON.stringify(extra)}`;
  } catch {
    return ` ${String(extra)}`;
  }
}

const guarded = new WeakSet<NodeJS.WriteStream>();
let dropped = 0;

/** Lines the log target refused since the process started (ENOSPC, EPIPE…). */
export function droppedLogLines(): number {
  return dropped;
}

/** Gives stdout and stderr a permanent 'error' listener: a failing log target never ends the process. */
export function guardStandardStreams(): void {
  for (const stream of [process.stdout, process.stderr]) {
    if (guarded.has(stream)) continue;
    guarded.add(stream);
    stream.on('error', () => {
      dropped += 1;
    });
  }
}

/** Writes one line to stdout or stderr; never throws. */
export function writeLine(target: 'stdout' | 'stderr', text: string): void {
  guardStandardStreams();
  const stream = target === 'stdout' ? process.stdout : process.stderr;
  try {
    if (!stream.destroyed && stream.writable) stream.write(`${text}\n`);
    else writeSync(target === 'stdout' ? 1 : 2, `${text}\n`);
  } catch {
    dropped += 1;
  }
}

export function createLogger(level: LogLevel): Logger {
  guardStandardStreams();
  const at = order[level];
  const line = (name: Exclude<LogLevel, 'silent'>, message: string, extra: unknown) => {
    if (order[name] < at) return;
    // A log line carries the real time, also while the demo seed replays its past (clock.ts).
    // eslint-disable-next-line no-restricted-syntax
    const text = `${new Date().toISOString()} ${name.padEnd(5)} ${message}${describe(extra)}`;
    writeLine(order[name] >= order.warn ? 'stderr' : 'stdout', text);
  };
  return {
    debug: (message, extra) => line('debug', message, extra),
    info: (message, extra) => line('info', message, extra),
    warn: (message, extra) => line('warn', message, extra),
    error: (message, extra) => line('error', message, extra),
  };
}
