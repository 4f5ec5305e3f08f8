import type ExcelJS from 'exceljs';

/**
 * The committee workbook's tables (workbook.ts and the sheets beside it): a bold title, a header
 * row, then values — numbers as numbers with an Excel number format, everything else as text,
 * never a formula (`cell()`).
 */

export type Value = string | number | null;

export interface Column {
  header: string;
  /** Excel number format for numbers in this column. */
  format?: string;
  width?: number;
}

export const F = {
  count: '#,##0',
  rate: '0.00%',
  share: '0.0%',
  metric: '0.0000',
  p: '0.0000E+00',
  score: '#,##0.####',
  number: '#,##0.00',
} as const;

export function cell(value: unknown): string | number | null {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  return String(value);
}

export function writeTable(sheet: ExcelJS.Worksheet, title: string, columns: Column[], rows: Value[][]): void {
  if (sheet.rowCount > 0) sheet.addRow([]);
  const titleRow = sheet.addRow([title]);
  titleRow.font = { bold: true };
  const head = sheet.addRow(columns.map((column) => column.header));
  head.font = { bold: true };
  head.eachCell((c) => {
    c.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFEEECE6' } };
  });
  for (const values of rows) {
    const row = sheet.addRow(values.map(cell));
    values.forEach((value, index) => {
      const format = columns[index]?.format;
      if (typeof value === 'number' && format) row.getCell(index + 1).numFmt = format;
    });
  }
  columns.forEach((column, index) => {
    const current = sheet.getColumn(index + 1);
    current.width = Math.max(current.width ?? 0, column.width ?? Math.min(60, Math.max(10, column.header.length + 2)));
  });
}

export function facts(sheet: ExcelJS.Worksheet, title: string, rows: [string, Value, string?][]): void {
  writeTable(
    sheet,
    title,
    [{ header: 'Item', width: 34 }, { header: 'Value', width: 24 }],
    rows.map(([label, value]) => [label, value]),
  );
  // Per-row formats (a facts table mixes counts, rates and metrics).
  const first = sheet.rowCount - rows.length + 1;
  rows.forEach(([, value, format], index) => {
    if (typeof value === 'number' && format) sheet.getRow(first + index).getCell(2).numFmt = format;
  });
}

type Interval = readonly [number, number] | null | undefined;

/** An interval as two columns beside its value: "<name>, low" and "<name>, high", in the value's format. */
export function intervalColumns(name: string, format: string, width?: number): Column[] {
  return [
    { header: `${name}, low`, format, width },
    { header: `${name}, high`, format, width },
  ];
}

/** An interval's two ends as cells (empty without an interval), under intervalColumns. */
export function intervalEnds(interval: Interval): [Value, Value] {
  return [interval?.[0] ?? null, interval?.[1] ?? null];
}

/** Intervals of a row of values as two rows, "<name>, low" and "<name>, high" (a facts-like table with one column per model). */
export function intervalRows(name: string, intervals: Interval[]): [Value[], Value[]] {
  return [
    [`${name}, low`, ...intervals.map((interval) => interval?.[0] ?? null)],
    [`${name}, high`, ...intervals.map((interval) => interval?.[1] ?? null)],
  ];
}

/**
 * A column with the value it takes from each row: the header, the number format, the width and
 * the value are stated once, side by side, so a sheet's columns and its rows never drift apart.
 * `col.count('Bads', (row) => row.bads)`; `col.interval('ΔGini', F.metric, (row) => row.deltaGiniCi)`
 * gives the two columns of an interval.
 */
export interface Field<Row> extends Column {
  value: (row: Row) => Value;
}

const typed =
  (format?: string) =>
  <Row>(header: string, value: (row: Row) => Value, width?: number): Field<Row> => ({ header, format, width, value });

export const col = {
  text: typed(),
  count: typed(F.count),
  rate: typed(F.rate),
  share: typed(F.share),
  metric: typed(F.metric),
  p: typed(F.p),
  score: typed(F.score),
  number: typed(F.number),
  /** "yes" or "no". */
  yesNo: <Row>(header: string, value: (row: Row) => boolean, width?: number): Field<Row> => ({ header, width, value: (row) => (value(row) ? 'yes' : 'no') }),
  /** An interval as "<name>, low" and "<name>, high" (empty without one), in the value's format. */
  interval: <Row>(name: string, format: string, value: (row: Row) => Interval, width?: number): Field<Row>[] =>
    intervalColumns(name, format, width).map((column, end) => ({ ...column, value: (row: Row) => intervalEnds(value(row))[end] })),
};

/** A table of `rows`, one column per field. */
export function writeFields<Row>(sheet: ExcelJS.Worksheet, title: string, fields: Field<Row>[], rows: readonly Row[]): void {
  writeTable(sheet, title, fields, rows.map((row) => fields.map((field) => field.value(row))));
}
