import { open } from 'node:fs/promises';
import type { HoldoutSource, SourceInfo } from './byte-source';
import { type CsvHandlers, type CsvLayout, readCsv } from './csv-records';
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

export async function readRecords(source: HoldoutSource, info: SourceInfo, handlers: CsvHandlers): Promise<CsvLayout> {
  return (await startsWithZip(source)) ? readXlsx(source, info, handlers) : readCsv(source, info, handlers);
}
