import { readFileSync } from 'node:fs';
import { chosenModelWords, jointTestSentence, modelsSummaryTable, pairwiseTable, swapSideBySideTable } from '@shared/challengers-words';
import { formatGini, formatGiniDelta } from '@shared/format';
import { type ColumnMapping, type Report, reportSchema } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildWorkbook } from '@server/pack/workbook';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { lastOutboxId, waitForRuns } from './helpers/governance';
import { uploadFile } from './helpers/holdouts';
import { download, pdfPages, readWorkbook, sheetRows } from './helpers/pack';

/**
 * The committee pack (PDF and workbook) and the e-mails of a comparison with three challengers,
 * through the API: the section for several challengers holds every model's figures as the pages
 * write them, the joint and pairwise tests, each verdict, the side-by-side swap sets, the approval
 * patterns and the model the committee chose; the workbook holds the same numbers as numbers. The
 * holdout is tests/reference/challengers/points-ties-3.csv (3,000 accounts, points).
 */
const csv = readFileSync(new URL('../reference/challengers/points-ties-3.csv', import.meta.url));
const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'c1',
  higherIs: { champion: 'safer', challenger: 'safer' },
  championName: 'CF-2 scorecard',
  challengerName: 'CF-3 bureau',
  moreChallengers: [
    { column: 'c2', higherIs: 'safer', name: 'CF-4 open banking' },
    { column: 'c3', higherIs: 'safer', name: 'Refit 2025' },
  ],
};
const rationale = 'CF-4 open banking carries the uplift after Holm; its swap-in is less risky than the swap-out at the 70% approval rate.';

let t: TestApp;
let modeler: TestClient;
let analyst: TestClient;
let committee: TestClient;
let committee2: TestClient;
let id: number;
let report: Report & { challengers: NonNullable<Report['challengers']> };

beforeAll(async () => {
  t = await buildTestApp();
  [modeler, analyst, committee] = await Promise.all((['modeler', 'analyst', 'committee'] as const).map((role) => signedInAs(t.app, role)));
  committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  const upload = await uploadFile(modeler, csv, 'points-ties-3.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  const before = await lastOutboxId(t);
  const created = await modeler.post('/api/comparisons', { name: 'Three candidates', holdoutId: (upload.body as { id: number }).id, mapping, settings: { bootstrap: 50 } });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  id = (created.body as { id: number }).id;
  await waitForRuns(t);
  report = reportSchema.parse((await modeler.get(`/api/comparisons/${id}/report`)).body) as typeof report;
  expect(report.challengers).toHaveLength(3);
  // The analysis-done e-mail names the recommended challenger and each verdict.
  const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: before });
  expect(mail.receivedText).toContain(report.choice!.summary);
  for (const [index, challenger] of report.challengers.entries()) {
    expect(mail.receivedText).toContain(`  ${challenger.name}: ${challenger.verdict.outcome === 'supported' ? 'challenger supported' : 'not proven'}${index === report.choice!.recommended ? ' (recommended)' : ''}`);
  }
  expect(mail.receivedText).toContain('rests with the institution’s policy and its committee');
  // Through the workflow to a decision for the recommended challenger.
  expect((await modeler.post(`/api/comparisons/${id}/submit`, {})).status).toBe(200);
  expect((await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Checked the three candidates.' })).status).toBe(200);
  for (const member of [committee, committee2]) expect((await member.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', challenger: 1, comment: '' })).status).toBe(200);
  const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', challenger: 1, rationale });
  expect(decided.status, JSON.stringify(decided.body)).toBe(200);
}, 300_000);

afterAll(async () => {
  await t.close();
});

describe('the committee pack with three challengers', () => {
  let text: string;

  it('the PDF has the section for several challengers, with the figures as the pages write them', async () => {
    const response = await download(committee, `/api/comparisons/${id}/export/pack.pdf`);
    expect(response.status).toBe(200);
    text = (await pdfPages(response.body)).join(' ');
    // pdf.js joins a wrapped cell's lines without a space: the words are compared without spaces.
    const flat = text.replace(/\s+/g, '');
    const has = (words: string) => expect(flat, words).toContain(words.replace(/\s+/g, ''));
    expect(text).toContain('One champion, 3 challengers');
    has(report.choice!.summary);
    // Every model: each challenger's row of the summary (name, role, Gini, AUC, KS, ΔGini, interval, Holm p, verdict).
    const summary = modelsSummaryTable(report, report.settings.confidence);
    for (const row of summary.rows.slice(1)) has(row.slice(2, 9).join(' '));
    expect(summary.rows[2]![1]).toBe('Challenger 2 (recommended)');
    has(jointTestSentence(report));
    expect(text).toContain(`χ² = ${report.joint!.chi2.toFixed(2)}`);
    for (const row of pairwiseTable(report).rows) has(row.join(' '));
    // Pairs: the ΔGini of each pair is the difference of the two Ginis (the engine's, checked here on the report).
    for (const pair of report.pairwise!) expect(formatGiniDelta(pair.deltaGini)).toBe(formatGiniDelta(report.challengers[pair.b]!.metrics.gini - report.challengers[pair.a]!.metrics.gini));
    const side = swapSideBySideTable(report.challengers);
    for (const row of side.rows) has(row.join(' '));
    has('Who each model approves');
    has(`Model chosen ${chosenModelWords({ model: 'challenger', challenger: 1, name: 'CF-4 open banking' })}`);
    has('Decision: Adopt the challenger — CF-4 open banking (challenger 2)');
    has('Henrik Aalto Adopt the challenger: CF-4 open banking');
    has('Grace Okafor Adopt the challenger: CF-4 open banking');
  }, 400_000);

  it('the workbook has the challengers and approval-pattern sheets, numbers as numbers', async () => {
    const response = await download(committee, `/api/comparisons/${id}/export/workbook.xlsx`);
    expect(response.status).toBe(200);
    const workbook = await readWorkbook(response.body);
    const rows = sheetRows(workbook.getWorksheet('Challengers')!);
    const modelRow = (name: string) => rows.find((row) => row[0] === name)!;
    expect(modelRow('CF-2 scorecard').slice(1, 7)).toEqual(['champion', 'champion', 'safer', report.champion.auc, report.champion.gini, report.champion.ks]);
    for (const [index, challenger] of report.challengers.entries()) {
      const row = modelRow(challenger.name);
      expect(row.slice(4, 8)).toEqual([challenger.metrics.auc, challenger.metrics.gini, challenger.metrics.ks, challenger.difference.gini]);
      expect(row[14]).toBe(challenger.pOneSidedHolm);
      expect(row[17]).toBe(index === report.choice!.recommended ? 'yes' : 'no');
    }
    expect(rows.find((row) => row[0] === 'Joint test χ² (DeLong, DeLong & Clarke-Pearson 1988)')![1]).toBe(report.joint!.chi2);
    const pairRows = rows.filter((row) => row[0] === 'CF-3 bureau' && row[1] === 'CF-4 open banking');
    expect(pairRows).toHaveLength(1);
    expect(pairRows[0]![2]).toBe(report.pairwise![0]!.deltaGini);
    const patterns = sheetRows(workbook.getWorksheet('Approval patterns')!);
    const combinations = patterns.filter((row) => row[0] === 'approves' || row[0] === 'declines');
    expect(combinations).toHaveLength(16);
    expect(combinations.reduce((sum, row) => sum + (row[4] as number), 0)).toBe(3000);
    expect(formatGini(report.challengers[1]!.metrics.gini)).toBe(modelsSummaryTable(report, 0.95).rows[2]![2]);
  });

  it('a two-model workbook has neither sheet', async () => {
    const single = await readWorkbook(await buildWorkbook({ ...report, challengers: report.challengers.slice(0, 1), pairwise: [] }, { id, name: 'One' }));
    expect(single.getWorksheet('Challengers')).toBeUndefined();
    expect(single.getWorksheet('Approval patterns')).toBeUndefined();
  });
});
