import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import type { Report } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { waitForRuns } from './helpers/governance';
import { sampleHead, sampleMapping, uploadFile } from './helpers/holdouts';

/**
 * Uploading a holdout as an .xlsx workbook: the upload is scanned like a CSV file, a comparison on
 * it gives the report its CSV gives (the same accounts, so the same numbers; only the file's name,
 * size and hash differ), and a mistake in a cell is a 400 naming the row and column.
 */

let t: TestApp;
let modeler: TestClient;
// The first 500 accounts of the demo sample: the same columns and both outcomes; the workbook's
// report equals the CSV's whatever the size, at a quarter of the work of the whole sample.
const sampleCsv = () => sampleHead(500);

async function asWorkbook(csv: string, change?: (sheet: ExcelJS.Worksheet) => void): Promise<Buffer> {
  const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
  const workbook = new ExcelJS.Workbook();
  const sheet = workbook.addWorksheet('Holdout 2025');
  rows.forEach((row, index) => sheet.addRow(row.map((cell) => (index > 0 && /^-?\d+(\.\d+)?$/.test(cell) ? Number(cell) : cell))));
  change?.(sheet);
  return Buffer.from(await workbook.xlsx.writeBuffer());
}

async function comparisonOn(holdoutId: number, name: string): Promise<Report> {
  const created = await modeler.post('/api/comparisons', { name, holdoutId, mapping: sampleMapping, settings: { bootstrap: 0 } });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  await waitForRuns(t);
  return (await modeler.get(`/api/comparisons/${(created.body as { id: number }).id}/report`)).body as Report;
}

beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
});
afterAll(async () => {
  await t.close();
});

describe('an .xlsx holdout through the API', () => {
  it('is scanned like CSV and gives the CSV’s report', async () => {
    const text = sampleCsv();
    const xlsx = await uploadFile(modeler, await asWorkbook(text), 'holdout-2025.xlsx');
    expect(xlsx.status, JSON.stringify(xlsx.body)).toBe(201);
    const holdout = xlsx.body as { id: number; rowCount: number; columns: { name: string }[]; fileName: string };
    expect(holdout.rowCount).toBe(500);
    expect(holdout.fileName).toBe('holdout-2025.xlsx');
    expect(holdout.columns.map((column) => column.name)).toEqual(text.split('\n')[0].trim().split(','));
    const fromCsv = await uploadFile(modeler, text, 'holdout-2025.csv');
    const [a, b] = [await comparisonOn(holdout.id, 'From the workbook'), await comparisonOn((fromCsv.body as { id: number }).id, 'From the CSV')];
    expect(a.rows).toBe(b.rows);
    expect(a.champion).toEqual(b.champion);
    expect(a.difference).toEqual(b.difference);
    expect(a.swap).toEqual(b.swap);
    expect(a.segments).toEqual(b.segments);
    expect(a.input.sha256).not.toBe(b.input.sha256);
  });

  it('refuses a mapping over a cell that is not a number, naming its row and column (400)', async () => {
    const bytes = await asWorkbook(sampleCsv(), (sheet) => {
      sheet.getRow(7).getCell(8).value = 'abc';
    });
    const upload = await uploadFile(modeler, bytes, 'broken.xlsx');
    expect(upload.status).toBe(201);
    const created = await modeler.post('/api/comparisons', { name: 'Broken', holdoutId: (upload.body as { id: number }).id, mapping: sampleMapping });
    expect(created.status).toBe(400);
    expect((created.body as { error: { message: string } }).error.message).toContain('row 7, column "champion_points": "abc" is not a number');
  });
});
