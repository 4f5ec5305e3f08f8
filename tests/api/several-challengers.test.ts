import { readFileSync } from 'node:fs';
import { challengersSwapResultSchema, swapResultSchema } from '@shared/comparisons';
import { type Governance, governanceSchema } from '@shared/governance';
import { type ColumnMapping, type Report, reportSchema } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { lastOutboxId, waitForRuns } from './helpers/governance';
import { rowCounts, uploadFile } from './helpers/holdouts';

/**
 * One champion and three challengers through the API on a real database and worker threads:
 * mapping checks, the analysis with every challenger, the verdict record of each and the
 * recommended one, the side-by-side swap sets, votes and a decision that name the challenger,
 * and the acknowledgement a decision against the verdict or the votes needs.
 * The holdout is tests/reference/challengers/points-ties-3.csv (3,000 accounts in points).
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
    { column: 'c3', higherIs: 'safer', name: 'CF-2 refit' },
  ],
};
const long = 'The committee weighed the bureau data cost against the uplift and chose on the evidence of the swap sets at 70%.';

let t: TestApp;
let modeler: TestClient;
let analyst: TestClient;
let committee: TestClient;
let committee2: TestClient;
let holdoutId: number;
let id: number;
let report: Report;

beforeAll(async () => {
  t = await buildTestApp();
  [modeler, analyst, committee] = await Promise.all((['modeler', 'analyst', 'committee'] as const).map((role) => signedInAs(t.app, role)));
  committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  const upload = await uploadFile(modeler, csv, 'points-ties-3.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  holdoutId = (upload.body as { id: number }).id;
});
afterAll(async () => {
  await t.close();
});

async function governance(): Promise<Governance> {
  const response = await modeler.get(`/api/comparisons/${id}/governance`);
  expect(response.status).toBe(200);
  return governanceSchema.parse(response.body);
}
const message = (response: { body: unknown }) => (response.body as { error: { message: string } }).error.message;

describe('a comparison with three challengers', () => {
  it('refuses a mapping naming a column twice or a name twice (400, nothing stored)', async () => {
    const before = await rowCounts(t.dataSource);
    const twice = await modeler.post('/api/comparisons', {
      name: 'Twice',
      holdoutId,
      mapping: { ...mapping, moreChallengers: [{ column: 'c1', higherIs: 'safer' }] },
    });
    expect(twice.status).toBe(400);
    expect(JSON.stringify(twice.body)).toContain('column \\"c1\\" is both the primary challenger and challenger 2');
    const named = await modeler.post('/api/comparisons', {
      name: 'Named twice',
      holdoutId,
      mapping: { ...mapping, moreChallengers: [{ column: 'c2', higherIs: 'safer', name: 'cf-3 bureau' }] },
    });
    expect(named.status).toBe(400);
    expect(JSON.stringify(named.body)).toContain('the name \\"cf-3 bureau\\" is given to both');
    const missing = await modeler.post('/api/holdouts/' + holdoutId + '/validate', { mapping: { ...mapping, moreChallengers: [{ column: 'c9', higherIs: 'safer' }] } });
    expect(missing.status).toBe(200);
    expect((missing.body as { ok: boolean; errors: { column: string | null }[] }).errors[0].column).toBe('c9');
    expect(await rowCounts(t.dataSource)).toEqual(before);
  });

  it('analyses every challenger; the verdict record keeps each one and the recommended one', async () => {
    const created = await modeler.post('/api/comparisons', { name: 'Three candidates', holdoutId, mapping, settings: { bootstrap: 50 } });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    id = (created.body as { id: number }).id;
    await waitForRuns(t);
    const response = await modeler.get(`/api/comparisons/${id}/report`);
    expect(response.status).toBe(200);
    report = reportSchema.parse(response.body);
    expect(report.challengers!.map((challenger) => [challenger.column, challenger.name])).toEqual([
      ['c1', 'CF-3 bureau'],
      ['c2', 'CF-4 open banking'],
      ['c3', 'CF-2 refit'],
    ]);
    expect(report.joint!.df).toBe(3);
    expect(report.pairwise).toHaveLength(3);
    const g = await governance();
    expect(g.verdicts).toHaveLength(1);
    const [record] = g.verdicts;
    expect(record.challengers.map((challenger) => challenger.outcome)).toEqual(report.challengers!.map((challenger) => challenger.verdict.outcome));
    expect(record.challengers[2].criteria).toEqual(report.challengers![2].verdict.criteria);
    expect(record.recommended).toBe(report.choice!.recommended);
    expect(record.choiceSummary).toBe(report.choice!.summary);
    expect(record.outcome).toBe(report.verdict.outcome);
    // CF-4 open banking is the one the R check finds significant after Holm (tests/reference/challengers/joint.json).
    expect(report.choice!.recommended).toBe(1);
    expect(report.choice!.summary).toMatch(/^CF-4 open banking is recommended/);
    expect(g.adoptVotesByChallenger).toEqual([0, 0, 0]);
    const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: 0 });
    expect(mail.subject).toBe('Analysis done: Three candidates');
    expect(mail.receivedText).toContain(report.choice!.summary);
  });

  it('shows every challenger\'s swap sets at one approval rate side by side, the primary\'s as the two-model route gives them', async () => {
    const response = await analyst.post(`/api/comparisons/${id}/challengers/swap`, { approvalRate: 0.6 });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const side = challengersSwapResultSchema.parse(response.body);
    expect(side.challengers.map((challenger) => challenger.name)).toEqual(['CF-3 bureau', 'CF-4 open banking', 'CF-2 refit']);
    const single = swapResultSchema.parse((await analyst.post(`/api/comparisons/${id}/swap`, { approvalRate: 0.6 })).body);
    expect(side.challengers[0].swap).toEqual(single.swap);
    expect(side.patterns.models.map((model) => model.name)).toEqual(['CF-2 scorecard', 'CF-3 bureau', 'CF-4 open banking', 'CF-2 refit']);
    expect(side.patterns.combinations.reduce((sum, cell) => sum + cell.count, 0)).toBe(3000);
    // At the report's rate the answer is the report's.
    const atReportRate = challengersSwapResultSchema.parse((await analyst.post(`/api/comparisons/${id}/challengers/swap`, { approvalRate: report.settings.approvalRate })).body);
    expect(atReportRate.challengers.map((challenger) => challenger.swap)).toEqual(report.challengers!.map((challenger) => challenger.swap));
    expect(atReportRate.patterns).toEqual(report.approvalPatterns);
    expect((await analyst.post(`/api/comparisons/${id}/challengers/swap`, { approvalRate: 1.5 })).status).toBe(400);
  });

  it('re-judges every challenger under the current policy', async () => {
    const response = await analyst.post(`/api/comparisons/${id}/verdicts`, {});
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const g = await governance();
    expect(g.verdicts).toHaveLength(2);
    expect(g.verdicts[0].challengers.map((challenger) => challenger.criteria)).toEqual(g.verdicts[1].challengers.map((challenger) => challenger.criteria));
    expect(g.verdicts[0].recommended).toBe(1);
    // The verdict every page shows (the comparison's current record) carries each challenger's verdict and the choice.
    const shown = (await modeler.get(`/api/comparisons/${id}`)).body as { verdict: { id: number; challengers: { name: string; outcome: string }[]; recommended: number | null; choiceSummary: string } };
    expect(shown.verdict.id).toBe(g.verdicts[0].id);
    expect(shown.verdict.challengers.map((challenger) => [challenger.name, challenger.outcome])).toEqual(g.verdicts[0].challengers.map((challenger) => [challenger.name, challenger.outcome]));
    expect(shown.verdict).toMatchObject({ recommended: 1, choiceSummary: g.verdicts[0].choiceSummary });
  });

  it('votes to adopt name their challenger: required with several, only with adopt, within range', async () => {
    const beforeSubmit = (await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: 0 })).id;
    expect((await modeler.post(`/api/comparisons/${id}/submit`, {})).status).toBe(200);
    // The analyst's and the committee's e-mails name the recommended challenger of the record shown.
    const recommended = (await governance()).verdicts[0].choiceSummary;
    expect(recommended).toContain('CF-4 open banking');
    expect((await t.deliveredMail({ to: 'analyst@tallowmere.test', afterId: beforeSubmit })).receivedText).toContain(recommended);
    const beforeReview = (await t.deliveredMail({ to: 'analyst@tallowmere.test', afterId: beforeSubmit })).id;
    expect((await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Checked the three candidates.' })).status).toBe(200);
    const toCommittee = (await t.deliveredMail({ to: 'committee@tallowmere.test', afterId: beforeReview })).receivedText;
    expect(toCommittee).toContain(recommended);
    expect(toCommittee).toContain('CF-2 refit: ');
    const unnamed = await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: '' });
    expect(unnamed.status).toBe(409);
    expect(message(unnamed)).toBe('This comparison has 3 challengers (0: CF-3 bureau, 1: CF-4 open banking, 2: CF-2 refit); name the one to adopt.');
    const beyond = await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', challenger: 3, comment: '' });
    expect(beyond.status).toBe(400);
    expect(message(beyond)).toBe('Challenger 3 does not exist: this comparison has 3 challengers (0 to 2).');
    const keepNamed = await committee.post(`/api/comparisons/${id}/votes`, { vote: 'keep', challenger: 1, comment: '' });
    expect(keepNamed.status).toBe(400);
    expect((await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', challenger: 1, comment: 'Open banking.' })).status).toBe(200);
    expect((await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', challenger: 1, comment: '' })).status).toBe(200);
    const g = await governance();
    expect(g.votes.map((vote) => vote.challenger)).toEqual([1, 1]);
    expect(g.adoptVotesByChallenger).toEqual([0, 2, 0]);
    const trail = (await committee.get(`/api/comparisons/${id}/audit`)).body as { events: { action: string; details: Record<string, unknown> }[] };
    expect(trail.events.filter((event) => event.action === 'vote.cast').map((event) => event.details.challengerName)).toEqual(['CF-4 open banking', 'CF-4 open banking']);
  });

  it('a decision for a challenger the verdict does not support, or the votes did not name, needs the acknowledgement', async () => {
    const unsupported = report.challengers!.findIndex((challenger) => challenger.verdict.outcome !== 'supported');
    expect(unsupported).toBe(0);
    const refused = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', challenger: 0, rationale: 'Bureau data.' });
    expect(refused.status).toBe(409);
    expect(message(refused)).toContain('the verdict (policy version 2) does not support CF-3 bureau');
    expect(message(refused)).toContain('the votes to adopt name CF-4 open banking most often (2 of 2)');
    const unnamed = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: long });
    expect(unnamed.status).toBe(409);
    const short = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', challenger: 0, rationale: 'Bureau data.', acknowledgeAgainstRecord: true });
    expect(short.status).toBe(409);
    expect(message(short)).toMatch(/needs a rationale of at least 80 characters/);
    expect(await governance()).toMatchObject({ state: 'validated', decision: null });
  });

  it('records the decision naming the chosen challenger, in the record, the audit trail and the e-mail', async () => {
    const before = await lastOutboxId(t);
    const response = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', challenger: 1, rationale: long });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const g = governanceSchema.parse(response.body);
    expect(g.decision).toMatchObject({ outcome: 'adopt', acknowledgedAgainstRecord: false, chosen: { model: 'challenger', challenger: 1, column: 'c2', name: 'CF-4 open banking' } });
    const trail = (await committee.get(`/api/comparisons/${id}/audit`)).body as { events: { action: string; details: Record<string, unknown> }[] };
    expect(trail.events.find((event) => event.action === 'comparison.decided')!.details.chosen).toEqual({ model: 'challenger', challenger: 1, column: 'c2', name: 'CF-4 open banking' });
    const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: before });
    expect(mail.receivedText).toContain('adopt the challenger “CF-4 open banking”');
  });
});

describe('the swap export of a further challenger', () => {
  it('lists the swap-in and swap-out of challenger k against the champion at the report rate (policy role), 400 beyond the challengers', async () => {
    const policy = await signedInAs(t.app, 'policy');
    const response = await policy.get(`/api/comparisons/${id}/export/swap.csv?challenger=2`);
    expect(response.status).toBe(200);
    expect(response.headers['content-disposition']).toContain('swap-challenger-2.csv');
    const lines = response.text.trim().split('\n').slice(1);
    const swap = report.challengers![2].swap;
    expect(lines.filter((line) => line.startsWith('swap-in,')).length).toBe(swap.swapIn.count);
    expect(lines.filter((line) => line.startsWith('swap-out,')).length).toBe(swap.swapOut.count);
    // Its challenger_score column holds the refit's scores (column c3 of the file).
    const rows = csv.toString('utf8').trim().split('\n').slice(1).map((line) => line.split(','));
    const first = lines[0].split(',');
    expect(first[4]).toBe(rows[Number(first[1]) - 1][4]);
    expect((await policy.get(`/api/comparisons/${id}/export/swap.csv?challenger=3`)).status).toBe(400);
  });
});
