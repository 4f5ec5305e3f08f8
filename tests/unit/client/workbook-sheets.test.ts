import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { decodeXmlText, looksLikeWorkbook, sheetNamesOf, workbookSheetNames } from '@/features/holdouts/lib/workbook-sheets';

/**
 * The upload form's sheet list, read from the workbook's ZIP archive before the upload. Expected
 * names: the ones exceljs (an independent .xlsx reader and writer from npm) reads back from the
 * same bytes.
 */

async function workbook(names: string[]): Promise<Uint8Array<ArrayBuffer>> {
  const book = new ExcelJS.Workbook();
  for (const name of names) book.addWorksheet(name).addRow(['account_id', 'bad']);
  return new Uint8Array(await book.xlsx.writeBuffer());
}

describe('the sheet names of an .xlsx workbook, read in the browser', () => {
  it('lists every sheet in order, with markup characters and accents, as exceljs reads them', async () => {
    const bytes = await workbook(['Read me', 'Holdout & <2025> "Q1"', 'Prêt personnel', "O'Neill's"]);
    const check = new ExcelJS.Workbook();
    await check.xlsx.load(bytes as unknown as ArrayBuffer);
    const expected = check.worksheets.map((sheet) => sheet.name);
    expect(expected).toEqual(['Read me', 'Holdout & <2025> "Q1"', 'Prêt personnel', "O'Neill's"]);
    expect(await workbookSheetNames(new Blob([bytes]))).toEqual(expected);
  });

  it('gives null for a CSV file, an empty file and a truncated workbook', async () => {
    expect(await workbookSheetNames(new Blob(['account_id,bad\n1,0\n']))).toBeNull();
    expect(await workbookSheetNames(new Blob([]))).toBeNull();
    const bytes = await workbook(['Holdout']);
    expect(await workbookSheetNames(new Blob([bytes.subarray(0, bytes.length - 30)]))).toBeNull();
  });

  it('reads sheet elements with a namespace prefix or single quotes, and decodes references', () => {
    expect(sheetNamesOf(`<x:sheets><x:sheet name='A &amp; B' sheetId="1" r:id="rId1"/><x:sheet sheetId="2" name="&#x20AC;&#8364;" r:id="rId2"/></x:sheets>`)).toEqual([
      'A & B',
      '€€',
    ]);
    expect(sheetNamesOf('<sheets><sheetView name="no"/></sheets>')).toEqual([]);
    expect(decodeXmlText('&lt;&gt;&quot;&apos;&amp;amp;&unknown;')).toBe(`<>"'&amp;&unknown;`);
  });

  it('knows a workbook by its name or type', () => {
    expect(looksLikeWorkbook({ name: 'holdout.XLSX', type: '' })).toBe(true);
    expect(looksLikeWorkbook({ name: 'holdout', type: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet' })).toBe(true);
    expect(looksLikeWorkbook({ name: 'holdout.csv', type: 'text/csv' })).toBe(false);
  });
});
