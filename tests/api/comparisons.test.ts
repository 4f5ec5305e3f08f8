import { comparisonDetailSchema, comparisonListSchema } from '@shared/comparisons';
import { reportSchema } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditDetails } from '@server/audit/audit';
import { transition } from '@server/comparisons/state';
import { AuditEvent, Comparison, MailMessage } from '@server/db/entities/index';
import { inTransaction } from '@server/db/transaction';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { rowCounts, sample2k, sampleMapping, uploadFile } from './helpers/holdouts';
import { queueWaitMs } from './helpers/governance';

let t: TestApp;
let modeler: TestClient;
let sampleId: number;
beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
  sampleId = (await uploadFile(modeler, sample2k(), 'sample-2k.csv')).body.id as number;
});
afterAll(async () => {
  await t.close();
});

const quick = { bootstrap: 100, seed: 3 };

async function detail(id: number) {
  const response = await modeler.get(`/api/comparisons/${id}`);
  expect(response.status).toBe(200);
  return comparisonDetailSchema.parse(response.body);
}

async function events(comparisonId: number): Promise<{ action: string; details: Record<string, unknown> }[]> {
  const rows = await t.dataSource.getRepository(AuditEvent).find({ where: { targetType: 'comparison', targetId: String(comparisonId) }, order: { id: 'ASC' } });
  return rows.map((event) => ({ action: event.action, details: auditDetails(event) }));
}

describe('creating a comparison', () => {
  it('without a mapping: a draft waiting for its mapping, no run, no report', async () => {
    const response = await modeler.post('/api/comparisons', { name: 'Waiting for a mapping', holdoutId: sampleId });
    expect(response.status).toBe(201);
    expect(response.body).toEqual({ id: expect.any(Number), state: 'draft' });
    const shown = await detail(response.body.id);
    expect(shown).toMatchObject({ state: 'draft', mapping: null, runs: [], currentRunId: null, latestRun: null, headline: null });
    const report = await modeler.get(`/api/comparisons/${response.body.id}/report`);
    expect(report.status).toBe(409);
    expect(report.body.error.message).toMatch(/no finished analysis/);
  });

  it('with a mapping: queues the analysis, which ends analysed with its report, audit events and an e-mail', async () => {
    const response = await modeler.post('/api/comparisons', {
      name: 'Tallowmere 2025 cash-flow challenger',
      description: 'Out-of-time holdout, 2025 applications',
      holdoutId: sampleId,
      mapping: sampleMapping,
      settings: quick,
    });
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body.state).toBe('draft');
    const id = response.body.id as number;
    const queued = await detail(id);
    expect(queued.runs).toHaveLength(1);
    expect(['queued', 'running', 'done']).toContain(queued.runs[0].status);

    await t.jobs.whenIdle(queueWaitMs);
    const done = await detail(id);
    expect(done.state).toBe('analysed');
    expect(done.runs[0]).toMatchObject({ status: 'done', progress: 1, attempts: 1, error: null, engineVersion: expect.any(String) });
    expect(done.currentRunId).toBe(done.runs[0].id);
    // The settings as stored: the defaults of shared/report.ts analysisSettingsSchema filled in.
    expect(done.settings).toEqual({ bootstrap: 100, seed: 3, confidence: 0.95, approvalRate: 0.7, cutoffs: null, dropMissing: false, bands: 10, economics: null, referencePeriod: null });

    const reportResponse = await modeler.get(`/api/comparisons/${id}/report`).expect(200);
    const report = reportSchema.parse(reportResponse.body);
    // The stored report never changes: its run id is its ETag, and a client holding it gets a 304.
    expect(reportResponse.headers.etag).toBe(`W/"report-${done.runs[0].id}"`);
    await modeler.get(`/api/comparisons/${id}/report`).set('If-None-Match', reportResponse.headers.etag).expect(304);
    expect(report.input).toEqual({ fileName: 'sample-2k.csv', sha256: done.holdout.sha256, bytes: done.holdout.bytes });
    expect(report.rows).toBe(2000);
    expect(report.bootstrap.replicates).toBe(100);
    expect(done.headline).toEqual({
      rows: report.rows,
      bads: report.bads,
      championGini: report.champion.gini,
      challengerGini: report.challenger.gini,
      deltaGini: report.difference.gini,
      deltaGiniCi: report.difference.giniCi,
      pOneSided: report.difference.pOneSided,
      pTwoSided: report.difference.pTwoSided,
      verdict: report.verdict.outcome,
    });

    const trail = await events(id);
    // verdict.recorded: the run's verdict stored as a verdict record (governance), in the same transaction.
    expect(trail.map((event) => event.action)).toEqual(['comparison.created', 'analysis.done', 'comparison.analysed', 'verdict.recorded']);
    expect(trail[0].details).toMatchObject({ holdoutId: sampleId, runId: done.runs[0].id, mapping: { champion: 'champion_points' } });
    expect(trail[1].details).toMatchObject({ runId: done.runs[0].id, verdict: report.verdict.outcome, policyVersion: 2 });
    expect(trail[2].details).toMatchObject({ from: 'draft', to: 'analysed' });

    const mail = await t.dataSource.getRepository(MailMessage).findOneByOrFail({ subject: 'Analysis done: Tallowmere 2025 cash-flow challenger' });
    expect(mail.to).toContain('modeler@tallowmere.test');
    expect(mail.text).toContain(`http://scorecourt.test/comparisons/${id}`);
  });
});

describe('a mapping that does not fit the data', () => {
  // Each file is uploaded (the upload's scan does not know the mapping), then a comparison with the
  // mapping is refused: a 400 naming the line (header = 1) and column, and nothing stored.
  const mapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' } };
  const cases = [
    { name: 'an unknown column', csv: 'bad,champion,challenger\n0,600,610\n1,550,540\n', mapping: { ...mapping, challenger: 'challenger_score' }, row: 1, column: 'challenger_score', message: /column "challenger_score" is not in the file/ },
    { name: 'text in a score', csv: 'bad,champion,challenger\n0,600,610\n1,550,540\n0,620,abc\n', mapping, row: 4, column: 'challenger', message: /row 4, column "challenger": "abc" is not a number/ },
    { name: 'an outcome other than the two expected', csv: 'bad,champion,challenger\n0,600,610\n2,550,540\n1,500,520\n', mapping, row: 4, column: 'bad', message: /row 4, column "bad": "1"|row 3, column "bad"/ },
    { name: 'one class only', csv: 'bad,champion,challenger\n0,600,610\n0,550,540\n0,500,520\n', mapping, row: null, column: 'bad', message: /every row used has the good value/ },
    { name: 'a ragged row', csv: 'bad,champion,challenger\n0,600,610\n1,550\n0,620,630\n1,500,505\n', mapping, row: 3, column: null, message: /row 3 has 2 fields, the header has 3/ },
    { name: 'a missing score', csv: 'bad,champion,challenger\n0,600,610\n1,550,540\n0,,520\n', mapping, row: 4, column: 'champion', message: /row 4, column "champion": the score is empty/ },
  ];
  for (const bad of cases) {
    it(`refuses ${bad.name} with a 400 naming the row and column, storing nothing`, async () => {
      const upload = await uploadFile(modeler, bad.csv, 'case.csv');
      expect(upload.status).toBe(201);
      const before = await rowCounts(t.dataSource);
      const response = await modeler.post('/api/comparisons', { name: bad.name, holdoutId: upload.body.id, mapping: bad.mapping, settings: quick });
      expect(response.status, JSON.stringify(response.body)).toBe(400);
      expect(response.body.error.code).toBe('bad_input');
      expect(response.body.error.message).toMatch(bad.message);
      expect(response.body.error.details).toMatchObject({ column: bad.column });
      if (bad.name !== 'an outcome other than the two expected') expect(response.body.error.details.row).toBe(bad.row);
      expect(await rowCounts(t.dataSource)).toEqual(before);
    });
  }

  it('refuses a bad set-up the same way and keeps the comparison as it was', async () => {
    const upload = await uploadFile(modeler, 'bad,champion,challenger\n0,600,610\n1,550,540\n0,620,abc\n', 'case.csv');
    const created = await modeler.post('/api/comparisons', { name: 'Set-up refused', holdoutId: upload.body.id });
    const before = await rowCounts(t.dataSource);
    const response = await modeler.send('put', `/api/comparisons/${created.body.id}/setup`, { mapping });
    expect(response.status).toBe(400);
    expect(response.body.error.details).toMatchObject({ row: 4, column: 'challenger' });
    expect(await rowCounts(t.dataSource)).toEqual(before);
    expect((await detail(created.body.id)).mapping).toBeNull();
  });
});

describe('set-up and state', () => {
  it('a new set-up of an analysed comparison starts a new run, keeps the earlier one, and ends analysed again', async () => {
    const created = await modeler.post('/api/comparisons', { name: 'Re-run', holdoutId: sampleId, mapping: sampleMapping, settings: quick });
    await t.jobs.whenIdle(queueWaitMs);
    const first = await detail(created.body.id);
    expect(first.state).toBe('analysed');

    const response = await modeler.send('put', `/api/comparisons/${created.body.id}/setup`, { mapping: { ...sampleMapping, segments: [] }, settings: { ...quick, seed: 4 } });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const changed = comparisonDetailSchema.parse(response.body);
    expect(changed.state).toBe('draft');
    expect(changed.runs).toHaveLength(2);
    expect(changed.settings).toMatchObject({ bootstrap: 100, seed: 4 });
    // Until the new run is done, the current run (whose report the pages show) is the earlier one.
    expect(changed.currentRunId === first.runs[0].id || changed.runs[0].status === 'done').toBe(true);

    await t.jobs.whenIdle(queueWaitMs);
    const after = await detail(created.body.id);
    expect(after.state).toBe('analysed');
    expect(after.runs.map((run) => run.status)).toEqual(['done', 'done']);
    expect(after.currentRunId).toBe(after.runs[0].id);
    const report = (await modeler.get(`/api/comparisons/${created.body.id}/report`)).body;
    expect(report.segments).toEqual([]);
    expect(report.settings.seed).toBe(4);
    expect((await events(created.body.id)).map((event) => event.action)).toEqual([
      'comparison.created',
      'analysis.done',
      'comparison.analysed',
      'verdict.recorded',
      'comparison.setup',
      'analysis.done',
      'comparison.analysed',
      'verdict.recorded',
    ]);
  });

  it('transition() refuses a wrong state with 409 and writes nothing; set-up is refused in review', async () => {
    const created = await modeler.post('/api/comparisons', { name: 'In review', holdoutId: sampleId });
    const id = created.body.id as number;
    const wrong = inTransaction(t.dataSource, (manager) => transition(manager, id, ['analysed'], 'in-review', { actor: null, action: 'comparison.submitted' }));
    await expect(wrong).rejects.toMatchObject({ status: 409, code: 'conflict' });
    expect((await events(id)).map((event) => event.action)).toEqual(['comparison.created']);

    await inTransaction(t.dataSource, (manager) => transition(manager, id, ['draft'], 'in-review', { actor: { id: 2 }, action: 'comparison.submitted', details: { message: 'test' } }));
    expect((await t.dataSource.getRepository(Comparison).findOneByOrFail({ id })).state).toBe('in-review');
    const trail = await events(id);
    expect(trail[1]).toEqual({ action: 'comparison.submitted', details: { message: 'test', from: 'draft', to: 'in-review' } });

    const before = await rowCounts(t.dataSource);
    const response = await modeler.send('put', `/api/comparisons/${id}/setup`, { mapping: sampleMapping });
    expect(response.status).toBe(409);
    expect(response.body.error.details).toMatchObject({ state: 'in-review' });
    expect(await rowCounts(t.dataSource)).toEqual(before);
  });
});

describe('the list', () => {
  it('filters by state, searches the name, sorts and pages, with the headline numbers of each current run', async () => {
    await t.jobs.whenIdle(queueWaitMs);
    const all = comparisonListSchema.parse((await modeler.get('/api/comparisons?pageSize=100')).body);
    expect(all.total).toBe(all.items.length);
    expect(all.total).toBeGreaterThanOrEqual(5);
    // Newest change first.
    const updated = all.items.map((item) => item.updatedAt);
    expect([...updated].sort().reverse()).toEqual(updated);

    const analysed = comparisonListSchema.parse((await modeler.get('/api/comparisons?state=analysed')).body);
    expect(analysed.items.length).toBeGreaterThan(0);
    for (const item of analysed.items) {
      expect(item.state).toBe('analysed');
      expect(item.headline).not.toBeNull();
      expect(item.latestRun?.status).toBe('done');
    }

    const found = comparisonListSchema.parse((await modeler.get('/api/comparisons?q=cash-flow')).body);
    expect(found.items.map((item) => item.name)).toEqual(['Tallowmere 2025 cash-flow challenger']);
    // A % in the search is a literal character, not a wildcard.
    expect(comparisonListSchema.parse((await modeler.get('/api/comparisons?q=%25')).body).total).toBe(0);

    const byName = comparisonListSchema.parse((await modeler.get('/api/comparisons?sort=name-asc&pageSize=100')).body);
    const names = byName.items.map((item) => item.name.toLowerCase());
    expect([...names].sort()).toEqual(names);

    const byDelta = comparisonListSchema.parse((await modeler.get('/api/comparisons?sort=delta-gini-desc&pageSize=100')).body);
    const deltas = byDelta.items.map((item) => item.headline?.deltaGini ?? null);
    const firstNull = deltas.indexOf(null);
    const withDelta = (firstNull === -1 ? deltas : deltas.slice(0, firstNull)) as number[];
    expect([...withDelta].sort((a, b) => b - a)).toEqual(withDelta);
    if (firstNull !== -1) expect(deltas.slice(firstNull).every((delta) => delta === null)).toBe(true);

    const page1 = comparisonListSchema.parse((await modeler.get('/api/comparisons?pageSize=2&page=1')).body);
    const page2 = comparisonListSchema.parse((await modeler.get('/api/comparisons?pageSize=2&page=2')).body);
    expect(page1.items).toHaveLength(2);
    expect(page1.total).toBe(all.total);
    expect(page2.items.map((item) => item.id)).toEqual(all.items.slice(2, 4).map((item) => item.id));

    const refused = await modeler.get('/api/comparisons?pageSize=1000');
    expect(refused.status).toBe(400);
  });
});
