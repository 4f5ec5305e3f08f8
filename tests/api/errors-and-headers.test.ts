import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { apiErrorSchema, errorCodes } from '@shared/errors';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeApp, createApp } from '@server/app';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient, signedInAs } from './helpers/client';

let t: TestApp;
beforeAll(async () => {
  t = await buildTestApp();
});
afterAll(async () => {
  await t.close();
});

describe('health', () => {
  it('answers { ok: true } without signing in', async () => {
    const response = await request(t.app).get('/api/health').expect(200);
    expect(response.body).toEqual({ ok: true });
  });
});

describe('caching', () => {
  it('marks every API answer no-store: successes, errors and unknown routes', async () => {
    const client = await signedInAs(t.app, 'analyst');
    const answers = { health: await request(t.app).get('/api/health'), list: await client.get('/api/comparisons'), me: await request(t.app).get('/api/auth/me'), unknown: await request(t.app).get('/api/nothing') };
    for (const [name, response] of Object.entries(answers)) expect(response.headers['cache-control'], name).toBe('no-store');
  });
});

describe('error shape', () => {
  it('answers an unknown API route with JSON 404, for GET and for mutations', async () => {
    const get = await request(t.app).get('/api/no-such-thing?x=1').expect(404);
    expect(apiErrorSchema.parse(get.body).error).toEqual({ code: errorCodes.notFound, message: 'There is no API route GET /api/no-such-thing.' });
    const post = await new TestClient(t.app).post('/api/no-such-thing', {});
    expect(post.status).toBe(404);
    expect(post.headers['content-type']).toMatch(/application\/json/);
  });

  it('answers a malformed percent-encoding in a path parameter with 400, not 500', async () => {
    const client = await signedInAs(t.app, 'analyst');
    for (const path of ['/api/comparisons/%E0%A4%A', '/api/comparisons/%', '/api/auth/tokens/%ZZ']) {
      const response = await client.get(path);
      expect(response.status, path).toBe(400);
      expect(apiErrorSchema.parse(response.body).error.code).toBe(errorCodes.badInput);
      expect(response.body.error.message).toMatch(/malformed percent-encoding/);
    }
  });

  it('shortens a long unknown path in its 404 message', async () => {
    const response = await request(t.app).get(`/api/${'a'.repeat(5000)}`).expect(404);
    expect(response.body.error.message.length).toBeLessThan(200);
    expect(response.body.error.message).toMatch(/^There is no API route GET \/api\/a+…\.$/);
  });

  it('answers a malformed JSON body with 400 bad_input', async () => {
    const client = new TestClient(t.app);
    const token = await client.fetchCsrf();
    const response = await client.agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', token)
      .set('Content-Type', 'application/json')
      .send('{"email": "admin@tallowmere.test", "password": ');
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe(errorCodes.badInput);
  });

  it('answers an oversized JSON body with 413', async () => {
    const client = new TestClient(t.app);
    const response = await client.post('/api/auth/password-reset', { email: 'x@tallowmere.test', padding: 'x'.repeat(1_100_000) });
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe(errorCodes.tooLarge);
  });

  it('never sends a stack trace or SQL in a 500', async () => {
    const client = await signedInAs(t.app, 'admin');
    // Break the database under the running app: every signed-in request now fails in SQL.
    await t.dataSource.query('ALTER TABLE users RENAME TO users_moved');
    try {
      const response = await client.get('/api/users');
      expect(response.status).toBe(500);
      const body = apiErrorSchema.parse(response.body);
      expect(body.error.code).toBe(errorCodes.internal);
      const text = JSON.stringify(response.body);
      for (const leak of [/SQLITE/i, /no such table/i, /SELECT/i, /users/, /\bat .*\.ts:\d+/, /node_modules/, /QueryFailedError/]) {
        expect(text).not.toMatch(leak);
      }
      expect(body.error.details).toEqual({ requestId: response.headers['x-request-id'] });
    } finally {
      await t.dataSource.query('ALTER TABLE users_moved RENAME TO users');
    }
  });
});

describe('security headers', () => {
  it('sends helmet headers and a CSP that allows only our own scripts, styles, fonts and images', async () => {
    const response = await request(t.app).get('/api/health');
    const csp = response.headers['content-security-policy'];
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("style-src 'self'");
    expect(csp).toContain("font-src 'self'");
    expect(csp).toContain("img-src 'self' data:");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval|https:/);
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    expect(response.headers['x-powered-by']).toBeUndefined();
    expect(response.headers['strict-transport-security']).toBeUndefined(); // production only
  });
});

describe('the built client', () => {
  let clientDir: string;
  beforeAll(() => {
    clientDir = mkdtempSync(join(tmpdir(), 'scorecourt-client-'));
  });
  afterAll(() => rmSync(clientDir, { recursive: true, force: true }));

  it('is replaced by a plain message saying how to build it when dist/client is missing', async () => {
    const app = createApp({ config: t.config, dataSource: t.dataSource, mailer: t.mailer, sessionSecret: 'x'.repeat(40), clientDir: join(clientDir, 'missing') });
    const response = await request(app).get('/comparisons/12');
    expect(response.status).toBe(503);
    expect(response.headers['content-type']).toMatch(/text\/plain/);
    expect(response.text).toContain('npm run build');
    closeApp(app);
  });

  it('is served with a fallback to index.html for client routes, and /api stays JSON', async () => {
    mkdirSync(join(clientDir, 'assets'), { recursive: true });
    writeFileSync(join(clientDir, 'index.html'), '<!doctype html><title>Scorecourt</title><div id="root"></div>');
    writeFileSync(join(clientDir, 'assets', 'app-abc123.js'), 'console.log(1)');
    const app = createApp({ config: t.config, dataSource: t.dataSource, mailer: t.mailer, sessionSecret: 'x'.repeat(40), clientDir });
    const page = await request(app).get('/admin/people').expect(200);
    expect(page.text).toContain('<div id="root">');
    const asset = await request(app).get('/assets/app-abc123.js').expect(200);
    expect(asset.headers['cache-control']).toContain('immutable');
    await request(app).get('/assets/missing.js').expect(404); // a missing asset is not the client's HTML
    const api = await request(app).get('/api/missing').expect(404);
    expect(api.body.error.code).toBe(errorCodes.notFound);
    closeApp(app);
  });
});
