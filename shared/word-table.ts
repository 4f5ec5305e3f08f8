/**
 * Tables in words, the same for a page, the printable report, the PDF pack and a sheet: a heading
 * row and rows of cells, every number already formatted (shared/format.ts).
 */
export interface WordTable {
  head: string[];
  rows: string[][];
}

/** A table in words with its note and the columns holding figures (right-aligned). */
export interface WordedTable extends WordTable {
  note?: string;
  /** Columns holding numbers (right-aligned). */
  numeric: number[];
}

/** The table with every column but the first and `words` marked as figures. */
export function withFigures(table: WordTable, words: number[] = []): WordedTable {
  return { ...table, numeric: table.head.map((_, index) => index).filter((index) => index > 0 && !words.includes(index)) };
}
