import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { formatCount, formatGini, formatGiniDelta, formatInterval, formatNumber, formatPercent, formatPValue } from '@shared/format';
import { type ColumnMapping, type Report, reportSchema } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { sampleDir, uploadFile } from './helpers/holdouts';
import { getDocument, OPS } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { inkColors } from '@shared/pack/charts';
import { download, pdfPages, rawSheetXml, readWorkbook, sheetRows } from './helpers/pack';
import { queueWaitMs } from './helpers/governance';

/**
 * Calibration and stability in the committee pack: a comparison whose challenger is a PD (the
 * demo's PD holdout, first 4,000 rows), with the application month as its period and the
 * development sample (first 3,000 rows) as the PSI's reference. The server's PDF, read back with
 * pdf.js, holds the calibration table by band (Jeffreys p), the Brier score, the portfolio row,
 * stability by period and the PSI with its critical value, as the pages format them, and the two
 * charts' captions; the workbook, read back with exceljs, holds the same numbers as numbers.
 */

let t: TestApp;
let analyst: TestClient;
let report: Report;
let pdf: Buffer;
let id: number;
const head = (file: string, rows: number) => readFileSync(join(sampleDir, file), 'utf8').split('\n').slice(0, rows + 1).join('\n') + '\n';

const mapping: ColumnMapping = {
  outcome: 'bad_12m',
  badValue: '1',
  champion: 'champion_points',
  challenger: 'challenger_pd',
  higherIs: { champion: 'safer', challenger: 'riskier' },
  probabilityOfDefault: { champion: false, challenger: true },
  period: 'application_month',
};

beforeAll(async () => {
  t = await buildTestApp();
  const modeler = await signedInAs(t.app, 'modeler');
  analyst = await signedInAs(t.app, 'analyst');
  const holdoutId = (await uploadFile(modeler, head('tallowmere-holdout-2025-pd.csv', 4000), 'pd-4k.csv')).body.id as number;
  const referenceId = (await uploadFile(modeler, head('tallowmere-development-2023.csv', 3000), 'development-3k.csv')).body.id as number;
  const created = await modeler.post('/api/comparisons', { name: 'PD pack', holdoutId, mapping, settings: { bootstrap: 0 }, referenceHoldoutId: referenceId });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  id = created.body.id as number;
  await t.jobs.whenIdle(queueWaitMs);
  report = reportSchema.parse((await analyst.get(`/api/comparisons/${id}/report`)).body);
  expect(report.calibration?.challenger).toBeTruthy();
  expect(report.stability?.periods.length).toBeGreaterThan(1);
  expect(report.stability?.psi).toBeTruthy();
});
afterAll(async () => {
  await t.close();
});

describe('calibration and stability in the committee pack', () => {
  it('the PDF holds the calibration by band, Brier, the portfolio, stability by period and the PSI, with their charts', async () => {
    const response = await download(analyst, `/api/comparisons/${id}/export/pack.pdf`);
    expect(response.status).toBe(200);
    pdf = response.body;
    const text = (await pdfPages(response.body)).join(' ');
    const calibration = report.calibration!.challenger!;
    expect(text).toContain('Calibration and stability');
    expect(text).toContain('Challenger: calibration by quantile band');
    expect(text).not.toContain('Champion: calibration by');
    const pct2 = (value: number) => formatPercent(value, 2);
    for (const row of [...calibration.rows, calibration.portfolio]) {
      // Group, accounts, mean PD, bad rate, Wilson interval, expected and observed bads, in one row.
      expect(text).toContain(
        `${row.label} ${formatCount(row.accounts)} ${pct2(row.meanPd)} ${pct2(row.observedBadRate)} ${formatInterval(row.observedBadRateCi, pct2)} ${formatNumber(row.expectedBads, 1)} ${formatNumber(row.observedBads, 0)}`,
      );
      // The PD column's words may wrap within the cell; pdf.js then joins its lines without a space.
      expect(text).toMatch(new RegExp(`${formatPValue(row.jeffreysP)} ${formatPValue(row.binomialP)} ${row.fails ? 'too ?low' : 'not ?rejected'}`.replace(/\./g, '\\.')));
    }
    expect(text).toContain(`Brier score ${formatNumber(calibration.brier.brier, 5)}`);
    expect(text).toContain(`Reliability (Murphy 1973) ${formatNumber(calibration.brier.reliability, 5)}`);
    const stability = report.stability!;
    expect(text).toContain(`Stability by ${stability.periodColumn}`);
    for (const row of stability.periods) {
      expect(text).toContain(`${row.period} ${formatCount(row.accounts)} ${formatCount(row.bads)} ${formatGini(row.championGini)} ${formatGini(row.challengerGini)} ${formatGiniDelta(row.deltaGini)}`);
    }
    const psi = stability.psi!;
    for (const [name, model] of [['Champion', psi.champion], ['Challenger', psi.challenger]] as const) {
      expect(text).toContain(`${name} ${formatNumber(model.psi, 4)} ${formatNumber(model.criticalValue, 4)} ${formatNumber(model.criticalAlpha, 2)}`);
    }
    expect(text).toContain('Against the development sample development-3k.csv (3,000 accounts)');
    // The charts: their titles and captions (the captions carry the portfolio's numbers).
    expect(text).toContain('Challenger calibration');
    expect(text).toContain(`Mean PD ${pct2(calibration.portfolio.meanPd)} against an observed bad rate of ${pct2(calibration.portfolio.observedBadRate)}`);
    expect(text).toContain('Uplift by period');
  }, 300_000);

  it('the workbook has Calibration and Stability sheets with the report’s numbers as numbers', async () => {
    const response = await download(analyst, `/api/comparisons/${id}/export/workbook.xlsx`);
    expect(response.status).toBe(200);
    const workbook = await readWorkbook(response.body);
    expect(workbook.worksheets.map((sheet) => sheet.name).slice(-2)).toEqual(['Calibration', 'Stability']);
    const calibration = report.calibration!.challenger!;
    const rows = sheetRows(workbook.getWorksheet('Calibration')!);
    const table = rows.filter((row) => typeof row[2] === 'number' && typeof row[0] === 'string');
    // An empty cell (no weights: weight null; band null on the portfolio row) reads back as undefined.
    const blank = (values: unknown[]) => values.map((value) => value ?? undefined);
    expect(table.map(blank)).toEqual(
      [...calibration.rows, calibration.portfolio].map((row) => blank([
        row.label,
        row.band,
        row.accounts,
        row.bads,
        row.weight,
        row.effectiveAccounts,
        row.meanPd,
        row.pdMin,
        row.pdMax,
        row.observedBadRate,
        row.observedBadRateCi?.[0] ?? null,
        row.observedBadRateCi?.[1] ?? null,
        row.expectedBads,
        row.observedBads,
        row.jeffreysP,
        row.binomialP,
        row.fails ? 'too low' : 'not rejected',
      ])),
    );
    expect(rows.find((row) => row[0] === 'Brier score')![1]).toBe(calibration.brier.brier);
    expect(rows.find((row) => row[0] === 'Resolution')![1]).toBe(calibration.brier.resolution);
    const jeffreys = workbook.getWorksheet('Calibration')!.getRow(3).getCell(15);
    expect(typeof jeffreys.value).toBe('number');
    expect(jeffreys.numFmt).toBe('0.0000E+00');

    const stability = report.stability!;
    const stabilityRows = sheetRows(workbook.getWorksheet('Stability')!);
    const periods = stabilityRows.filter((row) => stability.periods.some((period) => period.period === row[0]));
    expect(periods.map((row) => row.slice(0, 4))).toEqual(stability.periods.map((row) => [row.period, row.accounts, row.bads, row.championGini]));
    expect(periods.map((row) => row[9])).toEqual(stability.periods.map((row) => row.deltaGini));
    expect(periods.map((row) => row[15] ?? null)).toEqual(stability.periods.map((row) => row.challengerPsiFromPrevious));
    const psi = stability.psi!;
    expect(stabilityRows.find((row) => row[0] === 'Champion')!.slice(1, 4)).toEqual([psi.champion.psi, psi.champion.criticalValue, psi.champion.criticalAlpha]);
    expect(stabilityRows.find((row) => row[0] === 'Challenger')!.slice(1, 4)).toEqual([psi.challenger.psi, psi.challenger.criticalValue, psi.challenger.criticalAlpha]);
    // Period labels such as "2025-05" are text cells, never dates or formulas.
    for (const xml of rawSheetXml(response.body)) expect(xml).not.toMatch(/<f[ >]/);
    expect(typeof periods[0][0]).toBe('string');
  });

  it('draws every word of the PDF in a colour with at least 4.5:1 on the page and on the table heads’ tint (WCAG 2.1 AA)', async () => {
    // The fill colour in force at each text-showing operator, from pdf.js's operator lists.
    const shows = new Set<number>([OPS.showText, OPS.showSpacedText, OPS.nextLineShowText, OPS.nextLineSetSpacingShowText]);
    const document = await getDocument({ data: new Uint8Array(pdf), isEvalSupported: false }).promise;
    const used = new Set<string>();
    for (let number = 1; number <= document.numPages; number++) {
      const list = await (await document.getPage(number)).getOperatorList();
      let fill = '#000000';
      list.fnArray.forEach((fn, index) => {
        const args = list.argsArray[index] as unknown[];
        if (fn === OPS.setFillRGBColor) {
          fill = typeof args[0] === 'string' ? args[0] : `#${(args as number[]).map((c) => Math.round(c).toString(16).padStart(2, '0')).join('')}`;
        } else if (shows.has(fn)) used.add(fill.toLowerCase());
      });
    }
    await document.destroy();
    expect(used.size).toBeGreaterThan(1);
    const luminance = (hex: string) =>
      [1, 3, 5]
        .map((at) => parseInt(hex.slice(at, at + 2), 16) / 255)
        .map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4))
        .reduce((sum, c, i) => sum + c * [0.2126, 0.7152, 0.0722][i], 0);
    const ratio = (a: string, b: string) => (Math.max(luminance(a), luminance(b)) + 0.05) / (Math.min(luminance(a), luminance(b)) + 0.05);
    for (const colour of used) {
      for (const background of [inkColors.paper, inkColors.sunk]) expect(ratio(colour, background), `${colour} on ${background}`).toBeGreaterThanOrEqual(4.5);
    }
  });
});
