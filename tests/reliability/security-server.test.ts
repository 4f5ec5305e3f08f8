import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '@server/auth/password';
import { openDatabase } from '@server/db/data-source';
import { User } from '@server/db/entities/index';
import { projectRoot } from '@server/runtime';
import { inspect, uploadLeftovers } from './helpers/db';
import { record } from './helpers/figures';
import { sampleMapping, validHoldout } from './helpers/holdouts';
import { type CompiledServer, startCompiled, startExpectingExit } from './helpers/server';
import { Session } from './helpers/session';

/**
 * Security of the compiled server as it runs (`node dist/server/index.js`): its headers on every
 * kind of response, production start-up (SESSION_SECRET required, secure cookies, HSTS), session
 * fixation and forged cookies, the sign-in rate limit, one-time links (reuse, expiry, stored
 * only as hashes) and the upload limit (413, the partial file removed).
 */

describe('security headers on every kind of response', () => {
  let server: CompiledServer;
  beforeAll(async () => {
    server = await startCompiled({ env: { SERVE_CLIENT: 'true' } });
  });
  afterAll(async () => server?.stop());

  it('sends CSP (own scripts only, no framing), nosniff, Referrer-Policy and no X-Powered-By on API answers, errors, downloads, pages and assets', async () => {
    const session = await new Session(server.url).signIn('modeler@tallowmere.test');
    const upload = await session.upload(Buffer.from(validHoldout(200)));
    const created = await session.request<{ id: number }>('POST', '/api/comparisons', { name: 'Headers', holdoutId: upload.body.id, mapping: sampleMapping, settings: { bootstrap: 0 } });
    for (let i = 0; i < 100 && (await session.request<{ state: string }>('GET', `/api/comparisons/${created.body.id}`)).body.state !== 'analysed'; i++) await new Promise((resolve) => setTimeout(resolve, 100));
    const assets = readdirSync(join(projectRoot, 'dist/client/assets')).filter((name) => name.endsWith('.js'));
    expect(assets.length).toBeGreaterThan(0);
    const targets: [string, string, Record<string, string>][] = [
      ['API JSON', '/api/health', {}],
      ['API error (401)', '/api/auth/me', {}],
      ['API error (404)', '/api/nothing-here', {}],
      ['a download', `/api/comparisons/${created.body.id}/export/report.json`, { cookie: session.cookie }],
      ['a CSV download', `/api/comparisons/${created.body.id}/export/bands.csv`, { cookie: session.cookie }],
      ['the client page', '/', {}],
      ['a client route', `/comparisons/${created.body.id}/report`, {}],
      ['a script', `/assets/${assets[0]}`, {}],
      ['a missing asset', '/assets/missing.js', {}],
    ];
    const seen: Record<string, number> = {};
    for (const [what, path, headers] of targets) {
      const response = await fetch(`${server.url}${path}`, { headers });
      seen[what] = response.status;
      const csp = response.headers.get('content-security-policy') ?? '';
      expect(csp, what).toContain("default-src 'self'");
      expect(csp, what).toContain("script-src 'self'");
      expect(csp, what).toContain("frame-ancestors 'none'");
      expect(csp, what).toContain("object-src 'none'");
      expect(csp, what).not.toMatch(/unsafe-inline|unsafe-eval|\*/);
      expect(response.headers.get('x-content-type-options'), what).toBe('nosniff');
      expect(response.headers.get('referrer-policy'), what).toBe('no-referrer');
      expect(response.headers.get('x-frame-options'), what).toBe('SAMEORIGIN');
      expect(response.headers.get('cross-origin-opener-policy'), what).toBe('same-origin');
      expect(response.headers.get('x-powered-by'), what).toBeNull();
      expect(response.headers.get('server'), what).toBeNull();
      expect(response.headers.get('strict-transport-security'), `${what}: HSTS only in production`).toBeNull();
      if (path.startsWith('/api/')) expect(response.headers.get('content-type'), what).toMatch(path.endsWith('.csv') ? /^text\/csv/ : /^application\/json/);
      if (path.includes('/export/')) expect(response.headers.get('content-disposition'), what).toMatch(/^attachment; filename="comparison-\d+-headers-/);
    }
    expect(seen).toMatchObject({ 'API JSON': 200, 'API error (401)': 401, 'API error (404)': 404, 'a download': 200, 'the client page': 200, 'a client route': 200, 'a script': 200, 'a missing asset': 404 });
    record('security: headers', { responsesChecked: targets.length, statuses: seen });
  });
});

describe('production start-up', () => {
  it('refuses to start without SESSION_SECRET, or with a short one or a low bcrypt cost, naming the variable — no stack trace', async () => {
    const cases: [Record<string, string>, RegExp][] = [
      [{ NODE_ENV: 'production', BCRYPT_COST: '12', SESSION_SECRET: '' }, /SESSION_SECRET: required when NODE_ENV=production/],
      [{ NODE_ENV: 'production', BCRYPT_COST: '12', SESSION_SECRET: 'too-short' }, /SESSION_SECRET: use at least 32 characters/],
      [{ NODE_ENV: 'production', BCRYPT_COST: '4', SESSION_SECRET: 's'.repeat(40) }, /BCRYPT_COST: must be at least 12 when NODE_ENV=production/],
    ];
    for (const [env, message] of cases) {
      const result = await startExpectingExit(env);
      expect(result.code, result.output).toBe(1);
      expect(result.output).toMatch(message);
      expect(result.output).toMatch(/^Configuration error:/m);
      expect(result.output).not.toMatch(/\bat .+:\d+:\d+|node:internal|Scorecourt is running/);
      expect(result.ms).toBeLessThan(10_000);
    }
  });

  describe('running in production behind a TLS proxy', () => {
    let server: CompiledServer;
    let dir: string;
    const email = 'risk.lead@tallowmere.test';
    const password = 'a-production-password-1';

    beforeAll(async () => {
      // Production adds no demo people: one person is put in the database first.
      dir = mkdtempSync(join(tmpdir(), 'scorecourt-production-'));
      const dataSource = await openDatabase(join(dir, 'scorecourt.sqlite'));
      const users = dataSource.getRepository(User);
      await users.save(users.create({ email, name: 'Risk Lead', roles: ['admin'], active: true, passwordHash: await hashPassword(password, 12), createdAt: new Date() }));
      await dataSource.destroy();
      server = await startCompiled({ dir, env: { NODE_ENV: 'production', BCRYPT_COST: '12', SESSION_SECRET: 'a-production-session-secret-of-40-chars!', TRUST_PROXY: 'loopback' } });
    }, 60_000);
    afterAll(async () => {
      await server?.stop();
      rmSync(dir, { recursive: true, force: true });
    });

    it('marks the session cookie Secure, HttpOnly and SameSite=Lax over HTTPS, sends none over plain HTTP, and sends HSTS', async () => {
      const https = { 'X-Forwarded-Proto': 'https' };
      const csrf = await fetch(`${server.url}/api/auth/csrf`, { headers: https });
      const cookie = csrf.headers.getSetCookie().find((value) => value.startsWith('scorecourt.sid='))!;
      expect(cookie).toMatch(/; Secure/);
      expect(cookie).toMatch(/; HttpOnly/);
      expect(cookie).toMatch(/; SameSite=Lax/);
      expect(csrf.headers.get('strict-transport-security')).toMatch(/max-age=\d+/);
      const token = ((await csrf.json()) as { token: string }).token;
      const login = await fetch(`${server.url}/api/auth/login`, {
        method: 'POST',
        headers: { ...https, Cookie: cookie.split(';')[0], 'X-CSRF-Token': token, 'Content-Type': 'application/json' },
        body: JSON.stringify({ email, password }),
      });
      expect(login.status).toBe(200);
      const signedIn = login.headers.getSetCookie().find((value) => value.startsWith('scorecourt.sid='))!;
      expect(signedIn).toMatch(/; Secure/);
      expect((await fetch(`${server.url}/api/auth/me`, { headers: { ...https, Cookie: signedIn.split(';')[0] } })).status).toBe(200);
      // Over plain HTTP the server sets no cookie at all.
      const plain = await fetch(`${server.url}/api/auth/csrf`);
      expect(plain.headers.getSetCookie()).toEqual([]);
      // No demo people in production.
      expect(server.output()).not.toMatch(/Demo sign-ins/);
    });
  });
});

describe('sessions, sign-in limit and one-time links on the running server', () => {
  let server: CompiledServer;
  beforeAll(async () => {
    server = await startCompiled({ env: { UPLOAD_LIMIT_MB: '1' } });
  });
  afterAll(async () => server?.stop());

  it('gives a new session at sign-in: the cookie from before, a forged one and a signed-out one are not signed in', async () => {
    const session = new Session(server.url);
    await session.token();
    const before = session.cookie;
    expect(before).toMatch(/^scorecourt\.sid=/);
    await session.signIn('analyst@tallowmere.test');
    expect(session.cookie).not.toBe(before);
    const me = (cookie: string) => fetch(`${server.url}/api/auth/me`, { headers: { Cookie: cookie } }).then((response) => response.status);
    expect(await me(before)).toBe(401);
    expect(await me(session.cookie)).toBe(200);
    // A cookie with another value or a tampered signature.
    const [name, value] = session.cookie.split('=');
    const forged = `${name}=${encodeURIComponent(`s:${'A'.repeat(32)}.${'B'.repeat(43)}`)}`;
    const tampered = `${name}=${value.slice(0, -3)}xyz`;
    expect(await me(forged)).toBe(401);
    expect(await me(tampered)).toBe(401);
    const signedIn = session.cookie;
    expect((await session.request('POST', '/api/auth/logout')).status).toBe(200);
    expect(await me(signedIn)).toBe(401);
  });

  it('blocks an account after 10 failed sign-ins from one address, however the e-mail is written, and not the others', async () => {
    const attempt = async (email: string, password: string) => {
      const session = new Session(server.url);
      return (await session.request('POST', '/api/auth/login', { email, password })).status;
    };
    const spellings = ['policy@tallowmere.test', 'POLICY@tallowmere.test', ' Policy@Tallowmere.Test '];
    const statuses: number[] = [];
    for (let i = 0; i < 10; i++) statuses.push(await attempt(spellings[i % spellings.length], `wrong-${i}`));
    expect(statuses).toEqual(Array(10).fill(401));
    expect(await attempt('policy@tallowmere.test', 'scorecourt-demo')).toBe(429);
    expect(await attempt('POLICY@TALLOWMERE.TEST', 'scorecourt-demo')).toBe(429);
    expect(await attempt('committee@tallowmere.test', 'scorecourt-demo')).toBe(200);
  });

  it('uses a password-reset link once, refuses it used or expired, and keeps only its hash', async () => {
    const admin = await new Session(server.url).signIn('admin@tallowmere.test');
    const linkFor = async (email: string): Promise<string> => {
      expect((await new Session(server.url).request('POST', '/api/auth/password-reset', { email })).status).toBe(202);
      for (let i = 0; i < 100; i++) {
        const { body } = await admin.request<{ messages: { to: string[]; text: string }[] }>('GET', '/api/outbox');
        const mail = body.messages.find((message) => message.to.includes(email) && /\/accept\//.test(message.text));
        if (mail) return /\/accept\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
        await new Promise((resolve) => setTimeout(resolve, 50));
      }
      throw new Error('no reset mail');
    };
    const token = await linkFor('committee2@tallowmere.test');
    const accept = (value: string) => new Session(server.url).request('POST', `/api/auth/tokens/${value}/accept`, { password: 'a-new-password-42' });
    expect((await accept(token)).status).toBe(200);
    const again = await accept(token);
    expect(again.status).toBe(410);
    expect((again.body as { error: { code: string } }).error.code).toBe('link_used');

    const second = await linkFor('analyst@tallowmere.test');
    // The database keeps the SHA-256 only; an hour later (moved back here) the link has expired.
    const db = new Database(server.databasePath);
    const stored = db.prepare('SELECT * FROM "one_time_tokens"').all() as Record<string, unknown>[];
    expect(JSON.stringify(stored)).not.toContain(second);
    expect(JSON.stringify(stored)).not.toContain(token);
    db.prepare(`UPDATE "one_time_tokens" SET "expiresAt" = datetime('now', '-1 minute') WHERE "usedAt" IS NULL`).run();
    db.close();
    const expired = await accept(second);
    expect(expired.status).toBe(410);
    expect((expired.body as { error: { code: string } }).error.code).toBe('link_expired');
    expect((await new Session(server.url).request('GET', `/api/auth/tokens/${'x'.repeat(43)}`)).status).toBe(404);
  });

  it('answers a file over UPLOAD_LIMIT_MB with 413 and removes what it had received', async () => {
    const session = await new Session(server.url).signIn('modeler@tallowmere.test');
    const before = inspect(server.databasePath).counts;
    const big = Buffer.from(validHoldout(400).repeat(60)); // about 1.3 MB, over the 1 MB limit
    const response = await session.upload(big);
    expect(response.status).toBe(413);
    expect(response.body).toMatchObject({ error: { code: 'payload_too_large', message: 'The file is larger than the upload limit.' } });
    expect(uploadLeftovers(server.uploadDir)).toEqual([]);
    const after = inspect(server.databasePath).counts;
    expect({ ...after, sessions: 0, audit_events: 0 }).toEqual({ ...before, sessions: 0, audit_events: 0 });
    expect(after.holdouts).toBe(before.holdouts);
    // A file under the limit still goes through.
    expect((await session.upload(Buffer.from(validHoldout(300)))).status).toBe(201);
    record('security: upload limit', { limitMb: 1, sentBytes: big.length, status: response.status });
  });
});
