import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import type { Report } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { waitForRuns } from './helpers/governance';
import { rowCounts, sampleHead, sampleMapping, uploadFile } from './helpers/holdouts';

/**
 * A workbook whose holdout is not on its first sheet: the modeler names the sheet with the upload
 * (multipart field `sheet`), the holdout record keeps it, and every later reading — the validation
 * report, the comparison's analysis — reads that sheet. Problems name the sheet, the row and the
 * column; a sheet the workbook does not have is refused by name and nothing is stored.
 */

let t: TestApp;
let modeler: TestClient;

const HOLDOUT_SHEET = 'Holdout 2025';
// The first 300 accounts of the demo sample: the same columns and both outcomes; which sheet is
// read, and what a bad cell's message names, do not depend on the size (a tenth of the work of
// the whole sample, written and read through exceljs five times).
const ROWS = 300;
const sampleCsv = () => sampleHead(ROWS);

/** Sheet 1 "Read me" (a note, not the holdout), sheet 2 the first ROWS accounts of the sample as numbers. */
async function twoSheetWorkbook(change?: (sheet: ExcelJS.Worksheet) => void): Promise<Buffer> {
  const rows = Papa.parse<string[]>(sampleCsv(), { skipEmptyLines: true }).data;
  const workbook = new ExcelJS.Workbook();
  const notes = workbook.addWorksheet('Read me');
  notes.addRow(['note']);
  notes.addRow(['Tallowmere Credit Cooperative: the 2025 holdout is on the next sheet']);
  const sheet = workbook.addWorksheet(HOLDOUT_SHEET);
  rows.forEach((row, index) => sheet.addRow(row.map((cell) => (index > 0 && /^-?\d+(\.\d+)?$/.test(cell) ? Number(cell) : cell))));
  change?.(sheet);
  return Buffer.from(await workbook.xlsx.writeBuffer());
}

async function uploadSheet(bytes: Buffer | string, fileName: string, sheet: string) {
  const token = modeler.csrf ?? (await modeler.fetchCsrf());
  return modeler.agent
    .post('/api/holdouts')
    .set('X-CSRF-Token', token)
    .field('sheet', sheet)
    .attach('file', typeof bytes === 'string' ? Buffer.from(bytes, 'utf8') : bytes, fileName);
}

beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
});
afterAll(async () => {
  await t.close();
});

describe('choosing the sheet of an .xlsx holdout', () => {
  it('reads the chosen second sheet at upload, validation and analysis, and names it in the report', async () => {
    const upload = await uploadSheet(await twoSheetWorkbook(), 'tallowmere-2025.xlsx', HOLDOUT_SHEET);
    expect(upload.status, JSON.stringify(upload.body)).toBe(201);
    const holdout = upload.body as { id: number; rowCount: number; sheet: string | null; columns: { name: string }[] };
    expect(holdout.sheet).toBe(HOLDOUT_SHEET);
    expect(holdout.rowCount).toBe(ROWS);
    expect(holdout.columns.map((column) => column.name)).toContain('champion_points');
    expect((await modeler.get(`/api/holdouts/${holdout.id}`)).body).toMatchObject({ sheet: HOLDOUT_SHEET });

    const check = await modeler.post(`/api/holdouts/${holdout.id}/validate`, { mapping: sampleMapping });
    expect(check.status).toBe(200);
    expect(check.body).toMatchObject({ ok: true, summary: { rows: ROWS } });

    const created = await modeler.post('/api/comparisons', { name: 'Second sheet', holdoutId: holdout.id, mapping: sampleMapping, settings: { bootstrap: 0 } });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    await waitForRuns(t);
    const report = (await modeler.get(`/api/comparisons/${(created.body as { id: number }).id}/report`)).body as Report;
    expect(report.input.sheet).toBe(HOLDOUT_SHEET);

    // The same accounts as the CSV file, so the same numbers (the CSV's report has no sheet).
    const fromCsv = await uploadFile(modeler, sampleCsv(), 'tallowmere-2025.csv');
    const csvComparison = await modeler.post('/api/comparisons', { name: 'CSV', holdoutId: (fromCsv.body as { id: number }).id, mapping: sampleMapping, settings: { bootstrap: 0 } });
    await waitForRuns(t);
    const csvReport = (await modeler.get(`/api/comparisons/${(csvComparison.body as { id: number }).id}/report`)).body as Report;
    expect(csvReport.input.sheet).toBeUndefined();
    expect(report.rows).toBe(csvReport.rows);
    expect(report.champion).toEqual(csvReport.champion);
    expect(report.difference).toEqual(csvReport.difference);
  });

  it('without a sheet reads the first and records its name', async () => {
    const upload = await uploadFile(modeler, await twoSheetWorkbook(), 'tallowmere-2025.xlsx');
    expect(upload.status, JSON.stringify(upload.body)).toBe(201);
    expect(upload.body).toMatchObject({ sheet: 'Read me', rowCount: 1, columns: [{ name: 'note' }] });
  });

  it('names the sheet, the row and the column of a bad cell in the chosen sheet', async () => {
    const upload = await uploadSheet(
      await twoSheetWorkbook((sheet) => {
        sheet.getRow(9).getCell(8).value = 'abc';
      }),
      'broken.xlsx',
      HOLDOUT_SHEET,
    );
    expect(upload.status).toBe(201);
    const id = (upload.body as { id: number }).id;
    const check = await modeler.post(`/api/holdouts/${id}/validate`, { mapping: sampleMapping });
    expect(check.body).toMatchObject({ ok: false, errors: [{ row: 9, column: 'champion_points', message: 'sheet "Holdout 2025", row 9, column "champion_points": "abc" is not a number' }] });
    const created = await modeler.post('/api/comparisons', { name: 'Broken', holdoutId: id, mapping: sampleMapping });
    expect(created.status).toBe(400);
    expect(created.body).toMatchObject({
      error: { message: 'sheet "Holdout 2025", row 9, column "champion_points": "abc" is not a number', details: { row: 9, column: 'champion_points' } },
    });
  });

  it('refuses a sheet the workbook does not have, naming it and the sheets it has; nothing is stored', async () => {
    const before = await rowCounts(t.dataSource);
    const upload = await uploadSheet(await twoSheetWorkbook(), 'tallowmere-2025.xlsx', 'Holdout 2024');
    expect(upload.status).toBe(400);
    expect((upload.body as { error: { message: string } }).error.message).toBe('the workbook has no sheet named "Holdout 2024"; its sheets are "Read me", "Holdout 2025"');
    expect(await rowCounts(t.dataSource)).toEqual(before);
  });

  it('refuses a sheet for a CSV file', async () => {
    const upload = await uploadSheet(sampleCsv(), 'tallowmere-2025.csv', HOLDOUT_SHEET);
    expect(upload.status).toBe(400);
    expect((upload.body as { error: { message: string } }).error.message).toContain('not an .xlsx workbook, so it has no sheet "Holdout 2025"');
  });
});
