import { governanceSchema } from '@shared/governance';
import { mixedStrategyResultSchema } from '@shared/mixed-strategy';
import { type ColumnMapping, type Report, reportSchema } from '@shared/report';
import { comparisonListSchema } from '@shared/comparisons';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rawQuery } from '@server/db/driver';
import { Decision } from '@server/db/entities/index';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { lastOutboxId, waitForRuns } from './helpers/governance';
import { uploadFile } from './helpers/holdouts';
import { regionsHoldoutCsv } from './helpers/regions-holdout';
import { download, pdfPages, readWorkbook, sheetRows } from './helpers/pack';
import { segmentsTable } from '@shared/segments-words';

/**
 * A further challenger that is worse than the champion in one segment value: its segment rows,
 * harm flags and verdict are judged exactly as the primary's would be (the same rows as a
 * two-model comparison with it as the challenger), shown on every document, and a decision can
 * adopt it except in that value. The holdout is helpers/regions-holdout.ts's.
 */
const csv = regionsHoldoutCsv();
const base: Omit<ColumnMapping, 'challenger'> = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  higherIs: { champion: 'safer', challenger: 'safer' },
  id: 'id',
  segments: ['region'],
  weight: 'weight',
  championName: 'AS-19',
};
const mapping: ColumnMapping = { ...base, challenger: 'c1', challengerName: 'CF-3 bureau', moreChallengers: [{ column: 'c2', higherIs: 'safer', name: 'CF-4 open banking' }] };
const alone: ColumnMapping = { ...base, challenger: 'c2', challengerName: 'CF-4 open banking' };
const regionB = [{ column: 'region', value: 'B' }];
const rationale = 'CF-4 open banking is adopted outside region B, where it cannot rank and the champion stays; the bureau model costs more for less uplift elsewhere.';

let t: TestApp;
let modeler: TestClient;
let analyst: TestClient;
let policy: TestClient;
let committee: TestClient;
let committee2: TestClient;
let id: number;
let report: Report;
let single: Report;

beforeAll(async () => {
  t = await buildTestApp();
  [modeler, analyst, policy, committee] = await Promise.all((['modeler', 'analyst', 'policy', 'committee'] as const).map((role) => signedInAs(t.app, role)));
  committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  const upload = await uploadFile(modeler, csv, 'regions.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  const holdoutId = (upload.body as { id: number }).id;
  const both = await modeler.post('/api/comparisons', { name: 'Two candidates by region', holdoutId, mapping, settings: { bootstrap: 20 } });
  expect(both.status, JSON.stringify(both.body)).toBe(201);
  id = (both.body as { id: number }).id;
  const one = await modeler.post('/api/comparisons', { name: 'Open banking alone', holdoutId, mapping: alone, settings: { bootstrap: 20 } });
  expect(one.status, JSON.stringify(one.body)).toBe(201);
  await waitForRuns(t);
  report = reportSchema.parse((await modeler.get(`/api/comparisons/${id}/report`)).body);
  single = reportSchema.parse((await modeler.get(`/api/comparisons/${(one.body as { id: number }).id}/report`)).body);
});
afterAll(async () => {
  await t.close();
});

const message = (response: { body: unknown }) => (response.body as { error: { message: string } }).error.message;

describe('a further challenger worse in one segment value', () => {
  it('has the segment rows, flags and band table it would have as the only challenger', () => {
    const further = report.challengers![1];
    // Same rows as the two-model comparison with CF-4 as the challenger: ΔGini, two-sided p,
    // interval, Holm across its own rows, flags, and the applicants of each value (weights).
    expect(further.segments).toEqual(single.segments);
    expect(further.bands).toEqual(single.bands.challenger);
    // Better than the champion overall: the headline alone would hide the harm in region B.
    expect(further.difference.gini).toBeGreaterThan(0);
    const flagged = further.segments!.filter((row) => row.flags.length > 0);
    expect(flagged.map((row) => [row.column, row.value])).toEqual([['region', 'B']]);
    expect(flagged[0].flags).toContain('significantly-worse');
    expect(flagged[0].accounts).toBeGreaterThan(flagged[0].n); // weighted: every fifth row counts twice
    // The primary is not flagged anywhere.
    expect(report.segments.filter((row) => row.flags.length > 0)).toEqual([]);
  });

  it('fails its segment criterion as the primary would, and its verdict says where', () => {
    const verdict = report.challengers![1].verdict;
    const criterion = verdict.criteria.find((c) => c.id === 'segments')!;
    expect(criterion).toEqual(single.verdict.criteria.find((c) => c.id === 'segments'));
    expect(criterion.met).toBe(false);
    expect(criterion.detail).toMatch(/^significantly worse in region = B \(ΔGini −/);
    expect(verdict.outcome).not.toBe('supported');
    expect(verdict.summary).toContain('it is significantly worse in region = B');
    // The choice does not fall on it.
    expect(report.choice!.recommended).not.toBe(1);
  });

  it('gives each challenger its band table as CSV beside the champion’s (?challenger=k), also for a report from before', async () => {
    const response = await analyst.get(`/api/comparisons/${id}/export/bands.csv?challenger=1`);
    expect(response.status).toBe(200);
    expect(response.headers['content-disposition']).toContain('bands-challenger-1.csv');
    const lines = response.text.trim().split('\n');
    const challengerLines = lines.filter((line) => line.startsWith('challenger,'));
    expect(challengerLines).toHaveLength(report.challengers![1].bands!.rows.length);
    expect(challengerLines.map((line) => Number(line.split(',')[6]))).toEqual(report.challengers![1].bands!.rows.map((row) => row.bads));
    expect(lines.filter((line) => line.startsWith('champion,'))).toHaveLength(report.bands.champion.rows.length);
    const primary = await analyst.get(`/api/comparisons/${id}/export/bands.csv`);
    expect(primary.headers['content-disposition']).toMatch(/bands\.csv/);
    expect(primary.text.trim().split('\n').filter((line) => line.startsWith('challenger,')).map((line) => Number(line.split(',')[6]))).toEqual(report.bands.challenger.rows.map((row) => row.bads));
    expect(message(await analyst.get(`/api/comparisons/${id}/export/bands.csv?challenger=2`))).toBe('Challenger 2 does not exist: this comparison has 2 challengers (0 to 1).');
    expect((await analyst.get(`/api/comparisons/${id}/export/bands.csv?challenger=x`)).status).toBe(400);
    // A report stored before band tables per challenger: the table is computed from the run, the same.
    const [run] = await rawQuery<{ id: number; report: string }>(t.dataSource, `SELECT "id", "report" FROM "analysis_runs" WHERE "comparisonId" = ? AND "status" = 'done'`, [id]);
    const stored = JSON.parse(run.report) as Report;
    delete stored.challengers![1].bands;
    await rawQuery(t.dataSource, `UPDATE "analysis_runs" SET "report" = ? WHERE "id" = ?`, [JSON.stringify(stored), run.id]);
    const again = await analyst.get(`/api/comparisons/${id}/export/bands.csv?challenger=1`);
    expect(again.text).toBe(response.text);
    await rawQuery(t.dataSource, `UPDATE "analysis_runs" SET "report" = ? WHERE "id" = ?`, [run.report, run.id]);
  });

  it('shows its flagged value in the PDF pack and the workbook', async () => {
    const pdf = await download(committee, `/api/comparisons/${id}/export/pack.pdf`);
    expect(pdf.status).toBe(200);
    const text = (await pdfPages(pdf.body)).join(' ').replace(/\s+/g, ' ');
    expect(text).toContain('Segments where a challenger is worse');
    expect(text).toMatch(/CF-4 open banking \(challenger ?2\) ?region = B ?Significantly worse/);
    // Its rows in full, after the flagged ones (the first challenger's are the Segments section).
    expect(text).toContain('Segments: CF-4 open banking against the champion');
    expect(text).not.toContain('Segments: CF-3 bureau against the champion');
    const workbook = await readWorkbook((await download(committee, `/api/comparisons/${id}/export/workbook.xlsx`)).body);
    const rows = sheetRows(workbook.getWorksheet('Segments by challenger')!);
    const flag = rows.find((row) => row[0] === 'Challenger')!.indexOf('Flag');
    const flaggedRow = rows.find((row) => row[0] === 'CF-4 open banking' && row[2] === 'B')!;
    expect(String(flaggedRow[flag])).toMatch(/^Significantly worse/);
    expect(rows.filter((row) => row[0] === 'CF-3 bureau' && /worse/.test(String(row[flag])))).toEqual([]);
    const bands = sheetRows(workbook.getWorksheet('Challenger 2 bands')!);
    expect(bands.some((row) => row[0] === 1 && row[5] === report.challengers![1].bands!.rows[0].bads)).toBe(true);
  });

  it('gives the first challenger’s segments every column a further challenger’s have, in every document', async () => {
    // The words (pack PDF, printable report, CLI): one table for every challenger.
    const first = segmentsTable(report, 0)!;
    const further = segmentsTable(report, 1)!;
    expect(first.head.filter((column) => !further.head.includes(column))).toEqual([]);
    expect(further.head.filter((column) => !first.head.includes(column))).toEqual([]);
    for (const column of ['95% interval', 'p, two-sided', 'Holm p', 'Flag or note']) expect(first.head).toContain(column);
    // The first challenger's rows carry their interval and two-sided p, not dashes.
    expect(first.rows.every((row) => row[6] !== '—' && row[7] !== '—')).toBe(true);
    // The PDF pack: the first challenger's Segments section prints the same heading row.
    const pdf = await download(committee, `/api/comparisons/${id}/export/pack.pdf`);
    const text = (await pdfPages(pdf.body)).join(' ').replace(/\s+/g, ' ');
    expect(text).toContain(first.note!.replace(/\s+/g, ' ').slice(0, 60));
    // The workbook: the Segments sheet (first challenger) has every column of the sheet for every challenger.
    const workbook = await readWorkbook((await download(committee, `/api/comparisons/${id}/export/workbook.xlsx`)).body);
    const headerOf = (name: string, first: string) => sheetRows(workbook.getWorksheet(name)!).find((row) => row[0] === first)!.map(String);
    const primarySheet = headerOf('Segments', 'Segment column');
    const everySheet = headerOf('Segments by challenger', 'Challenger').slice(1);
    expect(everySheet.filter((column) => !primarySheet.includes(column))).toEqual([]);
    expect(primarySheet).toEqual(expect.arrayContaining(['ΔGini interval, low', 'ΔGini interval, high', 'p, two-sided', 'Holm p', 'Flag']));
  });

  it('previews keeping the champion in region B for the further challenger (its own cut-off and pure adoption)', async () => {
    const response = await policy.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: regionB, challenger: 1 });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const preview = mixedStrategyResultSchema.parse(response.body);
    expect(preview).toMatchObject({ challenger: 1, challengerName: 'CF-4 open banking' });
    // Pure adoption of CF-4 is its swap sets against the champion at the run's approval rate.
    const swap = report.challengers![1].swap;
    expect(preview.approvalRate).toBe(report.settings.approvalRate);
    expect(preview.cutoffs).toEqual({ champion: swap.champion.cutoff, challenger: swap.challenger.cutoff });
    expect(preview.pure.swapIn.count).toBe(swap.swapIn.accounts ?? swap.swapIn.count);
    expect(preview.pure.swapOut.count).toBe(swap.swapOut.accounts ?? swap.swapOut.count);
    const primary = mixedStrategyResultSchema.parse((await policy.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: regionB })).body);
    expect(primary).toMatchObject({ challenger: 0, challengerName: 'CF-3 bureau' });
    expect(primary.cutoffs.challenger).toBe(report.challengers![0].swap.challenger.cutoff);
    expect(message(await policy.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: regionB, challenger: 2 }))).toBe('Challenger 2 does not exist: this comparison has 2 challengers (0 to 1).');
  });

  it('adopts the further challenger except in region B: stored, audited and told by e-mail as for the primary', async () => {
    expect((await modeler.post(`/api/comparisons/${id}/submit`, { message: '' })).status).toBe(200);
    expect((await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Open banking fails in region B.' })).status).toBe(200);
    expect((await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', challenger: 1, comment: 'Except region B.' })).status).toBe(200);
    expect((await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', challenger: 1, comment: '' })).status).toBe(200);
    // Exceptions computed for another challenger than the one adopted: refused, nothing stored.
    const mismatch = await committee.post(`/api/comparisons/${id}/decision`, {
      outcome: 'adopt',
      challenger: 1,
      rationale,
      acknowledgeAgainstRecord: true,
      strategy: { keepChampion: regionB, challenger: 0 },
    });
    expect(mismatch.status).toBe(400);
    expect(message(mismatch)).toBe('The exceptions by segment were computed for challenger 0 but the decision adopts challenger 1; compute them for the challenger adopted.');
    expect(await t.dataSource.getRepository(Decision).count()).toBe(0);
    // Its verdict does not support it (the segment rule): against the record, acknowledged.
    const unacknowledged = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', challenger: 1, rationale, strategy: { keepChampion: regionB } });
    expect(unacknowledged.status).toBe(409);
    expect(message(unacknowledged)).toContain('does not support CF-4 open banking');

    const before = await lastOutboxId(t);
    const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', challenger: 1, rationale, acknowledgeAgainstRecord: true, strategy: { keepChampion: regionB } });
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    const g = governanceSchema.parse(decided.body);
    const preview = mixedStrategyResultSchema.parse((await policy.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: regionB, challenger: 1 })).body);
    expect(g.decision!.strategy).toEqual(preview);
    expect(g.decision!.chosen).toEqual({ model: 'challenger', challenger: 1, column: 'c2', name: 'CF-4 open banking' });
    const stored = await t.dataSource.getRepository(Decision).findOneByOrFail({ comparisonId: id });
    expect(stored.strategy).toEqual(preview);

    const audit = (await analyst.get(`/api/comparisons/${id}/audit`)).body as { events: { action: string; details: Record<string, unknown> }[] };
    expect(audit.events.find((event) => event.action === 'comparison.decided')!.details).toMatchObject({
      keepChampion: regionB,
      strategyChallenger: 1,
      strategyChallengerName: 'CF-4 open banking',
    });
    const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: before });
    expect(mail.receivedText).toContain('adopt the challenger “CF-4 open banking”, except in region = B, where the champion is kept.');
    expect(mail.receivedText).toContain('The challenger “CF-4 open banking” (challenger 2) decides every account except those in region = B');
  });

  it('names the recommended model of the current verdict record and the adopted one in the list', async () => {
    const list = comparisonListSchema.parse((await analyst.get('/api/comparisons?q=Two%20candidates')).body);
    const [item] = list.items;
    expect(item.verdict!.recommended).toBe(report.choice!.recommended);
    expect(item.decided).toEqual({ outcome: 'adopt', chosen: { model: 'challenger', challenger: 1, column: 'c2', name: 'CF-4 open banking' } });
    const detail = (await analyst.get(`/api/comparisons/${id}`)).body as { decided: unknown };
    expect(detail.decided).toEqual(item.decided);
    // Not decided: null.
    const other = comparisonListSchema.parse((await analyst.get('/api/comparisons?q=alone')).body).items[0];
    expect(other.decided).toBeNull();
  });
});
