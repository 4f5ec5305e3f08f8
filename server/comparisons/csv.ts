import { once } from 'node:events';
import { pipeline } from 'node:stream/promises';
import type { Response } from 'express';
import { format } from 'fast-csv';

/**
 * CSV downloads, written with fast-csv and safe to open in a spreadsheet.
 *
 * Formula injection (OWASP "CSV Injection"): a text cell that starts with `=`, `+`, `-`, `@`, a
 * tab or a line break — also after blanks, or as a full-width look-alike such as `＝` — could be
 * run as a formula, so it gets a leading apostrophe (`'=1+1`),
 * which spreadsheets show as text. Numbers are written as numbers (JavaScript's own digits, e.g.
 * `-0.25` or `1e-7`): a negative number is a value, not a formula, and the apostrophe would turn
 * it into text. Every text cell — ids, names, anything that came from a file or a person — goes
 * through the check; only values that are JavaScript numbers skip it.
 */

export type Cell = string | number | null;

const FORMULA_START = /^[=+\-@\t\r\n\u2212]/;
/** Invisible or blank characters a spreadsheet may skip before reading a formula. */
// eslint-disable-next-line no-control-regex -- control characters are exactly what is skipped here
const LEADING_BLANKS = /^[\s\u0000-\u001f\u007f\u00a0\u200b-\u200f\u2028\u2029\u202f\u2060\u3000\ufeff]+/;

/**
 * Whether a text cell could be read as a formula: it starts with a formula character, also after
 * blanks or invisible characters, or in a look-alike form — full-width `＝＋－＠`, the small `﹦`,
 * the minus sign `−` — that a spreadsheet may fold to the ASCII one (NFKC compatibility folding).
 */
export function looksLikeFormula(value: string): boolean {
  if (FORMULA_START.test(value)) return true;
  const head = value.slice(0, 64).normalize('NFKC').replace(LEADING_BLANKS, '');
  return FORMULA_START.test(head);
}

export function safeCell(value: Cell): string | number {
  if (value === null) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? value : '';
  return looksLikeFormula(value) ? `'${value}` : value;
}

/** A download file name: only a-z, 0-9 and dashes, from the comparison's id and name. */
export function downloadName(comparison: { id: number; name: string }, suffix: string): string {
  const slug = comparison.name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return `comparison-${comparison.id}${slug ? `-${slug}` : ''}-${suffix}`;
}

export function attachment(res: Response, fileName: string): void {
  // fileName is [a-z0-9.-] only (downloadName), so no quoting or encoding questions arise.
  res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
}

/** Streams the rows as CSV (header first), minding back-pressure. */
export async function sendCsv(res: Response, fileName: string, header: string[], rows: Iterable<Cell[]>): Promise<void> {
  res.status(200);
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  attachment(res, fileName);
  const stream = format({ headers: false, includeEndRowDelimiter: true });
  const done = pipeline(stream, res);
  const write = async (row: (string | number)[]) => {
    if (!stream.write(row)) await once(stream, 'drain');
  };
  await write(header.map((cell) => safeCell(cell)));
  for (const row of rows) await write(row.map(safeCell));
  stream.end();
  await done;
}
