import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiErrorSchema } from '@shared/errors';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { analysedComparison } from './helpers/governance';

/** Every change counts against one budget per person (WRITES_PER_MINUTE; 5 here), or per address when signed out. */

let t: TestApp;
let id: number;
beforeAll(async () => {
  t = await buildTestApp({ config: { writesPerMinute: 5 } });
  const modeler = await signedInAs(t.app, 'modeler');
  id = await analysedComparison(t, modeler, { name: 'Limited' });
});
afterAll(async () => {
  await t.close();
});

describe('the per-person budget of changes', () => {
  it('answers 429 with Retry-After past the budget, for that person only; reading stays open', async () => {
    const committee = await signedInAs(t.app, 'committee');
    const statuses: number[] = [];
    for (let i = 0; i < 7; i++) statuses.push((await committee.post(`/api/comparisons/${id}/notes`, { body: `Note ${i}` })).status);
    // Signing in was a change of its own (an address's, before the person was known): 5 notes fit the rest of the budget at most.
    expect(statuses.filter((status) => status === 201).length).toBeGreaterThanOrEqual(4);
    expect(statuses.at(-1)).toBe(429);
    const refused = await committee.post(`/api/comparisons/${id}/notes`, { body: 'One more' });
    expect(refused.status).toBe(429);
    expect(apiErrorSchema.parse(refused.body).error.code).toBe('rate_limited');
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    expect((await committee.get(`/api/comparisons/${id}/notes`)).status).toBe(200);
    // Another person has a budget of their own.
    const policy = await signedInAs(t.app, 'policy');
    expect((await policy.post(`/api/comparisons/${id}/notes`, { body: 'Mine' })).status).toBe(201);
  });

  it('counts changes by address when no one is signed in', async () => {
    const anonymous = new TestClient(t.app);
    const statuses: number[] = [];
    for (let i = 0; i < 12; i++) statuses.push((await anonymous.post('/api/auth/logout', {})).status);
    expect(statuses).toContain(429);
  });
});
