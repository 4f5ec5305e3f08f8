import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { reportSchema, type ColumnMapping } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AnalysisRun } from '@server/db/entities/index';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { rowCounts, sampleDir, uploadFile } from './helpers/holdouts';
import { queueWaitMs } from './helpers/governance';

/**
 * Calibration and stability through the API: the mapping's PD confirmation and period column, a
 * development sample uploaded as a second file and chosen in the set-up, the report's sections,
 * and bad input (a reference without the score columns, a PD outside 0–1) refused naming the row
 * and column with nothing stored.
 */

let t: TestApp;
let modeler: TestClient;
let holdoutId: number;
let referenceId: number;
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
  modeler = await signedInAs(t.app, 'modeler');
  holdoutId = (await uploadFile(modeler, head('tallowmere-holdout-2025-pd.csv', 4000), 'pd-4k.csv')).body.id as number;
  referenceId = (await uploadFile(modeler, head('tallowmere-development-2023.csv', 3000), 'development-3k.csv')).body.id as number;
});
afterAll(async () => {
  await t.close();
});

describe('calibration and stability in the report', () => {
  it('computes calibration for the PD challenger, stability by month and the PSI against the uploaded development sample', async () => {
    const created = await modeler.post('/api/comparisons', { name: 'PD challenger', holdoutId, mapping, settings: { bootstrap: 0 }, referenceHoldoutId: referenceId });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    await t.jobs.whenIdle(queueWaitMs);
    const response = await modeler.get(`/api/comparisons/${created.body.id}/report`);
    expect(response.status).toBe(200);
    const report = reportSchema.parse(response.body);
    expect(report.calibration!.champion).toBeNull();
    const challenger = report.calibration!.challenger!;
    expect(challenger.groupedBy).toEqual({ kind: 'bands' });
    expect(challenger.rows.map((row) => row.band)).toEqual(report.bands.challenger.rows.map((row) => row.band));
    expect(challenger.rows.reduce((sum, row) => sum + row.accounts, 0)).toBe(4000);
    expect(challenger.portfolio.observedBads).toBe(report.bads);
    expect(report.stability!.periodColumn).toBe('application_month');
    expect(report.stability!.periods.map((row) => row.period)).toEqual([...report.stability!.periods.map((row) => row.period)].sort());
    expect(report.stability!.periods.reduce((sum, row) => sum + row.accounts, 0)).toBe(4000);
    const psi = report.stability!.psi!;
    expect(psi.reference).toMatchObject({ kind: 'file', fileName: 'development-3k.csv', rows: 3000 });
    expect(psi.challenger.referenceSize).toBe(3000);
    expect(psi.challenger.actualSize).toBe(4000);
    const run = await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ comparisonId: created.body.id as number });
    expect(run.referenceHoldoutId).toBe(referenceId);
  });

  it('refuses a reference sample without the score columns, naming the column, and stores nothing', async () => {
    const badReference = (await uploadFile(modeler, 'account_id,champion_points\nA,600\nB,610\n', 'no-challenger.csv')).body.id as number;
    const before = await rowCounts(t.dataSource);
    const response = await modeler.post('/api/comparisons', { name: 'Bad reference', holdoutId, mapping, referenceHoldoutId: badReference });
    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/challenger_pd/);
    expect(await rowCounts(t.dataSource)).toEqual(before);
  });

  it('refuses a score marked as a PD that is not between 0 and 1, naming the row and column', async () => {
    const text = head('tallowmere-holdout-2025-pd.csv', 50).replace(/,0\.0(\d{5})\n/, ',1.5$1\n');
    const id = (await uploadFile(modeler, text, 'bad-pd.csv')).body.id as number;
    const response = await modeler.post('/api/comparisons', { name: 'Bad PD', holdoutId: id, mapping });
    expect(response.status).toBe(400);
    expect(response.body.error.message).toMatch(/row \d+.*challenger_pd|challenger_pd.*row \d+/i);
    expect(response.body.error.message).toMatch(/not a probability of default/);
  });
});
