import type { Governance, PolicyVersion, VerdictRecord } from '@shared/governance';
import { auditTrailSchema, governanceSchema } from '@shared/governance';
import { defaultAdoptionPolicy } from '@shared/policy';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { analysedComparison, lastOutboxId, outboxAfter, waitForRuns } from './helpers/governance';

/**
 * The whole review workflow through the API on a real database, worker threads and SMTP sink:
 * analysed → submitted → returned → (no resubmission without a new run) → new set-up and run
 * (draft → analysed) → submitted →
 * validated → votes (quorum from the policy) → decided; the e-mails at each step as the sink
 * received them; the audit trail; the evidence pack.
 */

let t: TestApp;
let modeler: TestClient;
let analyst: TestClient;
let committee: TestClient;
let committee2: TestClient;
let admin: TestClient;
let id: number;

beforeAll(async () => {
  t = await buildTestApp();
  [modeler, analyst, committee, admin] = await Promise.all((['modeler', 'analyst', 'committee', 'admin'] as const).map((role) => signedInAs(t.app, role)));
  committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  id = await analysedComparison(t, modeler);
});
afterAll(async () => {
  await t.close();
});

async function governance(client: TestClient = modeler): Promise<Governance> {
  const response = await client.get(`/api/comparisons/${id}/governance`);
  expect(response.status).toBe(200);
  return governanceSchema.parse(response.body);
}

describe('the review workflow, end to end', () => {
  it('records the verdict of the finished run under policy version 2, by the system', async () => {
    const g = await governance();
    expect(g.state).toBe('analysed');
    expect(g.verdicts).toHaveLength(1);
    expect(g.verdicts[0]).toMatchObject({ policyVersion: 2, createdBy: null });
    const report = (await modeler.get(`/api/comparisons/${id}/report`)).body as { verdict: { outcome: string; criteria: unknown[] } };
    expect(g.verdicts[0].outcome).toBe(report.verdict.outcome);
    expect(g.verdicts[0].criteria).toEqual(report.verdict.criteria);
    // issue 13: the default quorum is two votes.
    expect(g.quorum).toBe(2);
  });

  it('submit: analysed → in review, and each analyst gets an e-mail with the link to the review page', async () => {
    const before = await lastOutboxId(t);
    const response = await modeler.post(`/api/comparisons/${id}/submit`, { message: 'Ready for validation; see the product segments.' });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    expect(governanceSchema.parse(response.body).state).toBe('in-review');
    const mail = await t.deliveredMail({ to: 'analyst@tallowmere.test', afterId: before });
    expect(mail.subject).toBe('Ready for review: Challenger v2 on the 2025 sample');
    // issue 13: the policy role acts at "in review" too (shared/workflow.ts), so it is e-mailed.
    const policyMail = await t.deliveredMail({ to: 'policy@tallowmere.test', afterId: before });
    expect(policyMail.subject).toBe('Ready for review: Challenger v2 on the 2025 sample');
    // The sink stores what came over SMTP: the link is the client's /comparisons/:id/review.
    expect(mail.receivedText).toContain(`http://scorecourt.test/comparisons/${id}/review`);
    expect(mail.receivedText).toContain('see the product segments');
    const sent = await outboxAfter(t, before);
    expect(sent.map((message) => message.to)).toEqual([['analyst@tallowmere.test'], ['policy@tallowmere.test']]);
  });

  it('review "returned": in review → returned with the findings; the creator is told', async () => {
    const before = await lastOutboxId(t);
    const response = await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'returned', findings: 'Rerun with seed 7 and check the web channel.' });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const g = governanceSchema.parse(response.body);
    expect(g.state).toBe('returned');
    expect(g.reviews[0]).toMatchObject({ outcome: 'returned', findings: 'Rerun with seed 7 and check the web channel.', reviewer: { name: 'Tomasz Wielgus' } });
    const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: before });
    expect(mail.subject).toBe('Returned for changes: Challenger v2 on the 2025 sample');
    expect(mail.receivedText).toContain('Rerun with seed 7');
    expect(mail.receivedText).toContain(`http://scorecourt.test/comparisons/${id}/review`);
    expect((await outboxAfter(t, before)).map((message) => message.to)).toEqual([['modeler@tallowmere.test']]);
  });

  it('refuses to resubmit a returned comparison until a new analysis has run (409)', async () => {
    const response = await modeler.post(`/api/comparisons/${id}/submit`, {});
    expect(response.status).toBe(409);
    expect((response.body as { error: { message: string } }).error.message).toMatch(/run the analysis again/);
  });

  it('a new set-up of a returned comparison runs again (draft → analysed) and can be resubmitted; the returned run and its verdict are kept', async () => {
    const detail = (await modeler.get(`/api/comparisons/${id}`)).body as { mapping: unknown };
    const setup = await modeler.send('put', `/api/comparisons/${id}/setup`, { mapping: detail.mapping, settings: { bootstrap: 0, seed: 7 } });
    expect(setup.status, JSON.stringify(setup.body)).toBe(200);
    await waitForRuns(t);
    const g = await governance();
    expect(g.state).toBe('analysed');
    expect(g.reviews.map((review) => review.outcome)).toEqual(['returned']);
    expect(g.verdicts).toHaveLength(2);
    expect(new Set(g.verdicts.map((record) => record.runId)).size).toBe(2);
    const response = await modeler.post(`/api/comparisons/${id}/submit`, { message: 'Seed 7 as asked.' });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    expect(governanceSchema.parse(response.body).state).toBe('in-review');
  });

  it('review "validated": in review → validated; every committee member gets an e-mail', async () => {
    const before = await lastOutboxId(t);
    const response = await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Uplift significant and stable across products.' });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    expect(governanceSchema.parse(response.body).state).toBe('validated');
    for (const to of ['committee@tallowmere.test', 'committee2@tallowmere.test']) {
      const mail = await t.deliveredMail({ to, afterId: before });
      expect(mail.subject).toBe('Validated, waiting for the committee: Challenger v2 on the 2025 sample');
      expect(mail.receivedText).toContain(`http://scorecourt.test/comparisons/${id}/review`);
      expect(mail.receivedText).toContain('Uplift significant and stable');
      expect(mail.receivedText).toContain(`http://scorecourt.test/comparisons/${id}/report?pack=pdf`);
    }
    expect((await outboxAfter(t, before)).map((message) => message.to).sort()).toEqual([['committee2@tallowmere.test'], ['committee@tallowmere.test']]);
  });

  it('votes: one per member and round; a second vote replaces the first', async () => {
    expect((await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: 'Clear uplift.' })).status).toBe(200);
    expect((await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'defer', comment: 'Want the web channel first.' })).status).toBe(200);
    const changed = await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: 'Satisfied by the segment table.' });
    expect(changed.status).toBe(200);
    const g = governanceSchema.parse(changed.body);
    expect(g.votes.map((vote) => [vote.voter.name, vote.vote, vote.comment])).toEqual([
      ['Henrik Aalto', 'adopt', 'Clear uplift.'],
      ['Grace Okafor', 'adopt', 'Satisfied by the segment table.'],
    ]);
  });

  it('decision: the policy at submission governs; against the votes or without quorum needs an acknowledgement and a real rationale', async () => {
    // Raising the quorum while the comparison is in review does not change its rules (issue 13):
    // version 2 was in force when it was submitted, and governs until it is submitted again.
    const current = (await admin.get('/api/policy')).body as PolicyVersion;
    const { version: _version, ...fields } = current.policy;
    const put = await admin.send('put', '/api/policy', { ...fields, quorum: 3, reason: 'Three votes for model changes.' });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    expect((put.body as PolicyVersion).policy).toMatchObject({ version: 3, quorum: 3 });
    const during = await governance();
    expect(during).toMatchObject({ quorum: 2, policyVersion: 2, tally: { adopt: 2, keep: 0, defer: 0 }, majority: 'adopt' });

    // Against the only votes cast, with the rationale "x": refused until acknowledged with a real reason.
    const against = { outcome: 'keep', rationale: 'x' };
    const silent = await committee.post(`/api/comparisons/${id}/decision`, against);
    expect(silent.status).toBe(409);
    expect((silent.body as { error: { message: string } }).error.message).toBe(
      'This decision goes against the record: the majority of the votes cast (2 adopt, 0 keep, 0 defer) is “Adopt the challenger”. Acknowledge that explicitly and give the reason in the rationale.',
    );
    const thin = await committee.post(`/api/comparisons/${id}/decision`, { ...against, acknowledgeAgainstRecord: true });
    expect(thin.status).toBe(409);
    expect((thin.body as { error: { message: string } }).error.message).toMatch(/needs a rationale of at least 80 characters that says why; this one has 1\.$/);
    expect((await governance()).state).toBe('validated');

    const decision = { outcome: 'adopt', rationale: 'Material, significant uplift; swap-in no worse than swap-out.', conditions: 'Monitor the web channel monthly.', effectiveDate: '2026-03-01' };
    const before = await lastOutboxId(t);
    const decided = await committee.post(`/api/comparisons/${id}/decision`, decision);
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    const g = governanceSchema.parse(decided.body);
    expect(g.state).toBe('decided');
    expect(g.quorum).toBe(2);
    expect(g.decision).toMatchObject({
      ...decision,
      decidedBy: { name: 'Henrik Aalto' },
      policyVersion: 2,
      tally: { adopt: 2, keep: 0, defer: 0 },
      acknowledgedAgainstRecord: false,
    });

    const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: before });
    expect(mail.subject).toBe('Decision recorded: Challenger v2 on the 2025 sample');
    // issue 13: everyone on the record hears of the decision — the creator, the reviewing analyst
    // and the other voter — not only the modeler; the decider does not mail themselves.
    const decidedTo = (await outboxAfter(t, before)).filter((message) => message.subject.startsWith('Decision recorded')).map((message) => message.to[0]);
    expect(decidedTo.sort()).toEqual(['analyst@tallowmere.test', 'committee2@tallowmere.test', 'modeler@tallowmere.test']);
    expect(mail.receivedText).toContain('adopt the challenger');
    expect(mail.receivedText).toContain('It applies from 2026-03-01.');
    expect(mail.receivedText).toContain('Monitor the web channel monthly.');
    expect(mail.receivedText).toContain(`http://scorecourt.test/comparisons/${id}/report`);
  });

  it('a decided comparison takes no more votes or decisions (409)', async () => {
    expect((await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'keep' })).status).toBe(409);
    expect((await committee2.post(`/api/comparisons/${id}/decision`, { outcome: 'keep', rationale: 'Again' })).status).toBe(409);
  });

  it('after the decision the record is closed: re-evaluation is refused, a later note is marked as after the decision', async () => {
    const again = await analyst.post(`/api/comparisons/${id}/verdicts`, {});
    expect(again.status).toBe(409);
    expect((again.body as { error: { message: string } }).error.message).toMatch(/^This comparison is decided: its record is closed/);
    const note = await analyst.post(`/api/comparisons/${id}/notes`, { body: 'Seen after the meeting.' });
    expect(note.status).toBe(201);
    expect(note.body).toMatchObject({ body: 'Seen after the meeting.', afterDecision: true });
    const detail = (await analyst.get(`/api/comparisons/${id}`)).body as { verdict: { id: number } };
    expect(detail.verdict.id).toBe((await governance()).verdicts[0].id);
  });

  it('the audit trail holds every step in order, with actors, and the chain verifies', async () => {
    const response = await analyst.get(`/api/comparisons/${id}/audit`);
    expect(response.status).toBe(200);
    const trail = auditTrailSchema.parse(response.body);
    expect(trail.chainValid).toBe(true);
    expect(trail.events.map((event) => event.action)).toEqual([
      'holdout.uploaded',
      'comparison.created',
      'analysis.done',
      'comparison.analysed',
      'verdict.recorded',
      'comparison.submitted',
      'comparison.returned',
      'comparison.setup',
      'analysis.done',
      'comparison.analysed',
      'verdict.recorded',
      'comparison.submitted',
      'comparison.validated',
      'vote.cast',
      'vote.cast',
      'vote.changed',
      'comparison.decided',
      'comparison.pack_archived',
      'note.added',
    ]);
    const ids = trail.events.map((event) => event.id);
    expect([...ids].sort((a, b) => a - b)).toEqual(ids);
    const decided = trail.events.find((event) => event.action === 'comparison.decided')!;
    expect(decided.actor).toEqual({ id: expect.any(Number), name: 'Henrik Aalto', email: 'committee@tallowmere.test' });
    expect(decided.details).toMatchObject({ from: 'validated', to: 'decided', outcome: 'adopt', policyVersion: 2, votes: { adopt: 2, keep: 0, defer: 0 } });
    const returned = trail.events.find((event) => event.action === 'comparison.returned')!;
    expect(returned.details).toMatchObject({ findings: 'Rerun with seed 7 and check the web channel.' });
    // Each event links to the one recorded before it anywhere in the trail.
    for (const event of trail.events) expect(event.prevHash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('the evidence pack downloads with the report, hashes, records and the audit trail', async () => {
    const response = await committee2.get(`/api/comparisons/${id}/evidence.json`);
    expect(response.status).toBe(200);
    expect(response.headers['content-disposition']).toBe(`attachment; filename="comparison-${id}-challenger-v2-on-the-2025-sample-evidence.json"`);
    const pack = JSON.parse(response.text) as {
      format: string;
      report: { input: { sha256: string }; settings: { seed: number } };
      settings: { seed: number };
      hashes: { inputSha256: string; reportSha256: string; lastAuditEventHash: string };
      runs: { reportSha256: string | null }[];
      verdicts: VerdictRecord[];
      reviews: unknown[];
      votes: { vote: string; replacesId: number | null }[];
      countingVotes: unknown[];
      decision: { outcome: string };
      policyVersions: PolicyVersion[];
      audit: { events: { hash: string }[]; chainValid: boolean };
      cautions: string[];
    };
    expect(pack.format).toBe('scorecourt-evidence-pack');
    expect(pack.settings.seed).toBe(7);
    expect(pack.report.settings.seed).toBe(7);
    expect(pack.hashes.inputSha256).toBe(pack.report.input.sha256);
    expect(pack.hashes.inputSha256).toMatch(/^[0-9a-f]{64}$/);
    // The report hash is the SHA-256 of exactly what GET /report serves.
    const served = (await committee2.get(`/api/comparisons/${id}/report`)).text;
    const { createHash } = await import('node:crypto');
    expect(pack.hashes.reportSha256).toBe(createHash('sha256').update(served).digest('hex'));
    expect(pack.runs).toHaveLength(2);
    expect(pack.verdicts).toHaveLength(2);
    expect(pack.reviews).toHaveLength(2);
    expect(pack.votes.map((vote) => vote.vote)).toEqual(['adopt', 'defer', 'adopt']);
    expect(pack.votes[2].replacesId).not.toBeNull();
    expect(pack.countingVotes).toHaveLength(2);
    expect(pack.decision.outcome).toBe('adopt');
    // The run's verdict and the decision both under version 2 (the one in force at submission).
    expect(pack.policyVersions.map((version) => version.policy.version)).toEqual([2]);
    expect(pack.policyVersions[0].policy).toEqual(defaultAdoptionPolicy);
    expect(pack.audit.chainValid).toBe(true);
    expect(pack.hashes.lastAuditEventHash).toBe(pack.audit.events.at(-1)!.hash);
    expect(pack.cautions.join(' ')).toMatch(/fair-lending/);
  });

  it('a rename after the acts rewrites no history: votes, the decision, audit events and the evidence pack keep the name and e-mail of the time', async () => {
    const trail = auditTrailSchema.parse((await analyst.get(`/api/comparisons/${id}/audit`)).body);
    const henrik = trail.events.find((event) => event.action === 'comparison.decided')!.actor!.id;
    const renamed = await admin.patch(`/api/users/${henrik}`, { name: 'Henrik Aalto-Berg' });
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200);

    const g = await governance(analyst);
    expect(g.decision!.decidedBy).toEqual({ id: henrik, name: 'Henrik Aalto', email: 'committee@tallowmere.test' });
    expect(g.votes.find((vote) => vote.voter.id === henrik)!.voter.name).toBe('Henrik Aalto');
    const after = auditTrailSchema.parse((await analyst.get(`/api/comparisons/${id}/audit`)).body);
    const acts = after.events.filter((event) => event.actor?.id === henrik);
    expect(acts.map((event) => event.action)).toEqual(['vote.cast', 'comparison.decided', 'comparison.pack_archived']);
    for (const event of acts) expect(event.actor).toEqual({ id: henrik, name: 'Henrik Aalto', email: 'committee@tallowmere.test' });
    expect(after.chainValid).toBe(true);
    const pack = JSON.parse((await analyst.get(`/api/comparisons/${id}/evidence.json`)).text) as {
      decision: { decidedBy: { name: string } };
      audit: { events: { action: string; actor: { name: string; email?: string } | null }[] };
    };
    expect(pack.decision.decidedBy.name).toBe('Henrik Aalto');
    expect(pack.audit.events.find((event) => event.action === 'comparison.decided')!.actor).toMatchObject({ name: 'Henrik Aalto', email: 'committee@tallowmere.test' });
  });
});
