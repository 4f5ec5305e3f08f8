import { governanceSchema, policyVersionSchema, policyVersionsSchema, verdictRecordSchema, type Governance } from '@shared/governance';
import type { ComparisonDetail, ComparisonList } from '@shared/comparisons';
import { adoptionPolicySchema, defaultAdoptionPolicy } from '@shared/policy';
import type { Report, SwapSets } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { segmentRuleAdded } from '@server/db/migrations/1764920000000-segment-rule';
import { seededPolicy } from '@server/db/migrations/1764806400000-governance';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { analysedComparison, waitForRuns } from './helpers/governance';

/**
 * The versioned adoption policy: version 1 is the default; each admin change appends a version
 * with its reason; stored versions and verdict records never change; a re-evaluation judges the
 * current run under the current version and appends a record; a new analysis is judged under the
 * version current when it started.
 */

let t: TestApp;
let admin: TestClient;
let modeler: TestClient;
let analyst: TestClient;
let id: number;

beforeAll(async () => {
  t = await buildTestApp();
  [admin, modeler, analyst] = await Promise.all((['admin', 'modeler', 'analyst'] as const).map((role) => signedInAs(t.app, role)));
  id = await analysedComparison(t, modeler);
});
afterAll(async () => {
  await t.close();
});

const fields = () => {
  const { version: _version, ...rest } = defaultAdoptionPolicy;
  return rest;
};

async function governance(): Promise<Governance> {
  return governanceSchema.parse((await analyst.get(`/api/comparisons/${id}/governance`)).body);
}

describe('adoption policy versions', () => {
  it('starts at version 2 (the segment rule added to version 1), readable by everyone signed in', async () => {
    const response = await analyst.get('/api/policy');
    expect(response.status).toBe(200);
    const current = policyVersionSchema.parse(response.body);
    expect(current.policy).toEqual(defaultAdoptionPolicy);
    expect(current.createdBy).toBeNull();
    // The migration writes its own copy of the defaults; read through the schema (which gives the
    // criteria added later, off, their defaults) it must stay equal to shared/policy.ts.
    // Version 1 (the governance migration) plus what the segment-rule migration adds is version 2.
    expect(adoptionPolicySchema.parse({ ...seededPolicy, version: 2, quorum: 2, segmentRule: segmentRuleAdded })).toEqual(defaultAdoptionPolicy);
    // Version 1 stays readable, with the segment rule off and its quorum of 0 (it predates both).
    const { versions } = policyVersionsSchema.parse((await analyst.get('/api/policy/versions')).body);
    expect(versions.map((version) => version.policy.version)).toEqual([2, 1]);
    expect(versions[1].policy.quorum).toBe(0);
    expect(versions[1].policy.segmentRule).toEqual({ enabled: false, minBads: 30 });
    expect(versions[1].policy).toEqual(adoptionPolicySchema.parse({ ...seededPolicy, version: 1 }));
  });

  it('refuses a change without a reason or with an out-of-range field (400), and names the field', async () => {
    const noReason = await admin.send('put', '/api/policy', fields());
    expect(noReason.status).toBe(400);
    expect((noReason.body as { error: { message: string } }).error.message).toMatch(/^reason:/);
    const badAlpha = await admin.send('put', '/api/policy', { ...fields(), alpha: 0.7, reason: 'Looser' });
    expect(badAlpha.status).toBe(400);
    expect((badAlpha.body as { error: { message: string } }).error.message).toMatch(/^alpha:/);
    expect(policyVersionsSchema.parse((await admin.get('/api/policy/versions')).body).versions).toHaveLength(2);
  });

  it('appends a version per change, with who, when and why; the list is newest first', async () => {
    const response = await admin.send('put', '/api/policy', { ...fields(), materialityGiniPoints: 40, reason: 'Only large uplifts justify a change this year.' });
    expect(response.status).toBe(200);
    const v2 = policyVersionSchema.parse(response.body);
    expect(v2.policy).toEqual({ ...defaultAdoptionPolicy, version: 3, materialityGiniPoints: 40 });
    expect(v2.createdBy?.name).toBe('Morgan Hale');
    expect(v2.reason).toBe('Only large uplifts justify a change this year.');
    const { versions } = policyVersionsSchema.parse((await analyst.get('/api/policy/versions')).body);
    expect(versions.map((version) => version.policy.version)).toEqual([3, 2, 1]);
    expect(versions[1].policy).toEqual(defaultAdoptionPolicy);
    const audit = await t.dataSource.query(`SELECT "details" FROM "audit_events" WHERE "action" = 'policy.changed'`);
    expect(JSON.parse((audit as { details: string }[])[0].details)).toMatchObject({
      version: 3,
      previousVersion: 2,
      changes: { materialityGiniPoints: { from: 2, to: 40 } },
    });
  });

  it('leaves the stored verdict as it was; re-evaluating appends a record under the new version', async () => {
    const before = await governance();
    expect(before.verdicts).toHaveLength(1);
    const stored = before.verdicts[0];
    expect(stored.policyVersion).toBe(2);

    const response = await analyst.post(`/api/comparisons/${id}/verdicts`, {});
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const record = verdictRecordSchema.parse(response.body);
    expect(record).toMatchObject({ policyVersion: 3, runId: stored.runId, createdBy: { name: 'Tomasz Wielgus' } });
    // The 2,000-row sample's ΔGini is a few points (sample-data/README.md), far below 40.
    const materiality = record.criteria.find((criterion) => criterion.id === 'materiality')!;
    expect(materiality.met).toBe(false);
    expect(materiality.detail).toMatch(/below the 40\.0 points required/);
    expect(record.outcome).not.toBe('supported');

    const after = await governance();
    expect(after.verdicts.map((verdict) => verdict.id)).toEqual([record.id, stored.id]);
    // One verdict everywhere (issue 13): the detail (header badge, verdict tab) and the list show
    // the newest record with its policy version, not the run's original verdict.
    const detail = (await analyst.get(`/api/comparisons/${id}`)).body as ComparisonDetail;
    expect(detail.verdict).toMatchObject({ id: record.id, policyVersion: 3, outcome: record.outcome, summary: record.summary });
    const list = (await analyst.get('/api/comparisons')).body as ComparisonList;
    expect(list.items.find((item) => item.id === id)!.verdict).toMatchObject({ id: record.id, policyVersion: 3, outcome: record.outcome });
    expect(after.verdicts[1]).toEqual(stored);
    // The run's report keeps the verdict it was given.
    const report = (await analyst.get(`/api/comparisons/${id}/report`)).body as Report;
    expect(report.verdict.policyVersion).toBe(2);
    expect(report.verdict.criteria).toEqual(stored.criteria);
  });

  it('re-evaluates the swap rule at the new policy approval rate from the run data (as POST /swap gives it)', async () => {
    const response = await admin.send('put', '/api/policy', {
      ...fields(),
      swapRule: { enabled: true, approvalRate: 0.5 },
      reason: 'Judge the swap sets at the approval rate we run in the downturn plan.',
    });
    expect(response.status).toBe(200);
    const record = verdictRecordSchema.parse((await analyst.post(`/api/comparisons/${id}/verdicts`, {})).body);
    expect(record.policyVersion).toBe(4);
    const swap = ((await analyst.post(`/api/comparisons/${id}/swap`, { approvalRate: 0.5 })).body as { swap: SwapSets }).swap;
    const criterion = record.criteria.find((c) => c.id === 'swap-bad-rate')!;
    expect(criterion.detail).toContain("at the policy's 50% approval rate");
    expect(criterion.detail).toContain(`the swap-in is ${swap.swapIn.count.toLocaleString('en-US')} account`);
    expect(criterion.met).toBe(swap.swapIn.bads * swap.swapOut.count <= swap.swapOut.bads * swap.swapIn.count);
  });

  it('judges a new analysis under the version current when it started', async () => {
    const detail = (await analyst.get(`/api/comparisons/${id}`)).body as { mapping: unknown };
    expect((await modeler.send('put', `/api/comparisons/${id}/setup`, { mapping: detail.mapping, settings: { bootstrap: 0, seed: 11 } })).status).toBe(200);
    await waitForRuns(t);
    const report = (await analyst.get(`/api/comparisons/${id}/report`)).body as Report;
    expect(report.policy).toEqual({ ...defaultAdoptionPolicy, version: 4, swapRule: { enabled: true, approvalRate: 0.5 } });
    const { verdicts } = await governance();
    expect(verdicts[0]).toMatchObject({ policyVersion: 4, createdBy: null, outcome: report.verdict.outcome });
    expect(verdicts).toHaveLength(4);
  });

  it('refuses to change or remove a stored version or verdict record, in the database itself', async () => {
    await expect(t.dataSource.query(`UPDATE "policy_versions" SET "reason" = 'edited' WHERE "version" = 1`)).rejects.toThrow(/kept as written/);
    await expect(t.dataSource.query(`DELETE FROM "policy_versions" WHERE "version" = 3`)).rejects.toThrow(/kept as written/);
    await expect(t.dataSource.query(`UPDATE "verdict_records" SET "outcome" = 'supported'`)).rejects.toThrow(/kept as written/);
    await expect(t.dataSource.query(`DELETE FROM "verdict_records"`)).rejects.toThrow(/kept as written/);
  });
});
