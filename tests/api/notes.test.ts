import { noteSchema, type Note } from '@shared/governance';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rawQuery } from '@server/db/driver';
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
  // Notes test rules, not figures: each comparison analyses 500 accounts.
  id = await analysedComparison(t, modeler, { name: 'With notes', rows: 500 });
  otherId = await analysedComparison(t, modeler, { name: 'Another', rows: 500 });
});
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

  it('pages the notes and the audit trail (?after&limit → nextAfter), at most 500 a page', async () => {
    for (let i = 1; i <= 7; i++) expect((await modeler.post(`/api/comparisons/${otherId}/notes`, { body: `Note ${i}` })).status).toBe(201);
    const bodies: string[] = [];
    const sizes: number[] = [];
    let after: number | null = 0;
    while (after !== null) {
      const page = (await committee.get(`/api/comparisons/${otherId}/notes?after=${after}&limit=3`)).body as { notes: Note[]; nextAfter: number | null };
      bodies.push(...page.notes.map((note) => note.body));
      sizes.push(page.notes.length);
      after = page.nextAfter;
    }
    expect(sizes).toEqual([3, 3, 1]);
    expect(bodies).toEqual(['Note 1', 'Note 2', 'Note 3', 'Note 4', 'Note 5', 'Note 6', 'Note 7']);
    const tooMany = await committee.get(`/api/comparisons/${otherId}/notes?limit=501`);
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.message).toMatch(/limit: at most 500/);

    const whole = (await committee.get(`/api/comparisons/${otherId}/audit?limit=500`)).body as { events: { id: number }[]; nextAfter: number | null };
    expect(whole.nextAfter).toBeNull();
    const paged: number[] = [];
    let next: number | null = 0;
    while (next !== null) {
      const page = (await committee.get(`/api/comparisons/${otherId}/audit?after=${next}&limit=2`)).body as { events: { id: number }[]; nextAfter: number | null; chainValid: boolean };
      expect(page.chainValid).toBe(true);
      paged.push(...page.events.map((event) => event.id));
      next = page.nextAfter;
    }
    expect(paged).toEqual(whole.events.map((event) => event.id));
  });

  it('stores a note with a lone surrogate the same in the note and in its audit record', async () => {
    const raw = JSON.stringify({ body: 'Lone \ud800 and paired \ud83d\ude00 here' }).replace('\\ud800', '\\ud800');
    const response = await committee.agent
      .post(`/api/comparisons/${otherId}/notes`)
      .set('X-CSRF-Token', committee.csrf ?? (await committee.fetchCsrf()))
      .set('Content-Type', 'application/json')
      .send(raw);
    expect(response.status).toBe(201);
    const note = noteSchema.parse(response.body);
    expect(note.body).toBe('Lone \ufffd and paired \ud83d\ude00 here');
    const [stored] = await rawQuery<{ body: string }>(t.dataSource, 'SELECT "body" FROM "notes" WHERE "id" = ?', [note.id]);
    const [event] = (await t.dataSource.query(`SELECT "details" FROM "audit_events" WHERE "action" = 'note.added' ORDER BY "id" DESC LIMIT 1`)) as { details: string }[];
    expect(stored.body).toBe(note.body);
    expect((JSON.parse(event.details) as { body: string }).body).toBe(stored.body);
  });
});
