import { noteSchema, type Note } from '@shared/governance';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { analysedComparison } from './helpers/governance';

/** Notes: a discussion open to everyone signed in; swap-set annotations by the policy role, optionally on a saved scenario. */

let t: TestApp;
let modeler: TestClient;
let policy: TestClient;
let committee: TestClient;
let id: number;
let otherId: number;

beforeAll(async () => {
  t = await buildTestApp();
  [modeler, policy, committee] = await Promise.all((['modeler', 'policy', 'committee'] as const).map((role) => signedInAs(t.app, role)));
  id = await analysedComparison(t, modeler, { name: 'With notes' });
  otherId = await analysedComparison(t, modeler, { name: 'Another' });
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('notes', () => {
  it('lets anyone signed in write in the discussion, and lists it oldest first with authors', async () => {
    const first = await committee.post(`/api/comparisons/${id}/notes`, { body: 'Is the web channel big enough to read?' });
    expect(first.status).toBe(201);
    expect(noteSchema.parse(first.body)).toMatchObject({ anchor: 'discussion', scenarioId: null, author: { name: 'Henrik Aalto' } });
    expect((await modeler.post(`/api/comparisons/${id}/notes`, { body: 'It has 412 accounts and 30 bads.' })).status).toBe(201);
    const list = (await committee.get(`/api/comparisons/${id}/notes`)).body as { notes: Note[] };
    expect(list.notes.map((note) => [note.author.name, note.body])).toEqual([
      ['Henrik Aalto', 'Is the web channel big enough to read?'],
      ['Priya Natarajan', 'It has 412 accounts and 30 bads.'],
    ]);
  });

  it('keeps swap-set annotations for the policy role (403 for others) and ties them to a scenario of this comparison', async () => {
    const refused = await modeler.post(`/api/comparisons/${id}/notes`, { anchor: 'swap-in', body: 'Looks fine.' });
    expect(refused.status).toBe(403);
    const scenario = await policy.post(`/api/comparisons/${id}/scenarios`, { name: 'Plan 2026', approvalRate: 0.72 });
    expect(scenario.status, JSON.stringify(scenario.body)).toBe(201);
    const scenarioId = (scenario.body as { id: number }).id;
    const note = await policy.post(`/api/comparisons/${id}/notes`, { anchor: 'swap-out', body: 'Swap-out is mostly thin-file applicants.', scenarioId });
    expect(note.status).toBe(201);
    expect(noteSchema.parse(note.body)).toMatchObject({ anchor: 'swap-out', scenarioId, author: { name: 'Rosa Delgado' } });

    const elsewhere = await policy.post(`/api/comparisons/${otherId}/notes`, { anchor: 'swap-in', body: 'Wrong scenario.', scenarioId });
    expect(elsewhere.status).toBe(400);
    expect((elsewhere.body as { error: { message: string } }).error.message).toBe(`scenarioId: there is no saved scenario ${scenarioId} on this comparison`);
  });

  it('rejects an empty note and an unknown anchor (400), and a missing comparison (404)', async () => {
    expect((await committee.post(`/api/comparisons/${id}/notes`, { body: '   ' })).status).toBe(400);
    expect((await policy.post(`/api/comparisons/${id}/notes`, { anchor: 'elsewhere', body: 'x' })).status).toBe(400);
    expect((await committee.post('/api/comparisons/999999/notes', { body: 'x' })).status).toBe(404);
    expect((await committee.get('/api/comparisons/999999/notes')).status).toBe(404);
  });

  it('records each note in the comparison audit trail', async () => {
    const trail = (await committee.get(`/api/comparisons/${id}/audit`)).body as { events: { action: string; details: Record<string, unknown> }[] };
    const notes = trail.events.filter((event) => event.action === 'note.added');
    expect(notes.map((event) => event.details.anchor)).toEqual(['discussion', 'discussion', 'swap-out']);
    expect(notes[2].details).toMatchObject({ body: 'Swap-out is mostly thin-file applicants.' });
  });
});
