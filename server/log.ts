import type { LogLevel } from './config';

/**
 * A small leveled logger writing one line per event to stdout/stderr. Errors keep their stack
 * here, on the server, and never in a response.
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

export function createLogger(level: LogLevel): Logger {
  const at = order[level];
  const line = (name: Exclude<LogLevel, 'silent'>, message: string, extra: unknown) => {
    if (order[name] < at) return;
    const text = `${new Date().toISOString()} ${name.padEnd(5)} ${message}${describe(extra)}`;
    if (order[name] >= order.warn) console.error(text);
    else console.log(text);
  };
  return {
    debug: (message, extra) => line('debug', message, extra),
    info: (message, extra) => line('info', message, extra),
    warn: (message, extra) => line('warn', message, extra),
    error: (message, extra) => line('error', message, extra),
  };
}
