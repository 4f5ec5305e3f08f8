import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { loadHoldout, validateHoldout } from '@server/reader/load';
import { scanHoldout } from '@server/reader/scan';
import type { ColumnMapping } from '@shared/report';

/**
 * An .xlsx holdout goes through the CSV path's reader (server/reader/records.ts): the demo's
 * broken file as a workbook gives the CSV's errors by row and column, and the first 500 accounts of
 * the demo sample as a workbook load to the same columns as the CSV (whatever the size: a quarter
 * of the whole sample's work through exceljs). The workbooks are written here with exceljs the
 * way a spreadsheet program holds a CSV it opened: numbers as numbers, "#VALUE!" as an error cell.
 */

const sample = (name: string) => new URL(`../../../sample-data/${name}`, import.meta.url).pathname;

/** The first 500 accounts of the 2,000-row sample, as a CSV file of their own. */
const sampleHead = (() => {
  const lines = readFileSync(sample('tallowmere-holdout-2025-sample-2k.csv'), 'utf8').split('\n');
  const path = join(mkdtempSync(join(tmpdir(), 'scorecourt-xlsx-')), 'sample-500.csv');
  writeFileSync(path, `${lines.slice(0, 501).join('\n')}\n`);
  return path;
})();

const mapping: ColumnMapping = {
  outcome: 'bad_12m',
  badValue: '1',
  champion: 'champion_points',
  challenger: 'challenger_points',
  higherIs: { champion: 'safer', challenger: 'safer' },
  id: 'account_id',
  segments: ['product', 'channel'],
  exposure: 'loan_amount',
};

async function workbookOf(csvFile: string, options: { sheetsBefore?: string[]; formulaRow?: number } = {}): Promise<Uint8Array> {
  const rows = Papa.parse<string[]>(readFileSync(csvFile, 'utf8'), { skipEmptyLines: true }).data;
  const workbook = new ExcelJS.Workbook();
  for (const name of options.sheetsBefore ?? []) workbook.addWorksheet(name).addRows([['not', 'the', 'holdout'], ['a', 'b', 'c']]);
  const sheet = workbook.addWorksheet('Holdout');
  rows.forEach((row, index) => {
    sheet.addRow(
      row.map((cell) => {
        if (index > 0 && /^-?\d+(\.\d+)?$/.test(cell)) return Number(cell);
        if (cell === '#VALUE!') return { error: '#VALUE!' } as ExcelJS.CellErrorValue;
        return cell;
      }),
    );
  });
  if (options.formulaRow) {
    // A formula with its stored result, as a spreadsheet program saves it.
    const cell = sheet.getRow(options.formulaRow).getCell(8);
    cell.value = { formula: 'H2+0', result: Number(cell.value) } as ExcelJS.CellFormulaValue;
  }
  return new Uint8Array(await workbook.xlsx.writeBuffer());
}

describe('an .xlsx holdout', () => {
  it('reports the broken demo file’s mistakes at the same rows and columns as its CSV', async () => {
    const csv = await validateHoldout({ path: sample('tallowmere-holdout-broken.csv') }, mapping);
    const xlsx = await validateHoldout({ bytes: await workbookOf(sample('tallowmere-holdout-broken.csv')), fileName: 'broken.xlsx' }, mapping);
    const at = (report: typeof csv) => report.errors.map((error) => [error.row, error.column]);
    // The short row (102) has no field count in a workbook: its missing scores are empty cells, each named.
    expect(at(csv)).toEqual([[13, 'challenger_points'], [58, 'bad_12m'], [102, null], [151, 'champion_points']]);
    expect(at(xlsx)).toEqual([[13, 'challenger_points'], [58, 'bad_12m'], [102, 'champion_points'], [102, 'challenger_points'], [151, 'champion_points']]);
    // The same words, with the sheet named first.
    for (const [x, c] of [[0, 0], [1, 1], [4, 3]]) expect(xlsx.errors[x].message).toBe(`sheet "Holdout", ${csv.errors[c].message}`);
    expect(xlsx.errors[0].message).toBe('sheet "Holdout", row 13, column "challenger_points": "#VALUE!" is not a number');
  });

  it('loads the sample to the same columns as its CSV, from the first sheet or a chosen one', async () => {
    const fromCsv = await loadHoldout({ path: sampleHead }, mapping);
    expect(fromCsv.holdout.n).toBe(500);
    const bytes = await workbookOf(sampleHead, { formulaRow: 5 });
    const fromXlsx = await loadHoldout({ bytes, fileName: 'sample.xlsx' }, mapping);
    const chosen = await loadHoldout(
      { bytes: await workbookOf(sampleHead, { sheetsBefore: ['Notes'] }), fileName: 'two.xlsx', sheet: 'Holdout' },
      mapping,
    );
    for (const loaded of [fromXlsx, chosen]) {
      expect(loaded.holdout.n).toBe(fromCsv.holdout.n);
      expect(Array.from(loaded.holdout.champion)).toEqual(Array.from(fromCsv.holdout.champion));
      expect(Array.from(loaded.holdout.challenger)).toEqual(Array.from(fromCsv.holdout.challenger));
      expect(Array.from(loaded.holdout.bad)).toEqual(Array.from(fromCsv.holdout.bad));
    }
    expect(fromXlsx.input.sha256).not.toBe(fromCsv.input.sha256);
    expect([fromCsv.input.sheet, fromXlsx.input.sheet, chosen.input.sheet]).toEqual([undefined, 'Holdout', 'Holdout']);
  });

  it('names the sheet in a problem that stops the load, and in the scan of a sheet without rows', async () => {
    const bytes = await workbookOf(sample('tallowmere-holdout-broken.csv'), { sheetsBefore: ['Notes'] });
    await expect(loadHoldout({ bytes, fileName: 'x.xlsx', sheet: 'Holdout' }, mapping)).rejects.toMatchObject({
      row: 13,
      column: 'challenger_points',
      message: 'sheet "Holdout", row 13, column "challenger_points": "#VALUE!" is not a number',
    });
    const headerOnly = new ExcelJS.Workbook();
    headerOnly.addWorksheet('Empty 2025').addRow(['bad', 'score']);
    await expect(scanHoldout({ bytes: new Uint8Array(await headerOnly.xlsx.writeBuffer()), fileName: 'h.xlsx' })).rejects.toMatchObject({
      message: 'sheet "Empty 2025": the file has a header but no data rows',
    });
  });

  it('names a sheet that is not there, and lists the sheets', async () => {
    const bytes = await workbookOf(sample('tallowmere-holdout-broken.csv'), { sheetsBefore: ['Notes'] });
    await expect(scanHoldout({ bytes, fileName: 'x.xlsx', sheet: 'Data' })).rejects.toMatchObject({
      code: 'no_such_sheet',
      message: 'the workbook has no sheet named "Data"; its sheets are "Notes", "Holdout"',
    });
    // Without a choice the first sheet is read: here the wrong one, which the mapping then names.
    const scan = await scanHoldout({ bytes, fileName: 'x.xlsx' });
    expect(scan.columns.map((column) => column.name)).toEqual(['not', 'the', 'holdout']);
  });

  it('refuses a ZIP file that is not a workbook', async () => {
    // A ZIP holding one stored file "a.txt" (local header, central directory, end record).
    const zip = Buffer.from('504b0304140000000000000000000000000001000000010000000500000061a02e74787478504b01021400140000000000000000000000000001000000010000000500000000000000000000000000000000006120742e747874504b0506000000000100010033000000260000000000', 'hex');
    await expect(scanHoldout({ bytes: new Uint8Array(zip), fileName: 'x.xlsx' })).rejects.toMatchObject({ code: 'binary_file' });
  });

  it('refuses a sheet for a CSV file', async () => {
    await expect(scanHoldout({ path: sample('tallowmere-holdout-broken.csv'), sheet: 'Holdout' })).rejects.toMatchObject({ code: 'no_such_sheet' });
  });
});
