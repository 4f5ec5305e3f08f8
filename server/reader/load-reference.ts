import type { ColumnMapping } from '@shared/report';
import { type HoldoutSource, sourceInfo } from './byte-source';
import { inSheetOf, readRecords } from './records';
import { columnName, HoldoutInputError, quoteCell, raggedRowMessage, where } from './errors';
import { MISSING, parseNumber } from './values';

/**
 * Loads a reference sample for the PSI (the development sample): the same two score columns as
 * the holdout's mapping, no outcome needed, in one streaming pass. Every score must be a number
 * (a probability of default between 0 and 1 when the mapping marks it as one); rows with an empty
 * score are an error, or left out with `dropMissing`, as in the holdout. Every problem is a
 * HoldoutInputError naming the row and column.
 */

export interface LoadedReference {
  fileName: string;
  sha256: string;
  bytes: number;
  champion: Float64Array;
  challenger: Float64Array;
  rowsRead: number;
  rowsDropped: number;
}

export async function loadReference(source: HoldoutSource, mapping: ColumnMapping, options: { dropMissing?: boolean } = {}): Promise<LoadedReference> {
  const info = sourceInfo(source);
  const names = [mapping.champion, mapping.challenger] as const;
  const pd = [mapping.probabilityOfDefault?.champion === true, mapping.probabilityOfDefault?.challenger === true];
  const columns: number[][] = [[], []];
  let at = [-1, -1];
  let width = 0;
  let decimalComma = false;
  let newline: '\n' | '\r\n' | '\r' = '\n';
  let rowsRead = 0;
  let dropped = 0;
  // A workbook is read like the holdout (its sheet, named in every problem).
  await inSheetOf(info, () => readRecords(source, info, {
    onHeader(found) {
      width = found.header.length;
      decimalComma = found.delimiter === ';';
      newline = found.newline;
      at = names.map((name) => {
        const index = found.header.indexOf(name);
        if (index === -1) {
          throw new HoldoutInputError('missing_column', `reference sample ${info.fileName}: column ${columnName(name)} is not in the file; it needs the same score columns as the holdout`, 1, name);
        }
        return index;
      });
    },
    onRows(rows, lines) {
      for (let r = 0; r < rows.length; r++) {
        const row = rows[r];
        if (row.length !== width) {
          if (row.length === 1 && row[0].trim() === '') continue;
          throw new HoldoutInputError('ragged_row', `reference sample: ${raggedRowMessage(lines[r], row, width, newline)}`, lines[r]);
        }
        rowsRead++;
        const values = [parseNumber(row[at[0]], decimalComma), parseNumber(row[at[1]], decimalComma)];
        if (values.some((value) => value === MISSING) && options.dropMissing) {
          dropped++;
          continue;
        }
        for (let m = 0; m < 2; m++) {
          const value = values[m];
          if (typeof value !== 'number') {
            const what = value === MISSING ? 'the score is empty' : `${quoteCell(row[at[m]].trim())} is not a number`;
            throw new HoldoutInputError(value === MISSING ? 'missing_score' : 'not_a_number', `reference sample: ${where(lines[r], names[m])}: ${what}`, lines[r], names[m]);
          }
          if (pd[m] && !(value >= 0 && value <= 1)) {
            throw new HoldoutInputError('not_a_probability', `reference sample: ${where(lines[r], names[m])}: ${value} is not a probability of default (0 to 1)`, lines[r], names[m]);
          }
          columns[m].push(value);
        }
      }
    },
  }));
  if (columns[0].length === 0) throw new HoldoutInputError('no_rows', `reference sample ${info.fileName} has no rows with both scores`);
  return {
    fileName: info.fileName,
    sha256: info.sha256,
    bytes: info.bytes,
    champion: Float64Array.from(columns[0]),
    challenger: Float64Array.from(columns[1]),
    rowsRead,
    rowsDropped: dropped,
  };
}
