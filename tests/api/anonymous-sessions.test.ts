import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { onPostgres } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient } from './helpers/client';

/** Asking for a CSRF token without signing in stores nothing on disk; signing in still works. */

let t: TestApp;
beforeAll(async () => {
  t = await buildTestApp();
});
afterAll(async () => {
  await t.close();
});

// COUNT(*) is a number on SQLite, a bigint (read as a string) on PostgreSQL.
const rows = async () => Number(((await t.dataSource.query('SELECT COUNT(*) AS n FROM "sessions"')) as { n: number | string }[])[0].n);

describe('anonymous CSRF tokens', () => {
  // SQLite only: on PostgreSQL several instances must know the token, so it is stored (tests/api/two-instances.test.ts).
  it.skipIf(onPostgres)('store no session row, however many are asked for, and a token still lets its holder sign in (SQLite only: on PostgreSQL every instance must know the token, so it is stored)', async () => {
    const before = await rows();
    for (let i = 0; i < 300; i++) await request(t.app).get('/api/auth/csrf').expect(200);
    expect(await rows()).toBe(before);

    const client = new TestClient(t.app);
    await client.fetchCsrf();
    expect(await rows()).toBe(before);
    expect((await client.signIn('analyst@tallowmere.test')).status).toBe(200);
    // Signed in: now the session is stored.
    expect(await rows()).toBe(before + 1);
    expect((await client.get('/api/auth/me')).status).toBe(200);
  });
});
