import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPassword } from '@server/seed';
import { onPostgres } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient } from './helpers/client';

/**
 * Two server instances on one PostgreSQL database, as behind a load balancer without sticky
 * sessions: a person signed in through one is signed in on the other, a CSRF token handed out by
 * one is accepted by the other, failed sign-ins spread over both count together, and so do the
 * changes counted against a budget per minute (WRITES_PER_MINUTE).
 */

let a: TestApp;
let b: TestApp;

describe.runIf(onPostgres)('two instances on one database', () => {
  beforeAll(async () => {
    a = await buildTestApp();
    b = await buildTestApp({ seed: false, config: { databaseUrl: a.config.databaseUrl } });
  });
  afterAll(async () => {
    await b?.close();
    await a?.close();
  });

  const cookieOf = (response: request.Response): string => {
    const cookies = response.headers['set-cookie'] as unknown as string[] | undefined;
    const cookie = cookies?.find((value) => value.startsWith('scorecourt.sid='));
    if (!cookie) throw new Error('no session cookie');
    return cookie.split(';')[0];
  };

  it('signs in through one instance and reads through the other, with a token the first handed out', async () => {
    // The token comes from instance A, the sign-in goes to instance B.
    const csrf = await request(a.app).get('/api/auth/csrf').expect(200);
    const anonymous = cookieOf(csrf);
    const signIn = await request(b.app)
      .post('/api/auth/login')
      .set('Cookie', anonymous)
      .set('X-CSRF-Token', (csrf.body as { token: string }).token)
      .send({ email: 'analyst@tallowmere.test', password: demoPassword });
    expect(signIn.status, JSON.stringify(signIn.body)).toBe(200);
    const session = cookieOf(signIn);
    const me = await request(a.app).get('/api/auth/me').set('Cookie', session).expect(200);
    expect((me.body as { user: { email: string } }).user.email).toBe('analyst@tallowmere.test');
    // Signing out through A ends the session on B as well.
    const token = signIn.headers['x-csrf-token'] as string;
    expect((await request(a.app).post('/api/auth/logout').set('Cookie', session).set('X-CSRF-Token', token)).status).toBeLessThan(300);
    expect((await request(b.app).get('/api/auth/me').set('Cookie', session)).status).toBe(401);
  });

  it('locks an account after ten failed sign-ins spread over both instances', async () => {
    const clients = [new TestClient(a.app), new TestClient(b.app)];
    for (let i = 0; i < 10; i++) {
      const failed = await clients[i % 2].signIn('policy@tallowmere.test', 'not the password');
      expect(failed.status, `attempt ${i + 1}`).toBe(401);
    }
    // Five failures each: either alone would still let the eleventh through.
    for (const client of clients) {
      const refused = await client.signIn('policy@tallowmere.test');
      expect(refused.status).toBe(429);
      expect((refused.body as { error: { code: string } }).error.code).toBe('rate_limited');
    }
  });

  it('counts changes against one budget per minute over both instances', async () => {
    const [c, d] = await Promise.all(
      [0, 1].map(() => buildTestApp({ seed: false, config: { databaseUrl: a.config.databaseUrl, writesPerMinute: 6 } })),
    );
    try {
      // Only these requests count (the tests above were changes from the same address).
      await a.dataSource.query(`DELETE FROM "rate_limit_hits" WHERE "key" LIKE 'writes:%'`);
      const clients = [new TestClient(c.app), new TestClient(d.app)];
      const statuses: number[] = [];
      for (let i = 0; i < 8; i++) statuses.push((await clients[i % 2].post('/api/auth/logout', {})).status);
      // Six fit the shared budget; either instance alone would have let all eight through.
      expect(statuses.slice(0, 6)).not.toContain(429);
      expect(statuses.slice(6)).toEqual([429, 429]);
    } finally {
      await d.close();
      await c.close();
    }
  });
});
