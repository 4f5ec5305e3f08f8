import ExcelJS from 'exceljs';
import { execFileSync } from 'node:child_process';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import type request from 'supertest';
import type { TestClient } from './client';

/** Helpers for the committee pack's downloads: binary GETs, PDF text (pdfjs-dist), workbook reading (exceljs). */

export async function download(client: TestClient, path: string): Promise<request.Response & { body: Buffer }> {
  return (await client.agent
    .get(path)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    })) as request.Response & { body: Buffer };
}

/** The text of each page, as Mozilla's pdf.js extracts it (items joined by spaces, whitespace collapsed). */
export async function pdfPages(bytes: Buffer): Promise<string[]> {
  const document = await getDocument({ data: new Uint8Array(bytes), useSystemFonts: false, isEvalSupported: false }).promise;
  const pages: string[] = [];
  for (let number = 1; number <= document.numPages; number++) {
    const page = await document.getPage(number);
    const content = await page.getTextContent();
    const text = content.items.map((item) => ('str' in item ? item.str : '')).join('');
    pages.push(text.replace(/\s+/g, ' '));
  }
  await document.destroy();
  return pages;
}

/** Each page's width and height in points. */
export async function pdfPageSizes(bytes: Buffer): Promise<[number, number][]> {
  const document = await getDocument({ data: new Uint8Array(bytes), isEvalSupported: false }).promise;
  const sizes: [number, number][] = [];
  for (let number = 1; number <= document.numPages; number++) {
    const [, , width, height] = (await document.getPage(number)).view;
    sizes.push([width, height]);
  }
  await document.destroy();
  return sizes;
}

export async function readWorkbook(bytes: Buffer): Promise<ExcelJS.Workbook> {
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load(bytes as unknown as ArrayBuffer);
  return workbook;
}

/** The rows of a sheet as arrays of cell values (1-based columns shifted to 0-based). */
export function sheetRows(sheet: ExcelJS.Worksheet): unknown[][] {
  const rows: unknown[][] = [];
  sheet.eachRow({ includeEmpty: true }, (row) => {
    const values = row.values as unknown[];
    rows.push(values.slice(1));
  });
  return rows;
}

/**
 * The raw XML of every worksheet, read with Python's standard zipfile module (a reader that is
 * not exceljs), to check what is actually in the file: cell types and any formula element.
 */
export function rawSheetXml(bytes: Buffer): string[] {
  const script = [
    'import sys, zipfile, io, json',
    'z = zipfile.ZipFile(io.BytesIO(sys.stdin.buffer.read()))',
    "print(json.dumps([z.read(n).decode('utf-8') for n in sorted(z.namelist()) if n.startswith('xl/worksheets/sheet')]))",
  ].join('\n');
  return JSON.parse(execFileSync('/usr/bin/python3', ['-c', script], { input: bytes, maxBuffer: 64 << 20 }).toString('utf8')) as string[];
}

export function sharedStringsXml(bytes: Buffer): string {
  const script = "import sys, zipfile, io\nz = zipfile.ZipFile(io.BytesIO(sys.stdin.buffer.read()))\nprint(z.read('xl/sharedStrings.xml').decode('utf-8') if 'xl/sharedStrings.xml' in z.namelist() else '')";
  return execFileSync('/usr/bin/python3', ['-c', script], { input: bytes, maxBuffer: 64 << 20 }).toString('utf8');
}
