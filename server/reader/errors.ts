/**
 * Bad input in a holdout file: what is wrong and where. `row` is the line number in the file
 * (the header is line 1; a quoted field spanning lines counts its lines), null when the problem
 * is not one row's (an empty file, a single class); `column` is the header name, when one column
 * is at fault. The message is one line that already names both, e.g.
 * `row 1043, column "challenger": "abc" is not a number`.
 */
export type HoldoutInputCode =
  | 'empty_file'
  | 'no_rows'
  | 'binary_file'
  | 'not_utf8'
  | 'too_many_columns'
  | 'row_too_long'
  | 'unclosed_quote'
  | 'too_many_rows'
  | 'duplicate_column'
  | 'missing_column'
  | 'same_column'
  | 'ragged_row'
  | 'not_a_number'
  | 'amount_too_large'
  | 'missing_score'
  | 'missing_outcome'
  | 'bad_outcome'
  | 'single_class'
  | 'missing_value'
  | 'bad_weight'
  | 'bad_probability'
  | 'unsupported_weight'
  | 'pd_orientation'
  | 'not_a_probability'
  | 'no_such_sheet';

export class HoldoutInputError extends Error {
  override name = 'HoldoutInputError';
  constructor(
    readonly code: HoldoutInputCode,
    message: string,
    readonly row: number | null = null,
    readonly column: string | null = null,
  ) {
    super(message);
  }

  /**
   * The same problem in a workbook's sheet, named first: `sheet "Holdout", row 12, column "x": …`
   * (or `sheet "Holdout": …` for a problem that is not one row's). Named once: a message that
   * already names the sheet is kept.
   */
  inSheet(sheet: string): HoldoutInputError {
    const name = `sheet ${columnName(sheet)}`;
    if (this.message.startsWith(name)) return this;
    const joined = /^(row|column) /.test(this.message) ? `${name}, ${this.message}` : `${name}: ${this.message}`;
    return new HoldoutInputError(this.code, joined, this.row, this.column);
  }

  /** The shape of shared/comparisons.ts `rowErrorSchema`. */
  toRowError(): { row: number | null; column: string | null; message: string } {
    return { row: this.row, column: this.column, message: this.message };
  }
}

/**
 * A column name in quotes for a message: `"challenger"`, shortened when long (a header cell can
 * be megabytes) and with line breaks and other control characters escaped, so a message stays one
 * line.
 */
export function columnName(name: string): string {
  const short = name.length > 60 ? `${name.slice(0, 57)}…` : name;
  // eslint-disable-next-line no-control-regex -- escaping control characters is the point
  return `"${short.replace(/[\u0000-\u001f\u007f\u0085\u2028\u2029]/g, (c) => (c === '\n' ? '\\n' : c === '\r' ? '\\r' : c === '\t' ? '\\t' : `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`))}"`;
}

/** `row 12, column "x": ` — the prefix every row-level message starts with. */
export function where(row: number, column?: string): string {
  return column === undefined ? `row ${row}` : `row ${row}, column ${columnName(column)}`;
}

/**
 * `row 12 has 3 fields, the header has 8`, with the likely cause when the row's fields show it:
 * a field that holds the file's own line end can only be a quoted field running over several
 * lines (a quote left open?); in an LF or CR file, one that holds the other kind means the file
 * mixes line ends.
 */
export function raggedRowMessage(row: number, fields: readonly string[], width: number, newline: '\n' | '\r\n' | '\r'): string {
  const base = `${where(row)} has ${fields.length} field${fields.length === 1 ? '' : 's'}, the header has ${width}`;
  if (fields.some((field) => field.includes(newline))) return `${base}; a quoted field on it runs over several lines: is a quote left open?`;
  // (A CRLF file's quoted fields often hold a bare LF, a line break inside a cell: no hint then.)
  if (newline !== '\r\n' && fields.some((field) => field.includes(newline === '\n' ? '\r' : '\n'))) {
    const name = { '\n': 'LF', '\r\n': 'CRLF', '\r': 'CR' }[newline];
    return `${base}; the file mixes line ends (its header ends with ${name}): save it with one kind`;
  }
  return base;
}

/** A cell quoted for a message, shortened when long. */
export function quoteCell(value: string): string {
  const shown = value.length > 40 ? `${value.slice(0, 37)}…` : value;
  return JSON.stringify(shown);
}
