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
  | 'too_many_rows'
  | 'duplicate_column'
  | 'missing_column'
  | 'same_column'
  | 'ragged_row'
  | 'not_a_number'
  | 'missing_score'
  | 'missing_outcome'
  | 'bad_outcome'
  | 'single_class'
  | 'missing_value'
  | 'unsupported_weight';

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

  /** The shape of shared/comparisons.ts `rowErrorSchema`. */
  toRowError(): { row: number | null; column: string | null; message: string } {
    return { row: this.row, column: this.column, message: this.message };
  }
}

/** `row 12, column "x": ` — the prefix every row-level message starts with. */
export function where(row: number, column?: string): string {
  return column === undefined ? `row ${row}` : `row ${row}, column "${column}"`;
}

/** A cell quoted for a message, shortened when long. */
export function quoteCell(value: string): string {
  const shown = value.length > 40 ? `${value.slice(0, 37)}…` : value;
  return JSON.stringify(shown);
}
