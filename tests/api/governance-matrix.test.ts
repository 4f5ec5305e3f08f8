import type { ComparisonState } from '@shared/comparisons';
import { workflowSteps, type WorkflowStep } from '@shared/workflow';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { lastOutboxId, outboxAfter, personWith, waitForRuns } from './helpers/governance';
import { sampleHead, sampleMapping, uploadFile } from './helpers/holdouts';

/**
 * The 403/409 matrix of the workflow: every transition × every state × three kinds of caller —
 * someone holding the step's role who did not create the comparison, the creator holding that
 * role too (four-eyes), and a role the step does not name. Expected (server/governance/service.ts):
 * wrong role → 403 (the guard); the creator → 403 for review, votes and the decision, whatever the
 * state; otherwise 409 unless the state is one the step starts from, then 200.
 * All comparisons are created by one person who holds every workflow role.
 */

const decideBody = {
  outcome: 'keep',
  rationale: 'Not material: the uplift is below what the bank needs to justify the cost of a model change this year.',
  acknowledgeAgainstRecord: true,
};

type Step = WorkflowStep;

// The matrix runs from the one workflow table (shared/workflow.ts): each step's role, the states it
// starts from and whether four-eyes applies; only the bodies are the test's own.
const bodies: Record<Step, object> = {
  submit: { message: '' },
  validate: { outcome: 'validated', findings: 'Fine.' },
  return: { outcome: 'returned', findings: 'Not yet.' },
  vote: { vote: 'adopt', comment: '' },
  decide: decideBody,
};
const steps = Object.fromEntries(
  (Object.keys(workflowSteps) as Step[]).map((step) => {
    const rule = workflowSteps[step];
    return [step, { path: rule.path, body: bodies[step], role: rule.role as 'modeler' | 'analyst' | 'committee', from: [...rule.from], fourEyes: rule.fourEyes }];
  }),
) as Record<Step, { path: string; body: object; role: 'modeler' | 'analyst' | 'committee'; from: ComparisonState[]; fourEyes: boolean }>;
/** A role each step does not name. */
const wrongRole: Record<Step, 'policy' | 'analyst' | 'modeler'> = { submit: 'analyst', validate: 'policy', return: 'modeler', vote: 'analyst', decide: 'policy' };

const states: ComparisonState[] = ['draft', 'analysed', 'in-review', 'validated', 'returned', 'decided'];

// The matrix tests rules, not figures: each of its dozen analyses runs on 200 accounts.
const sample = () => sampleHead(200);

let t: TestApp;
let owner: TestClient;
const clients = new Map<string, TestClient>();
/** A comparison in each state, and spare ones for the calls that succeed (they change the state). */
const inState = new Map<ComparisonState, number>();
const spare = new Map<Step, number>();

async function ok(response: Promise<{ status: number; body: unknown }>): Promise<void> {
  const { status, body } = await response;
  expect(status, JSON.stringify(body)).toBe(200);
}

async function driveTo(id: number, state: ComparisonState): Promise<void> {
  if (state === 'analysed' || state === 'draft') return;
  await ok(owner.post(`/api/comparisons/${id}/submit`, {}));
  if (state === 'in-review') return;
  await ok(clients.get('analyst')!.post(`/api/comparisons/${id}/review`, { outcome: state === 'returned' ? 'returned' : 'validated', findings: 'Set-up.' }));
  if (state === 'decided') await ok(clients.get('committee')!.post(`/api/comparisons/${id}/decision`, { ...decideBody, outcome: 'defer' }));
}

beforeAll(async () => {
  t = await buildTestApp();
  ({ client: owner } = await personWith(t, 'owner@tallowmere.test', ['modeler', 'analyst', 'committee']));
  for (const role of ['modeler', 'analyst', 'committee', 'policy'] as const) clients.set(role, await signedInAs(t.app, role));
  const upload = await uploadFile(owner, sample(), 'sample-head.csv');
  expect(upload.status).toBe(201);
  const holdoutId = (upload.body as { id: number }).id;
  const create = async (name: string, withMapping: boolean) => {
    const response = await owner.post('/api/comparisons', { name, holdoutId, ...(withMapping ? { mapping: sampleMapping, settings: { bootstrap: 0 } } : {}) });
    expect(response.status).toBe(201);
    return (response.body as { id: number }).id;
  };
  for (const state of states) inState.set(state, await create(`matrix ${state}`, state !== 'draft'));
  spare.set('submit', await create('spare submit', true));
  spare.set('validate', await create('spare validate', true));
  spare.set('return', await create('spare return', true));
  spare.set('vote', await create('spare vote', true));
  spare.set('decide', await create('spare decide', true));
  await waitForRuns(t);
  for (const state of states) await driveTo(inState.get(state)!, state);
  await driveTo(spare.get('validate')!, 'in-review');
  await driveTo(spare.get('return')!, 'in-review');
  await driveTo(spare.get('vote')!, 'validated');
  await driveTo(spare.get('decide')!, 'validated');
  // Eleven analyses, the reviews and a decision (which lays out the pack): seconds on a quiet machine;
  // beside two busy loops at load 40 this set-up took more than 240 s.
}, 600_000);
afterAll(async () => {
  await t.close();
});

async function stateOf(id: number): Promise<ComparisonState> {
  return ((await owner.get(`/api/comparisons/${id}`)).body as { state: ComparisonState }).state;
}

describe('workflow: the 403/409 matrix', () => {
  it('has each comparison in the state it stands for', async () => {
    for (const state of states) expect(await stateOf(inState.get(state)!)).toBe(state);
  });

  it('answers every step × state × caller as the rules say, and a refused call changes nothing', async () => {
    const failures: string[] = [];
    let cells = 0;
    for (const [step, rule] of Object.entries(steps) as [Step, (typeof steps)[Step]][]) {
      for (const state of states) {
        const id = inState.get(state)!;
        // A returned comparison is submitted again only after a new run: the step's own condition (409).
        const opens = rule.from.includes(state) && !(step === 'submit' && state === 'returned');
        const callers: [string, TestClient, number][] = [
          [`${wrongRole[step]} (wrong role)`, clients.get(wrongRole[step])!, 403],
          ['creator holding the role', owner, rule.fourEyes ? 403 : opens ? 200 : 409],
          // The successful cells are checked on spare comparisons below, so the matrix's stay put.
          [`${rule.role} (not the creator)`, clients.get(rule.role)!, opens ? 200 : 409],
        ];
        for (const [who, client, want] of callers) {
          if (want === 200) continue;
          cells += 1;
          const response = await client.post(`/api/comparisons/${id}/${rule.path}`, rule.body);
          if (response.status !== want) failures.push(`${step} on ${state} as ${who}: got ${response.status}, want ${want}`);
          const body = response.body as { error?: { code: string; message: string } };
          // A returned comparison is 409 for a different reason: it needs a new run first.
          const why = step === 'submit' && state === 'returned' ? /run the analysis again/ : /^This comparison is /;
          if (want === 409 && !why.test(body.error?.message ?? '')) failures.push(`${step} on ${state}: 409 message ${body.error?.message}`);
          if (want === 403 && who.startsWith('creator') && !body.error?.message.includes('four-eyes')) failures.push(`${step} on ${state}: 403 message ${body.error?.message}`);
        }
        if ((await stateOf(id)) !== state) failures.push(`${step} on ${state}: the state changed`);
      }
    }
    expect(failures).toEqual([]);
    expect(cells).toBeGreaterThan(60);
  });

  it('the same steps succeed from their own state for someone else holding the role', async () => {
    await ok(owner.post(`/api/comparisons/${spare.get('submit')!}/submit`, {}));
    expect(await stateOf(spare.get('submit')!)).toBe('in-review');
    await ok(clients.get('analyst')!.post(`/api/comparisons/${spare.get('validate')!}/review`, steps.validate.body));
    expect(await stateOf(spare.get('validate')!)).toBe('validated');
    await ok(clients.get('analyst')!.post(`/api/comparisons/${spare.get('return')!}/review`, steps.return.body));
    expect(await stateOf(spare.get('return')!)).toBe('returned');
    await ok(clients.get('committee')!.post(`/api/comparisons/${spare.get('vote')!}/votes`, steps.vote.body));
    expect(await stateOf(spare.get('vote')!)).toBe('validated');
    await ok(clients.get('committee')!.post(`/api/comparisons/${spare.get('decide')!}/decision`, steps.decide.body));
    expect(await stateOf(spare.get('decide')!)).toBe('decided');
  });

  it('never tells the creator to review or decide: analysts and committee members other than the creator get the e-mails', async () => {
    const id = spare.get('return')!;
    // Returned → a new set-up → analysed → submit (by the creator, who is also an analyst).
    const detail = (await owner.get(`/api/comparisons/${id}`)).body as { mapping: unknown };
    await ok(owner.send('put', `/api/comparisons/${id}/setup`, { mapping: detail.mapping, settings: { bootstrap: 0, seed: 3 } }));
    await waitForRuns(t);
    const before = await lastOutboxId(t);
    await ok(owner.post(`/api/comparisons/${id}/submit`, {}));
    expect((await outboxAfter(t, before)).map((message) => message.to)).toEqual([['analyst@tallowmere.test'], ['policy@tallowmere.test']]);
    const validated = await lastOutboxId(t);
    await ok(clients.get('analyst')!.post(`/api/comparisons/${id}/review`, steps.validate.body));
    expect((await outboxAfter(t, validated)).map((message) => message.to).sort()).toEqual([['committee2@tallowmere.test'], ['committee@tallowmere.test']]);
  });

  it('the person who uploaded the holdout cannot review a comparison someone else created on it', async () => {
    const { client: uploader } = await personWith(t, 'uploader@tallowmere.test', ['modeler', 'analyst']);
    const upload = await uploadFile(uploader, sample(), 'uploaded-by-another.csv');
    const created = await clients.get('modeler')!.post('/api/comparisons', {
      name: 'On a colleague’s upload',
      holdoutId: (upload.body as { id: number }).id,
      mapping: sampleMapping,
      settings: { bootstrap: 0 },
    });
    expect(created.status).toBe(201);
    const id = (created.body as { id: number }).id;
    await waitForRuns(t);
    await ok(clients.get('modeler')!.post(`/api/comparisons/${id}/submit`, {}));
    const response = await uploader.post(`/api/comparisons/${id}/review`, steps.validate.body);
    expect(response.status).toBe(403);
    expect(await stateOf(id)).toBe('in-review');
  });

  it('the person who set up one of its analyses cannot review, vote on or decide it, and the review page names them', async () => {
    // A modeler who also serves on the committee and as an analyst re-runs a colleague's comparison.
    const { user: rerunner, client: rerunnerClient } = await personWith(t, 'rerunner@tallowmere.test', ['modeler', 'analyst', 'committee']);
    const upload = await uploadFile(clients.get('modeler')!, sample(), 'colleague.csv');
    const created = await clients.get('modeler')!.post('/api/comparisons', { name: 'Re-run by a colleague', holdoutId: (upload.body as { id: number }).id });
    expect(created.status).toBe(201);
    const id = (created.body as { id: number }).id;
    await ok(rerunnerClient.send('put', `/api/comparisons/${id}/setup`, { mapping: sampleMapping, settings: { bootstrap: 0 } }));
    await waitForRuns(t);
    await ok(clients.get('modeler')!.post(`/api/comparisons/${id}/submit`, {}));
    const review = await rerunnerClient.post(`/api/comparisons/${id}/review`, steps.validate.body);
    expect(review.status).toBe(403);
    expect((review.body as { error: { message: string } }).error.message).toMatch(/set up one of its analyses.*four-eyes/);
    await ok(clients.get('analyst')!.post(`/api/comparisons/${id}/review`, steps.validate.body));
    for (const step of ['vote', 'decide'] as const) {
      const response = await rerunnerClient.post(`/api/comparisons/${id}/${steps[step].path}`, steps[step].body);
      expect(response.status, step).toBe(403);
    }
    expect(await stateOf(id)).toBe('validated');
    const governance = (await rerunnerClient.get(`/api/comparisons/${id}/governance`)).body as { authors: { id: number }[] };
    expect(governance.authors.map((author) => author.id)).toContain(rerunner.id);
    // The comparison itself names them too, so every page's next-step hint can apply the rule.
    const detail = (await rerunnerClient.get(`/api/comparisons/${id}`)).body as { authorIds: number[]; createdBy: { id: number } };
    expect(detail.authorIds).toEqual(governance.authors.map((author) => author.id));
    expect(detail.authorIds).toEqual(expect.arrayContaining([rerunner.id, detail.createdBy.id]));
    // The set-up by another modeler than the creator is recorded and named as such.
    const trail = (await rerunnerClient.get(`/api/comparisons/${id}/audit`)).body as { events: { action: string; details: Record<string, unknown> }[] };
    const setup = trail.events.find((event) => event.action === 'comparison.setup')!;
    expect(setup.details).toMatchObject({ byOtherThanCreator: { id: rerunner.id, name: rerunner.name }, creator: { id: detail.createdBy.id } });
  });

  it('the submitter cannot validate a comparison someone else created (four-eyes covers the submitter)', async () => {
    // issue 13: a person holding modeler and analyst submitted a colleague's comparison, then validated it.
    const { user: submitter, client: submitterClient } = await personWith(t, 'submitter@tallowmere.test', ['modeler', 'analyst']);
    const upload = await uploadFile(clients.get('modeler')!, sample(), 'submitted-by-another.csv');
    const created = await clients.get('modeler')!.post('/api/comparisons', {
      name: 'Submitted by a colleague',
      holdoutId: (upload.body as { id: number }).id,
      mapping: sampleMapping,
      settings: { bootstrap: 0 },
    });
    expect(created.status).toBe(201);
    const id = (created.body as { id: number }).id;
    await waitForRuns(t);
    await ok(submitterClient.post(`/api/comparisons/${id}/submit`, {}));
    const review = await submitterClient.post(`/api/comparisons/${id}/review`, steps.validate.body);
    expect(review.status).toBe(403);
    expect((review.body as { error: { message: string } }).error.message).toMatch(/submitted it.*four-eyes/);
    expect(await stateOf(id)).toBe('in-review');
    const governance = (await submitterClient.get(`/api/comparisons/${id}/governance`)).body as { authors: { id: number }[] };
    expect(governance.authors.map((author) => author.id)).toContain(submitter.id);
  });

  it('answers 404 for a comparison that does not exist, before any state rule', async () => {
    const response = await clients.get('analyst')!.post('/api/comparisons/999999/review', steps.validate.body);
    expect(response.status).toBe(404);
  });
});
