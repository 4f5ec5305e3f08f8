import Papa from 'papaparse';
import { asText, type HoldoutSource, type SourceInfo, sourceChunks } from './byte-source';
import { HoldoutInputError } from './errors';
import { formatCount } from '@shared/format';

/**
 * The one streaming CSV reader behind the CLI and the uploads, on papaparse's parser (its fast
 * path, a plain split, runs on every chunk without a quote character). Handles a header row;
 * comma, semicolon or tab, detected from the header line; quoted fields (also across lines);
 * UTF-8 with or without BOM; LF, CRLF or CR line ends; no trailing newline.
 *
 * Guards against absurd input with a clear error instead of running out of memory: more than
 * MAX_COLUMNS columns, or a row (a record, quotes included) longer than MAX_ROW_CHARS — which is
 * also what an unclosed quote looks like in the middle of a file; at its end, the row where the
 * quote opened is named.
 */

export const MAX_COLUMNS = 5000;
export const MAX_ROW_CHARS = 8 << 20;
export const MAX_ROWS = 50_000_000;

export type Delimiter = ',' | ';' | '\t';

export interface CsvLayout {
  delimiter: Delimiter;
  newline: '\n' | '\r\n' | '\r';
  header: string[];
}

export interface CsvHandlers {
  /**
   * The header. May return which columns' cells it reads (by position): the others may then come
   * through as '' (cells are cut out of the text only for the columns read). Rows whose field
   * count differs from the header's, and rows of one field, always come whole.
   */
  onHeader(layout: CsvLayout): readonly boolean[] | void;
  /**
   * A batch of records in file order. `lines[i]` is the line number where rows[i] starts (header
   * = line 1). Empty lines come through as `['']`; callers skip them.
   */
  onRows(rows: string[][], lines: Float64Array): void;
  /**
   * Optional fast path: the lines of text without any quote character, uncut (plainLines' bounds:
   * line `firstLine + i` is input[bounds[2i], bounds[2i + 1]); blank lines included), for a
   * reader that takes the common rows from the text itself and reads any other line as splitLine
   * cuts it, exactly as onRows would have had it. Without it, such text comes through onRows.
   */
  onPlainLines?(input: string, bounds: Int32Array, count: number, firstLine: number): void;
  /**
   * Optional faster path beside onPlainLines, for the parts of the file that are ASCII without
   * any quote: the same lines as bytes (plainByteLines' bounds into `input`), never made into a
   * string. Used only together with onPlainLines, which takes the rest.
   */
  onPlainBytes?(input: Uint8Array, bounds: Int32Array, count: number, firstLine: number): void;
  onBytes?(read: number): void;
}

/** Counts delimiter candidates outside quotes in the header line. */
function detectDelimiter(headerLine: string): Delimiter {
  let quoted = false;
  const counts = { ',': 0, ';': 0, '\t': 0 };
  for (let i = 0; i < headerLine.length; i++) {
    const c = headerLine[i];
    if (c === '"') quoted = !quoted;
    else if (!quoted && (c === ',' || c === ';' || c === '\t')) counts[c]++;
  }
  if (counts[';'] > counts[','] && counts[';'] >= counts['\t']) return ';';
  if (counts['\t'] > counts[','] && counts['\t'] > counts[';']) return '\t';
  return ',';
}

function detectNewline(text: string, at: number): CsvLayout['newline'] {
  if (text[at] === '\r') return text[at + 1] === '\n' ? '\r\n' : '\r';
  return '\n';
}

function firstLineEnd(text: string): number {
  const lf = text.indexOf('\n');
  const cr = text.indexOf('\r');
  if (lf === -1) return cr;
  if (cr === -1) return lf;
  return Math.min(lf, cr);
}

/**
 * Where each line of text without any quote character starts and ends, as papaparse cuts it: the
 * lines of input[0, end) split on the file's line end (`end`: the input's length at the end of
 * the file, else the last line end; the last line is then input[lastStart, end)). Pairs of
 * [start, end) in one array; returns the number of lines.
 */
export function plainLines(input: string, end: number, newline: CsvLayout['newline']): { bounds: Int32Array; count: number } {
  const step = newline.length;
  let bounds = new Int32Array(2048);
  let count = 0;
  let lineStart = 0;
  for (;;) {
    let lineEnd = input.indexOf(newline, lineStart);
    if (lineEnd === -1 || lineEnd > end) lineEnd = end;
    if (2 * count + 2 > bounds.length) {
      const more = new Int32Array(bounds.length * 2);
      more.set(bounds);
      bounds = more;
    }
    bounds[2 * count] = lineStart;
    bounds[2 * count + 1] = lineEnd;
    count++;
    if (lineEnd >= end) break;
    lineStart = lineEnd + step;
  }
  return { bounds, count };
}

/**
 * plainLines on ASCII text held as bytes: the lines of input[0, end) split on the file's line end,
 * as pairs of [start, end) byte offsets (the same numbers plainLines gives on the text).
 */
export function plainByteLines(input: Uint8Array, end: number, newline: CsvLayout['newline']): { bounds: Int32Array; count: number } {
  let bounds = new Int32Array(Math.max(2048, 2 * Math.ceil(end / 24)));
  let count = 0;
  let lineStart = 0;
  // Line ends found by Buffer's indexOf (memchr: about a third of the time of a loop over the
  // bytes): the line end's first byte, then for CRLF its second.
  const bytes = Buffer.from(input.buffer, input.byteOffset, input.byteLength);
  const first = newline === '\n' ? 10 : 13;
  const crlf = newline === '\r\n';
  for (;;) {
    let lineEnd = bytes.indexOf(first, lineStart);
    while (crlf && lineEnd !== -1 && lineEnd < end && !(lineEnd + 1 < end && bytes[lineEnd + 1] === 10)) lineEnd = bytes.indexOf(first, lineEnd + 1);
    if (lineEnd === -1 || lineEnd > end) lineEnd = end;
    if (2 * count + 2 > bounds.length) {
      const more = new Int32Array(bounds.length * 2);
      more.set(bounds);
      bounds = more;
    }
    bounds[2 * count] = lineStart;
    bounds[2 * count + 1] = lineEnd;
    count++;
    if (lineEnd >= end) break;
    lineStart = lineEnd + newline.length;
  }
  return { bounds, count };
}

/** Where the last line end of input[0, length) starts, or -1 (String.lastIndexOf on the text). */
export function lastLineEnd(input: Uint8Array, newline: CsvLayout['newline']): number {
  if (newline === '\r\n') {
    for (let at = input.length - 2; at >= 0; at--) if (input[at] === 13 && input[at + 1] === 10) return at;
    return -1;
  }
  return input.lastIndexOf(newline === '\n' ? 10 : 13);
}

/**
 * The fields of one line without quotes (input[lineStart, lineEnd)), as papaparse reads them; only
 * the cells of `wanted` columns are cut out of the text (see CsvHandlers.onHeader), and a line of
 * another width than `wanted`'s, or of one field, comes whole.
 */
export function splitLine(input: string, lineStart: number, lineEnd: number, delimiter: Delimiter, wanted: readonly boolean[] | null): string[] {
  const width = wanted === null ? 0 : wanted.length;
  const row: string[] = [];
  let fieldStart = lineStart;
  let field = 0;
  for (;;) {
    let fieldEnd = input.indexOf(delimiter, fieldStart);
    if (fieldEnd === -1 || fieldEnd > lineEnd) fieldEnd = lineEnd;
    row.push(field < width && !wanted![field] ? '' : input.substring(fieldStart, fieldEnd));
    field++;
    if (fieldEnd === lineEnd) break;
    fieldStart = fieldEnd + 1;
  }
  if (wanted !== null && (field !== width || field === 1)) return input.substring(lineStart, lineEnd).split(delimiter);
  return row;
}

/**
 * The records of text without any quote character, as papaparse reads them, without papaparse
 * (plainLines, then splitLine on each line). Unless `last`, the text after the last line end is
 * left for the next chunk (`cursor`: where it starts). About three times faster than the parser
 * on a typical holdout, most of it from the cells never cut.
 */
export function splitPlain(input: string, last: boolean, delimiter: Delimiter, newline: CsvLayout['newline'], wanted: readonly boolean[] | null): { data: string[][]; cursor: number } {
  const data: string[][] = [];
  if (input.length === 0) return { data, cursor: 0 };
  const end = last ? input.length : input.lastIndexOf(newline);
  if (end === -1) return { data, cursor: 0 };
  const { bounds, count } = plainLines(input, end, newline);
  for (let i = 0; i < count; i++) data.push(splitLine(input, bounds[2 * i], bounds[2 * i + 1], delimiter, wanted));
  return { data, cursor: last ? input.length : end + newline.length };
}

/** Whether bytes of ASCII are all white space, as String.trim() has it. */
function onlySpaces(bytes: Uint8Array): boolean {
  for (let i = 0; i < bytes.length; i++) {
    const c = bytes[i];
    if (c !== 32 && (c < 9 || c > 13)) return false;
  }
  return true;
}

/** Reads the whole source; returns its layout (the header is also passed to onHeader). */
export async function readCsv(source: HoldoutSource, info: SourceInfo, handlers: CsvHandlers): Promise<CsvLayout> {
  let partial = '';
  let parser: Papa.Parser | null = null;
  let layout: CsvLayout | null = null;
  let wanted: readonly boolean[] | null = null;
  let line = 1;
  let records = 0;
  let sawText = false;

  const start = (text: string, end: number) => {
    const newline = end === -1 ? '\n' : detectNewline(text, end);
    const delimiter = detectDelimiter(end === -1 ? text : text.slice(0, end));
    parser = new Papa.Parser({ delimiter, newline, quoteChar: '"' });
    layout = { delimiter, newline, header: [] };
  };

  const take = (input: string, last: boolean) => {
    // Text without quotes (the usual export) is split directly; the parser reads the rest. (The
    // header is always parsed, so its layout is known before any row.)
    let rows: string[][];
    let cursor: number;
    let errors: { code: string; row: number }[] = [];
    if (layout!.header.length > 0 && handlers.onPlainLines && input.indexOf('"') === -1) return takePlain(input, last);
    if (layout!.header.length > 0 && input.indexOf('"') === -1) {
      ({ data: rows, cursor } = splitPlain(input, last, layout!.delimiter, layout!.newline, wanted));
    } else {
      const result = parser!.parse(input, 0, !last) as { data: string[][]; meta: { cursor: number }; errors: { code: string; row: number }[] };
      rows = result.data;
      cursor = result.meta.cursor;
      errors = result.errors;
    }
    // At the end of the file, a quote that never closed has swallowed the rest of it as one field:
    // the rows before it are read as usual, then that row is named.
    const unclosed = last ? errors.find((error) => error.code === 'MissingQuotes') : undefined;
    const consumed = last ? input.length : cursor;
    if (!last) {
      const rest = input.length - consumed;
      if (rest > MAX_ROW_CHARS) {
        throw new HoldoutInputError(
          'row_too_long',
          `row ${line + rows.length} is longer than ${MAX_ROW_CHARS >> 20} MB: is a quote left open?`,
          line + rows.length,
        );
      }
    }
    const quoted = input.indexOf('"') !== -1 && input.indexOf('"') < consumed;
    const newlineChar = layout!.newline === '\r' ? '\r' : '\n';
    const lines = new Float64Array(rows.length);
    for (let i = 0; i < rows.length; i++) {
      lines[i] = line;
      line++;
      if (quoted) {
        const row = rows[i];
        for (let f = 0; f < row.length; f++) {
          const field = row[f];
          let at = field.indexOf(newlineChar);
          while (at !== -1) {
            line++;
            at = field.indexOf(newlineChar, at + 1);
          }
        }
      }
    }
    let openLine = 0;
    if (unclosed !== undefined) {
      openLine = unclosed.row < rows.length ? lines[unclosed.row] : line;
      rows = rows.slice(0, Math.min(unclosed.row, rows.length));
    }
    const openQuote = () =>
      new HoldoutInputError('unclosed_quote', `row ${openLine}: a quote opened on this row is never closed, so the rest of the file reads as one field`, openLine);
    let offset = 0;
    if (layout!.header.length === 0) {
      // Blank lines before the header are skipped.
      while (offset < rows.length && rows[offset].length === 1 && rows[offset][0].trim() === '') offset++;
      if (offset === rows.length) {
        if (unclosed !== undefined) throw openQuote();
        return input.substring(consumed);
      }
    }
    if (layout!.header.length === 0) {
      const header = rows[offset].map((name) => name.trim());
      if (header.length > MAX_COLUMNS) {
        throw new HoldoutInputError('too_many_columns', `the header has ${formatCount(header.length)} columns; at most ${MAX_COLUMNS} are read`, 1);
      }
      layout!.header = header;
      wanted = handlers.onHeader(layout!) ?? null;
      offset++;
    }
    if (rows.length > offset) {
      records += rows.length - offset;
      if (records > MAX_ROWS) {
        throw new HoldoutInputError('too_many_rows', `the file has more than ${formatCount(MAX_ROWS)} rows`, null);
      }
      handlers.onRows(offset === 0 ? rows : rows.slice(offset), offset === 0 ? lines : lines.subarray(offset, rows.length));
    }
    if (unclosed !== undefined) throw openQuote();
    return input.substring(consumed);
  };

  // The same as take() on text without quotes once the header is known, the lines handed over
  // uncut (CsvHandlers.onPlainLines); the same checks, in the same order.
  const takePlain = (input: string, last: boolean) => {
    const { newline } = layout!;
    const end = last ? input.length : input.lastIndexOf(newline);
    const found = input.length === 0 || end === -1 ? { bounds: new Int32Array(0), count: 0 } : plainLines(input, end, newline);
    const consumed = last ? input.length : end === -1 ? 0 : end + newline.length;
    if (!last && input.length - consumed > MAX_ROW_CHARS) {
      throw new HoldoutInputError('row_too_long', `row ${line + found.count} is longer than ${MAX_ROW_CHARS >> 20} MB: is a quote left open?`, line + found.count);
    }
    if (found.count > 0) {
      records += found.count;
      if (records > MAX_ROWS) throw new HoldoutInputError('too_many_rows', `the file has more than ${formatCount(MAX_ROWS)} rows`, null);
      handlers.onPlainLines!(input, found.bounds, found.count, line);
      line += found.count;
    }
    return input.substring(consumed);
  };

  // takePlain on bytes: ASCII without quotes, once the header is known (CsvHandlers.onPlainBytes).
  // Returns the bytes after the last line end, for the next chunk.
  const takePlainBytes = (input: Uint8Array): Uint8Array => {
    const { newline } = layout!;
    const end = lastLineEnd(input, newline);
    const found = end === -1 ? { bounds: new Int32Array(0), count: 0 } : plainByteLines(input, end, newline);
    const consumed = end === -1 ? 0 : end + newline.length;
    if (input.length - consumed > MAX_ROW_CHARS) {
      throw new HoldoutInputError('row_too_long', `row ${line + found.count} is longer than ${MAX_ROW_CHARS >> 20} MB: is a quote left open?`, line + found.count);
    }
    if (found.count > 0) {
      records += found.count;
      if (records > MAX_ROWS) throw new HoldoutInputError('too_many_rows', `the file has more than ${formatCount(MAX_ROWS)} rows`, null);
      handlers.onPlainBytes!(input, found.bounds, found.count, line);
      line += found.count;
    }
    // A copy (Uint8Array's slice: a Buffer's would be a view of bytes about to be read over).
    return Uint8Array.prototype.slice.call(input, consumed);
  };

  // What is left of the text read so far after its last full line: as text, or (while the file is
  // ASCII and read as bytes) as bytes. At most one of the two is not empty.
  let carry: Uint8Array = new Uint8Array(0);
  let work = new Uint8Array(0);
  const bytesOf = (text: string) => Buffer.from(text, 'latin1');
  for await (const chunk of sourceChunks(source, info, handlers.onBytes)) {
    if (!sawText) sawText = chunk.text === undefined ? !onlySpaces(chunk.bytes) : chunk.text.trim().length > 0;
    if (chunk.text === undefined && parser !== null && layout!.header.length > 0 && handlers.onPlainBytes && handlers.onPlainLines) {
      // The file is ASCII so far, so is what is left of it.
      const head = carry.length > 0 ? carry : partial.length > 0 ? bytesOf(partial) : null;
      let input = chunk.bytes;
      if (head !== null) {
        // What was left, then the chunk, in a buffer used again for every chunk.
        if (work.length < head.length + input.length) work = new Uint8Array(2 * (head.length + input.length));
        work.set(head);
        work.set(input, head.length);
        input = work.subarray(0, head.length + input.length);
      }
      partial = '';
      if (input.indexOf(0x22) === -1) {
        carry = takePlainBytes(input);
        continue;
      }
      carry = new Uint8Array(0);
      partial = take(asText({ bytes: input, text: undefined }), false);
      continue;
    }
    let input = (carry.length > 0 ? asText({ bytes: carry, text: undefined }) : partial) + asText(chunk);
    carry = new Uint8Array(0);
    if (parser === null) {
      const end = firstLineEnd(input);
      if (end === -1) {
        if (input.length > MAX_ROW_CHARS) {
          throw new HoldoutInputError('too_many_columns', `the header line is longer than ${MAX_ROW_CHARS >> 20} MB`, 1);
        }
        partial = input;
        continue;
      }
      start(input, end);
    }
    partial = take(input, false);
    input = '';
  }
  if (carry.length > 0) partial = asText({ bytes: carry, text: undefined });
  if (!sawText) throw new HoldoutInputError('empty_file', 'the file is empty');
  if (parser === null) start(partial, firstLineEnd(partial));
  if (partial.length > 0) take(partial, true);
  if (layout === null || (layout as CsvLayout).header.length === 0) throw new HoldoutInputError('empty_file', 'the file is empty');
  return layout;
}
