import fc from 'fast-check';
import { columnName, HoldoutInputError } from '@server/reader/errors';
import { StatisticError } from '@server/stats/statistic-error';

/**
 * What a refusal must look like, wherever it comes from (reader, engine, API, CLI): one line of
 * text that says what is wrong and, when the problem is one row's or one column's, names them —
 * and nothing from the inside (stack frames, file paths, SQL, library error names).
 */

const leaks: RegExp[] = [
  /\bat .+:\d+:\d+/, // a stack frame
  /node_modules|\/work\/|\/server\/|\.ts\b|\.js\b/,
  /\b(SQLITE|SELECT|INSERT|UPDATE|DELETE FROM|QueryFailedError|TypeError|RangeError|ReferenceError|SyntaxError|undefined is not|Cannot read prop)/i,
];

/** Problems with a refusal's message, or [] when it is fine. */
export function messageProblems(message: unknown, where: { row?: number | null; column?: string | null } = {}): string[] {
  const problems: string[] = [];
  if (typeof message !== 'string' || message.trim().length === 0) return [`no message (${JSON.stringify(message)})`];
  if (/[\r\n]/.test(message)) problems.push(`message spans lines: ${JSON.stringify(message)}`);
  if (message.length > 1000) problems.push(`message is ${message.length} characters long`);
  // What the message quotes (cells, column names) came from the file; only the rest must not leak.
  const outside = message.replace(/"(?:[^"\\]|\\.)*"/g, '""');
  for (const leak of leaks) if (leak.test(outside)) problems.push(`message leaks ${leak}: ${JSON.stringify(message)}`);
  const row = where.row;
  if (row !== null && row !== undefined && !message.includes(`row ${row}`)) {
    // A header problem may name the header or the column instead of "row 1".
    const header = row === 1 && (message.includes('header') || (where.column !== null && where.column !== undefined && message.includes(columnName(where.column))));
    if (!header) problems.push(`message does not name row ${row}: ${message}`);
  }
  // Columns are shown quoted, escaped and shortened (reader/errors.ts columnName).
  const shownColumn = where.column === null || where.column === undefined ? null : columnName(where.column);
  if (shownColumn !== null && !message.includes(shownColumn.slice(0, Math.min(shownColumn.length - 1, 40)))) {
    problems.push(`message does not name column ${JSON.stringify(where.column)}: ${message}`);
  }
  return problems;
}

/**
 * Problems with an error thrown by the reader or the engine: it must be one of their data errors
 * (never a TypeError or the like), with a clear message; a row, when given, must be a line of the
 * file (header = 1).
 */
export function dataErrorProblems(error: unknown, lines: number): string[] {
  if (error instanceof HoldoutInputError) {
    const problems = messageProblems(error.message, { row: error.row, column: error.column });
    if (error.row !== null && (!Number.isInteger(error.row) || error.row < 1 || error.row > lines + 1)) problems.push(`row ${error.row} is not a line of the file (${lines} lines)`);
    return problems;
  }
  if (error instanceof StatisticError) return messageProblems(error.message);
  const text = error instanceof Error ? `${error.name}: ${error.message}\n${error.stack ?? ''}` : String(error);
  return [`not a data error: ${text.slice(0, 800)}`];
}

/** Every number in a value that is NaN or infinite, with its path (a report must have none). */
export function nonFiniteNumbers(value: unknown, path = '$', found: string[] = []): string[] {
  if (found.length > 10) return found;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) found.push(`${path} = ${value}`);
  } else if (Array.isArray(value)) value.forEach((item, i) => nonFiniteNumbers(item, `${path}[${i}]`, found));
  else if (ArrayBuffer.isView(value)) {
    const array = value as unknown as ArrayLike<number>;
    for (let i = 0; i < array.length; i++) if (typeof array[i] === 'number' && !Number.isFinite(array[i])) {
      found.push(`${path}[${i}] = ${array[i]}`);
      break;
    }
  } else if (value && typeof value === 'object') for (const [key, item] of Object.entries(value)) nonFiniteNumbers(item, `${path}.${key}`, found);
  return found;
}

/** Runs `work` and fails if it takes longer than `ms` (the case is reported as a hang). */
export async function within<T>(ms: number, what: string, work: () => Promise<T>): Promise<{ value?: T; error?: unknown; elapsedMs: number }> {
  const started = performance.now();
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`HANG: ${what} took longer than ${ms} ms`)), ms);
  });
  try {
    const value = await Promise.race([work(), timeout]);
    return { value, elapsedMs: performance.now() - started };
  } catch (error) {
    if (error instanceof Error && error.message.startsWith('HANG:')) throw error;
    return { error, elapsedMs: performance.now() - started };
  } finally {
    clearTimeout(timer);
  }
}

/**
 * fast-check's assert, but the failure names the case by its own error message (which describes
 * the input briefly) with the seed and path to replay it, instead of printing megabytes of bytes.
 */
export async function checkProperty<T>(property: fc.IAsyncProperty<T>, params: fc.Parameters<T>): Promise<void> {
  const details = await fc.check(property, params);
  if (!details.failed) return;
  const cause = details.errorInstance instanceof Error ? details.errorInstance.message : String(details.errorInstance);
  throw new Error(`property failed after ${details.numRuns} runs (seed ${details.seed}, path "${details.counterexamplePath}"):\n${cause.slice(0, 4000)}`);
}
