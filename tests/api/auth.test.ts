import { apiErrorSchema, errorCodes } from '@shared/errors';
import { userResponseSchema } from '@shared/users';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '@server/db/entities/index';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient, signedInAs } from './helpers/client';

let t: TestApp;
beforeAll(async () => {
  t = await buildTestApp();
});
afterAll(async () => {
  await t.close();
});

describe('sign-in', () => {
  it('signs a demo person in and returns them with their roles', async () => {
    const client = new TestClient(t.app);
    const response = await client.signIn('Analyst@Tallowmere.test ');
    expect(response.status).toBe(200);
    const { user } = userResponseSchema.parse(response.body);
    expect(user).toMatchObject({ email: 'analyst@tallowmere.test', roles: ['analyst'], active: true });
    expect(response.body.user).not.toHaveProperty('passwordHash');
    const me = await client.get('/api/auth/me').expect(200);
    expect(me.body.user.email).toBe('analyst@tallowmere.test');
  });

  it('answers a wrong password and an unknown e-mail with the same 401', async () => {
    const wrong = await new TestClient(t.app).signIn('policy@tallowmere.test', 'not-the-password');
    const unknown = await new TestClient(t.app).signIn('nobody@tallowmere.test', 'not-the-password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(apiErrorSchema.parse(wrong.body)).toEqual(apiErrorSchema.parse(unknown.body));
  });

  it('refuses a deactivated person even with the right password', async () => {
    await t.dataSource.getRepository(User).update({ email: 'committee2@tallowmere.test' }, { active: false });
    const response = await new TestClient(t.app).signIn('committee2@tallowmere.test');
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('account_inactive');
    await t.dataSource.getRepository(User).update({ email: 'committee2@tallowmere.test' }, { active: true });
  });

  it('rejects a malformed sign-in body with the fields named', async () => {
    const response = await new TestClient(t.app).post('/api/auth/login', { email: 'not an address' });
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe(errorCodes.validation);
    const paths = (response.body.error.details.issues as { path: string }[]).map((issue) => issue.path);
    expect(paths).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('answers /me with 401 when nobody is signed in', async () => {
    const response = await request(t.app).get('/api/auth/me');
    expect(response.status).toBe(401);
    expect(response.body.error.code).toBe(errorCodes.unauthenticated);
  });

  it('signs out and the session no longer works', async () => {
    const client = await signedInAs(t.app, 'modeler');
    const out = await client.post('/api/auth/logout');
    expect(out.status).toBe(200);
    await client.get('/api/auth/me').expect(401);
  });
});

describe('sign-in rate limit', () => {
  it('after 10 failures in the window the account and address get 429, even with the right password', async () => {
    const client = new TestClient(t.app);
    for (let attempt = 1; attempt <= 10; attempt++) {
      const response = await client.signIn('committee@tallowmere.test', `wrong-${attempt}`);
      expect(response.status, `attempt ${attempt}`).toBe(401);
    }
    const blocked = await client.signIn('committee@tallowmere.test');
    expect(blocked.status).toBe(429);
    expect(apiErrorSchema.parse(blocked.body).error.code).toBe(errorCodes.rateLimited);
    expect(blocked.body.error.details.retryAfterSeconds).toBeGreaterThan(0);
    // Another account from the same address is not affected.
    expect((await new TestClient(t.app).signIn('admin@tallowmere.test')).status).toBe(200);
  });

  it('does not count successful sign-ins', async () => {
    const client = new TestClient(t.app);
    for (let i = 0; i < 12; i++) expect((await client.signIn('policy@tallowmere.test')).status).toBe(200);
  });
});

describe('session fixation', () => {
  it('issues a new session id at sign-in, and the old one is not signed in', async () => {
    const client = new TestClient(t.app);
    const before = await client.agent.get('/api/auth/csrf').expect(200);
    client.csrf = before.body.token;
    const anonymousCookie = client.sessionCookie(before);
    expect(anonymousCookie).not.toBeNull();

    const signIn = await client.signIn('admin@tallowmere.test');
    expect(signIn.status).toBe(200);
    const signedInCookie = client.sessionCookie(signIn);
    expect(signedInCookie).not.toBeNull();
    expect(signedInCookie).not.toBe(anonymousCookie);

    // An attacker holding the pre-sign-in cookie gets nothing.
    await request(t.app).get('/api/auth/me').set('Cookie', anonymousCookie!).expect(401);
    await request(t.app).get('/api/auth/me').set('Cookie', signedInCookie!).expect(200);
  });

  it('sets the cookie httpOnly and SameSite=Lax', async () => {
    const response = await request(t.app).get('/api/auth/csrf');
    const cookie = (response.headers['set-cookie'] as unknown as string[])[0];
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/); // only in production
  });
});

describe('CSRF', () => {
  it('refuses a mutation without the token with 403', async () => {
    const client = await signedInAs(t.app, 'admin');
    const response = await client.agent.post('/api/users/invitations').send({ email: 'x@tallowmere.test', name: 'X', roles: ['analyst'] });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe(errorCodes.csrf);
  });

  it('refuses a mutation with a wrong token with 403', async () => {
    const client = await signedInAs(t.app, 'admin');
    const response = await client.agent
      .patch('/api/users/2')
      .set('X-CSRF-Token', 'a'.repeat(256))
      .send({ name: 'Changed' });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe(errorCodes.csrf);
  });

  it('refuses a token from another session', async () => {
    const admin = await signedInAs(t.app, 'admin');
    const other = new TestClient(t.app);
    const foreign = await other.fetchCsrf();
    const response = await admin.agent.patch('/api/users/2').set('X-CSRF-Token', foreign).send({ name: 'Changed' });
    expect(response.status).toBe(403);
  });

  it('requires the token for sign-in too', async () => {
    const response = await request(t.app).post('/api/auth/login').send({ email: 'admin@tallowmere.test', password: 'scorecourt-demo' });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe(errorCodes.csrf);
  });

  it('gives a new token at sign-in and the old one stops working', async () => {
    const client = new TestClient(t.app);
    const old = await client.fetchCsrf();
    await client.signIn('admin@tallowmere.test');
    expect(client.csrf).not.toBe(old);
    const stale = await client.agent.patch('/api/users/2').set('X-CSRF-Token', old).send({ name: 'Priya Natarajan' });
    expect(stale.status).toBe(403);
    const fresh = await client.patch('/api/users/2', { name: 'Priya Natarajan' });
    expect(fresh.status).toBe(200);
  });
});

describe('sessions in SQLite', () => {
  it('survive a new app instance on the same database (a restart)', async () => {
    const client = await signedInAs(t.app, 'analyst');
    const cookie = client.sessionCookie(await client.get('/api/auth/me').expect(200));
    expect(cookie).not.toBeNull();
    const { createApp, closeApp } = await import('@server/app');
    const restarted = createApp({ config: t.config, dataSource: t.dataSource, mailer: t.mailer, sessionSecret: 'test-secret-that-is-long-enough-for-sessions' });
    const me = await request(restarted).get('/api/auth/me').set('Cookie', cookie!);
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('analyst@tallowmere.test');
    closeApp(restarted);
  });
});
