import { open } from 'node:fs/promises';
import type { HoldoutSource, SourceInfo } from './byte-source';
import { type CsvHandlers, type CsvLayout, readCsv } from './csv-records';
import { columnName, HoldoutInputError } from './errors';
import { readXlsx } from './xlsx-records';

/**
 * The one entry to a holdout's records: an .xlsx workbook (a ZIP file) is read by xlsx-records.ts,
 * anything else as CSV text; both give the same stream of header and rows, with row numbers.
 */

async function startsWithZip(source: HoldoutSource): Promise<boolean> {
  let head: Uint8Array;
  if ('bytes' in source) head = source.bytes.subarray(0, 4);
  else {
    const file = await open(source.path, 'r');
    try {
      const buffer = Buffer.alloc(4);
      const { bytesRead } = await file.read(buffer, 0, 4, 0);
      head = buffer.subarray(0, bytesRead);
    } finally {
      await file.close();
    }
  }
  return head.length === 4 && head[0] === 0x50 && head[1] === 0x4b && head[2] === 0x03 && head[3] === 0x04;
}

/**
 * Runs a reading of `source` (a scan, a load, a validation), naming the worksheet in every
 * problem it throws when the source was a workbook (HoldoutInputError.inSheet). Problems a
 * validation collects instead of throwing go through `namedIn` too.
 */
export async function inSheetOf<T>(info: SourceInfo, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof HoldoutInputError && info.sheet !== undefined) throw error.inSheet(info.sheet);
    throw error;
  }
}

export function namedIn(info: SourceInfo, errors: HoldoutInputError[]): HoldoutInputError[] {
  return info.sheet === undefined ? errors : errors.map((error) => error.inSheet(info.sheet!));
}

export async function readRecords(source: HoldoutSource, info: SourceInfo, handlers: CsvHandlers): Promise<CsvLayout> {
  if (await startsWithZip(source)) return readXlsx(source, info, handlers);
  if (source.sheet) {
    throw new HoldoutInputError('no_such_sheet', `the file is CSV text, not an .xlsx workbook, so it has no sheet ${columnName(source.sheet)}: upload it without a sheet`);
  }
  return readCsv(source, info, handlers);
}
