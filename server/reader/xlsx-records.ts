import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import type ExcelJS from 'exceljs';
import { formatCount } from '@shared/format';
import type { HoldoutSource, SourceInfo } from './byte-source';
import { type CsvHandlers, type CsvLayout, MAX_COLUMNS, MAX_ROWS } from './csv-records';
import { columnName, HoldoutInputError } from './errors';

/**
 * A holdout in an .xlsx workbook, read into the same record stream as a CSV file (csv-records.ts),
 * so scanning, mapping and validation — and every error, named by row and column — are the
 * CSV path's own. The first worksheet is read, or the one named in `sheet`. Rows are numbered as
 * the spreadsheet numbers them (the header is row 1, as it is line 1 of a CSV file); a row with
 * nothing in it is skipped. Each cell becomes the text a CSV export would hold:
 *
 * - a number as JavaScript writes it (its full precision, not the cell's display format);
 * - a formula as its stored result (a workbook saved by a spreadsheet program holds it); an
 *   error result ("#VALUE!", "#N/A") as that text, which the reader then names as not a number;
 * - a date as its ISO date (YYYY-MM-DD, or with the time when it has one); TRUE / FALSE;
 * - rich text and hyperlinks as their plain text; an empty cell as "".
 *
 * The workbook is read whole (exceljs), so its size is bounded by the upload limit.
 */

const BATCH = 5000;

function cellText(value: ExcelJS.CellValue): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'string') return value;
  if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
  if (value instanceof Date) {
    const iso = value.toISOString();
    return iso.endsWith('T00:00:00.000Z') ? iso.slice(0, 10) : iso.replace('.000Z', 'Z');
  }
  if (typeof value === 'object') {
    if ('error' in value) return String(value.error);
    if ('richText' in value) return value.richText.map((part) => part.text).join('');
    if ('formula' in value || 'sharedFormula' in value) return 'result' in value && value.result !== undefined ? cellText(value.result as ExcelJS.CellValue) : '';
    if ('text' in value) return typeof value.text === 'string' ? value.text : cellText(value.text as ExcelJS.CellValue);
  }
  return String(value);
}

export async function readXlsx(source: HoldoutSource, info: SourceInfo, handlers: CsvHandlers): Promise<CsvLayout> {
  const bytes = 'bytes' in source ? Buffer.from(source.bytes.buffer, source.bytes.byteOffset, source.bytes.byteLength) : await readFile(source.path);
  info.bytes = bytes.length;
  info.sha256 = createHash('sha256').update(bytes).digest('hex');
  handlers.onBytes?.(bytes.length);
  // Loaded on first use: exceljs takes about half a second to import, which every CSV read (the
  // compare command's start-up) would otherwise pay.
  const { default: Excel } = await import('exceljs');
  const workbook = new Excel.Workbook();
  try {
    await workbook.xlsx.load(bytes as unknown as ArrayBuffer);
  } catch {
    throw new HoldoutInputError('binary_file', 'the file is a ZIP archive but not an .xlsx workbook that can be read: save the sheet as .xlsx or CSV');
  }
  const sheets = workbook.worksheets;
  if (sheets.length === 0) throw new HoldoutInputError('empty_file', 'the workbook has no worksheets');
  const sheet = source.sheet ? sheets.find((candidate) => candidate.name === source.sheet) : sheets[0];
  if (!sheet) {
    throw new HoldoutInputError('no_such_sheet', `the workbook has no sheet named ${columnName(source.sheet!)}; its sheets are ${sheets.map((candidate) => columnName(candidate.name)).join(', ')}`);
  }

  info.sheet = sheet.name;

  const layout: CsvLayout = { delimiter: ',', newline: '\n', header: [] };
  let width = 0;
  let records = 0;
  let rows: string[][] = [];
  let lines: number[] = [];
  const flush = () => {
    if (rows.length === 0) return;
    handlers.onRows(rows, Float64Array.from(lines));
    rows = [];
    lines = [];
  };
  sheet.eachRow({ includeEmpty: false }, (row, number) => {
    const values = row.values as ExcelJS.CellValue[];
    // row.values is 1-based: index 0 is always empty.
    const cells: string[] = [];
    for (let column = 1; column < values.length; column++) cells.push(cellText(values[column]));
    while (cells.length > 0 && cells[cells.length - 1] === '' && cells.length > width) cells.pop();
    if (cells.every((cell) => cell.trim() === '')) return;
    if (layout.header.length === 0) {
      const header = cells.map((name) => name.trim());
      if (header.length > MAX_COLUMNS) {
        throw new HoldoutInputError('too_many_columns', `the header has ${formatCount(header.length)} columns; at most ${MAX_COLUMNS} are read`, number);
      }
      layout.header = header;
      width = header.length;
      handlers.onHeader(layout);
      return;
    }
    // Empty trailing cells are part of the row, as a CSV export writes them.
    while (cells.length < width) cells.push('');
    records++;
    if (records > MAX_ROWS) throw new HoldoutInputError('too_many_rows', `the sheet has more than ${formatCount(MAX_ROWS)} rows`, null);
    rows.push(cells);
    lines.push(number);
    if (rows.length >= BATCH) flush();
  });
  flush();
  if (layout.header.length === 0) throw new HoldoutInputError('empty_file', `the sheet "${sheet.name}" is empty`);
  return layout;
}
