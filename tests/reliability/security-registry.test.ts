import { readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { apiErrorSchema, errorCodes } from '@shared/errors';
import type { ColumnMapping } from '@shared/report';
import type { Role } from '@shared/roles';
import Papa from 'papaparse';
import type request from 'supertest';
import type { z } from 'zod';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeTable } from '@server/app';
import type { RouteDefinition } from '@server/http/routes';
import { buildTestApp, type TestApp } from '../api/helpers/app';
import { TestClient, signedInAs } from '../api/helpers/client';
import { personWith } from '../api/helpers/governance';
import { sample2k, sampleMapping, uploadFile } from '../api/helpers/holdouts';
import { tables, uploadLeftovers } from './helpers/db';
import { record } from './helpers/figures';
import { messageProblems } from './helpers/outcomes';

/**
 * Security checks generated from the route registry (`routeTable(app)`), so a new route is covered
 * or fails here until it is described:
 * - CSRF: every POST, PUT, PATCH and DELETE without the token, with a wrong one, or with another
 *   session's → 403, and nothing changes (every table's row count, the upload folder).
 * - Object-level rules: every route with a parameter is listed with the rules its handler must
 *   enforce beyond the role (the object exists → 404; four-eyes → 403; the state → 409; a finished
 *   analysis → 409; not on yourself → 409; swap-set notes need the policy role → 403), and each
 *   rule is called against a real database, changing nothing when refused.
 * - Bad parameters (1e999, -1, abc, unicode, bad percent-encoding …) on every route with one, and
 *   malformed, oversized, deeply nested and prototype-polluting JSON on every route with a body:
 *   a 4xx in the error shape, never a stack trace or SQL.
 * - Markup in every free-text field (found by walking the routes' zod body schemas): stored and
 *   returned verbatim as JSON.
 * - Formula injection in every CSV export (every route ending in .csv), every text column.
 * - Upload file names with path traversal, NUL, control characters or 10,000 characters: stored
 *   sanitised, and nothing written outside the upload folder.
 */

let t: TestApp;
let owner: TestClient; // created every comparison and uploaded its holdout; holds every role
let other: TestClient; // holds every role too, created nothing
let otherId: number;
let ownerId: number;
let holdoutId: number;
const inState = new Map<string, number>();
const routeKey = (route: RouteDefinition) => `${route.method.toUpperCase()} ${route.path}`;
const everyRole: Role[] = ['admin', 'modeler', 'analyst', 'policy', 'committee'];

async function ok(response: Promise<request.Response>, status = 200): Promise<request.Response> {
  const answered = await response;
  expect(answered.status, JSON.stringify(answered.body)).toBe(status);
  return answered;
}

async function send(client: TestClient, method: string, path: string, body?: unknown): Promise<request.Response> {
  if (method === 'GET') return client.get(path);
  return client.send(method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete', path, body ?? {});
}

async function counts(): Promise<Record<string, number>> {
  const found: Record<string, number> = {};
  for (const table of tables) {
    if (table === 'sessions') continue; // a request may renew a session
    const [{ n }] = (await t.dataSource.query(`SELECT COUNT(*) AS n FROM "${table}"`)) as { n: number }[];
    found[table] = n;
  }
  return found;
}

beforeAll(async () => {
  // Far more changes a minute than a person makes: this suite sends hundreds of writes in a burst.
  t = await buildTestApp({ config: { writesPerMinute: 1_000_000 } });
  const a = await personWith(t, 'owner@tallowmere.test', everyRole);
  const b = await personWith(t, 'other@tallowmere.test', everyRole);
  owner = a.client;
  other = b.client;
  ownerId = a.user.id;
  otherId = b.user.id;
  holdoutId = (await ok(uploadFile(owner, sample2k(), 'sample-2k.csv'), 201)).body.id;
  const create = async (state: string, withMapping: boolean) =>
    (await ok(owner.post('/api/comparisons', { name: `State ${state}`, holdoutId, ...(withMapping ? { mapping: sampleMapping, settings: { bootstrap: 0 } } : {}) }), 201)).body.id as number;
  for (const state of ['draft', 'analysed', 'in-review', 'validated', 'returned', 'decided']) inState.set(state, await create(state, state !== 'draft'));
  await t.jobs.whenIdle();
  for (const state of ['in-review', 'validated', 'returned', 'decided']) {
    const id = inState.get(state)!;
    await ok(owner.post(`/api/comparisons/${id}/submit`, {}));
    if (state === 'in-review') continue;
    await ok(other.post(`/api/comparisons/${id}/review`, { outcome: state === 'returned' ? 'returned' : 'validated', findings: 'Set-up.' }));
    // No votes yet (the default quorum is two): a decision without quorum needs the explicit
    // acknowledgement and a rationale of real length.
    if (state === 'decided') {
      await ok(
        other.post(`/api/comparisons/${id}/decision`, {
          outcome: 'defer',
          acknowledgeAgainstRecord: true,
          rationale: 'Set-up for the security checks: deferred without votes, acknowledged as against the record on purpose.',
        }),
      );
    }
  }
  for (const [state, id] of inState) expect((await owner.get(`/api/comparisons/${id}`)).body.state, `comparison in ${state}`).toBe(state);
}, 90_000);
afterAll(async () => {
  await t?.close();
});

describe('CSRF on every mutating route of the registry', () => {
  it('refuses each POST, PUT, PATCH and DELETE without the token, with a wrong one and with another session’s, changing nothing', async () => {
    const mutating = routeTable(t.app).filter((route) => route.method !== 'get');
    expect(mutating.length).toBeGreaterThan(15);
    const anonymous = new TestClient(t.app);
    const anonymousToken = await anonymous.fetchCsrf();
    const signedIn = await signedInAs(t.app, 'admin');
    const failures: string[] = [];
    const before = await counts();
    for (const route of mutating) {
      const path = `/api${route.path.replace(/:(\w+)/g, (_m, name: string) => (name === 'id' ? String(inState.get('analysed')) : 'x'.repeat(43)))}`;
      for (const [who, client, token] of [
        ['anonymous, no token', anonymous, null],
        ['signed in, no token', other, null],
        ['signed in, wrong token', other, 'not-the-token'],
        ['signed in, another session’s token', other, anonymousToken],
        ['signed in as admin, another session’s token', signedIn, anonymousToken],
      ] as const) {
        let call = client.agent[route.method](path);
        if (token !== null) call = call.set('X-CSRF-Token', token);
        const response = route.path === '/holdouts' ? await call.attach('file', sample2k(), 'sample.csv') : await call.send({});
        if (response.status !== 403 || response.body?.error?.code !== errorCodes.csrf) failures.push(`${routeKey(route)} as ${who}: ${response.status} ${JSON.stringify(response.body).slice(0, 120)}`);
      }
    }
    expect(failures).toEqual([]);
    expect(await counts()).toEqual(before);
    expect(uploadLeftovers(join(t.directory, 'uploads'))).toEqual([]);
    record('security: CSRF', { mutatingRoutes: mutating.length, callsRefused: mutating.length * 5 });
  });
});

type Rule = 'exists' | 'four-eyes' | 'done-run' | 'not-self' | 'anchor-role' | { state: string[] };

/**
 * Every route with a parameter, with a body that passes validation (so the handler's own rules
 * are reached) and the rules its handler must enforce beyond the role. A new route with a
 * parameter fails the first test below until it is listed here.
 */
const objectRules: Record<string, { body?: unknown; rules: Rule[] }> = {
  'GET /auth/tokens/:token': { rules: ['exists'] },
  'POST /auth/tokens/:token/accept': { body: { password: 'a-long-enough-password-1' }, rules: ['exists'] },
  'PATCH /users/:id': { body: { name: 'Renamed' }, rules: ['exists', 'not-self'] },
  'GET /holdouts/:id': { rules: ['exists'] },
  'POST /holdouts/:id/validate': { body: { mapping: sampleMapping }, rules: ['exists'] },
  'PUT /comparisons/:id/setup': { body: { mapping: sampleMapping, settings: { bootstrap: 0 } }, rules: ['exists', { state: ['draft', 'analysed', 'returned'] }] },
  'GET /comparisons/:id': { rules: ['exists'] },
  'GET /comparisons/:id/report': { rules: ['exists', 'done-run'] },
  'POST /comparisons/:id/swap': { body: { approvalRate: 0.5 }, rules: ['exists', 'done-run'] },
  'POST /comparisons/:id/challengers/swap': { body: { approvalRate: 0.5 }, rules: ['exists', 'done-run'] },
  'POST /comparisons/:id/mixed-strategy': { body: { keepChampion: [{ column: 'channel', value: 'broker' }] }, rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/scenarios': { rules: ['exists'] },
  'POST /comparisons/:id/scenarios': { body: { name: 'Scenario', approvalRate: 0.5 }, rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/export/bands.csv': { rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/export/swap.csv': { rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/export/report.json': { rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/export/pack.pdf': { rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/export/workbook.xlsx': { rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/governance': { rules: ['exists'] },
  'POST /comparisons/:id/submit': { body: { message: '' }, rules: ['exists', { state: ['analysed', 'returned'] }] },
  'POST /comparisons/:id/review': { body: { outcome: 'validated', findings: 'Fine.' }, rules: ['exists', 'four-eyes', { state: ['in-review'] }] },
  'POST /comparisons/:id/votes': { body: { vote: 'adopt', comment: '' }, rules: ['exists', 'four-eyes', { state: ['validated'] }] },
  'POST /comparisons/:id/decision': { body: { outcome: 'keep', rationale: 'Not material.' }, rules: ['exists', 'four-eyes', { state: ['validated'] }] },
  'POST /comparisons/:id/verdicts': { rules: ['exists', 'done-run'] },
  'GET /comparisons/:id/audit': { rules: ['exists'] },
  'GET /comparisons/:id/evidence.json': { rules: ['exists'] },
  'GET /comparisons/:id/notes': { rules: ['exists'] },
  'POST /comparisons/:id/notes': { body: { body: 'A note.' }, rules: ['exists', 'anchor-role'] },
};

const withParams = () => routeTable(t.app).filter((route) => route.path.includes(':'));
const concrete = (route: RouteDefinition, id: number | string) => `/api${route.path.replace(/:(\w+)/g, () => String(id))}`;

describe('object-level rules of every route with a parameter', () => {
  it('lists every route with a parameter, and only those', () => {
    expect(withParams().map(routeKey).sort()).toEqual(Object.keys(objectRules).sort());
  });

  it('answers 404 for an object that does not exist, to someone holding every role', async () => {
    const failures: string[] = [];
    for (const route of withParams()) {
      const response = await send(other, route.method.toUpperCase(), concrete(route, route.path.includes(':token') ? 'x'.repeat(43) : 999_999), objectRules[routeKey(route)].body);
      if (response.status !== 404 || response.body?.error?.code !== errorCodes.notFound) failures.push(`${routeKey(route)}: ${response.status} ${JSON.stringify(response.body).slice(0, 150)}`);
    }
    expect(failures).toEqual([]);
  });

  it('enforces each route’s own rule: four-eyes, state, a finished analysis, not on yourself, the policy role for swap-set notes — changing nothing when refused', async () => {
    const failures: string[] = [];
    let checked = 0;
    const expectRefused = async (what: string, client: TestClient, method: string, path: string, body: unknown, status: number, message?: RegExp) => {
      checked++;
      const before = await counts();
      const response = await send(client, method, path, body);
      const after = await counts();
      if (response.status !== status) failures.push(`${what}: ${response.status}, want ${status}: ${JSON.stringify(response.body).slice(0, 200)}`);
      else if (message && !message.test(response.body?.error?.message ?? '')) failures.push(`${what}: message ${response.body?.error?.message}`);
      if (JSON.stringify(after) !== JSON.stringify(before)) failures.push(`${what}: a refused call changed rows`);
    };
    for (const route of withParams()) {
      const key = routeKey(route);
      const { body, rules } = objectRules[key];
      const method = route.method.toUpperCase();
      for (const rule of rules) {
        if (rule === 'exists') continue;
        if (rule === 'four-eyes') {
          const allowed = (rules.find((r) => typeof r === 'object') as { state: string[] }).state;
          await expectRefused(`${key} by the creator`, owner, method, concrete(route, inState.get(allowed[0])!), body, 403, /four-eyes/);
        } else if (rule === 'done-run') {
          await expectRefused(`${key} before any analysis`, other, method, concrete(route, inState.get('draft')!), body, 409, /no finished analysis/);
        } else if (rule === 'not-self') {
          await expectRefused(`${key} deactivating yourself`, other, method, concrete(route, otherId), { active: false }, 409, /your own account/);
          await expectRefused(`${key} dropping your own admin role`, other, method, concrete(route, otherId), { roles: ['modeler'] }, 409, /your own roles/);
        } else if (rule === 'anchor-role') {
          const analyst = await signedInAs(t.app, 'analyst');
          await expectRefused(`${key} on a swap set without the policy role`, analyst, method, concrete(route, inState.get('analysed')!), { body: 'Swap-in looks risky.', anchor: 'swap-in' }, 403, /credit policy role/);
        } else {
          for (const [state, id] of inState) {
            if (rule.state.includes(state)) continue;
            await expectRefused(`${key} in state ${state}`, other, method, concrete(route, id), body, 409, /^This comparison is /);
          }
        }
      }
    }
    expect(failures).toEqual([]);
    expect(checked).toBeGreaterThan(30);
    record('security: object-level rules', { routesWithParameters: withParams().length, refusalsChecked: checked });
  });

  it('still lets the same calls through where the rule allows them (the checks above are not blanket refusals)', async () => {
    await ok(other.patch(`/api/users/${ownerId}`, { name: 'Owner Renamed' }));
    await ok(other.post(`/api/comparisons/${inState.get('analysed')!}/notes`, { body: 'Swap-in looks fine.', anchor: 'swap-in' }), 201);
    await ok(other.get(`/api/comparisons/${inState.get('analysed')!}/report`));
    await ok(other.post(`/api/comparisons/${inState.get('validated')!}/votes`, { vote: 'adopt', comment: '' }));
  });
});

describe('bad parameters and bodies never reach a client as a stack trace or SQL', () => {
  const badIds = ['1e999', '-1', '0', 'abc', '1.5', '99999999999999999999', '0x10', '%E2%9C%93', '%C3%BC', '%00', '..%2F..%2Fetc%2Fpasswd', '9'.repeat(400), '%E0%A4%A', '%', 'null', 'undefined', '[]', '{}', 'NaN', 'Infinity', '1;DROP TABLE users', "1' OR '1'='1"];

  function leakProblems(what: string, response: request.Response): string[] {
    const problems: string[] = [];
    if (response.status >= 500) problems.push(`${what}: ${response.status}`);
    if (!/application\/json/.test(String(response.headers['content-type']))) problems.push(`${what}: not JSON (${response.headers['content-type']})`);
    const parsed = apiErrorSchema.safeParse(response.body);
    if (response.status >= 400 && !parsed.success) problems.push(`${what}: not the error shape: ${response.text.slice(0, 200)}`);
    const text = response.text;
    for (const leak of [/\bat .+:\d+:\d+/, /node_modules/, /SQLITE|QueryFailedError|SELECT |INSERT INTO|no such table/i, /TypeError|RangeError|SyntaxError:/, /\/work\/|\/server\//]) {
      if (leak.test(text)) problems.push(`${what}: leaks ${leak}: ${text.slice(0, 200)}`);
    }
    if (parsed.success && response.status >= 400) problems.push(...messageProblems(parsed.data.error.message).map((problem) => `${what}: ${problem}`));
    return problems;
  }

  it('answers every route with a parameter, given odd values for it, with a 4xx in the error shape', async () => {
    const failures: string[] = [];
    let calls = 0;
    for (const route of withParams()) {
      for (const value of badIds) {
        const path = `/api${route.path.replace(/:(\w+)/g, value)}`;
        const response = await send(other, route.method.toUpperCase(), path, objectRules[routeKey(route)].body);
        calls++;
        if (response.status < 400 || response.status >= 500) failures.push(`${routeKey(route)} with ${value}: ${response.status}`);
        failures.push(...leakProblems(`${routeKey(route)} with ${value}`, response));
      }
    }
    expect(failures).toEqual([]);
    record('security: bad parameters', { routes: withParams().length, values: badIds.length, calls });
  });

  it('answers malformed, oversized, deeply nested and prototype-polluting JSON on every route with a body with a 4xx', async () => {
    const failures: string[] = [];
    let calls = 0;
    const bodies: [string, string, number[]][] = [
      ['malformed JSON', '{"name": "x", ', [400]],
      ['a JSON string', '"just a string"', [400]],
      ['JSON null', 'null', [400]],
      ['over 1 MB', JSON.stringify({ name: 'x'.repeat(1_100_000) }), [413]],
      ['nested 200,000 deep', '['.repeat(200_000) + ']'.repeat(200_000), [400]],
      ['__proto__ and constructor keys', '{"__proto__": {"polluted": true}, "constructor": {"prototype": {"polluted": true}}, "name": "x"}', [400, 403, 404, 409]],
    ];
    const routes = routeTable(t.app).filter((route) => route.method !== 'get' && route.path !== '/holdouts' && route.path !== '/auth/logout');
    for (const route of routes) {
      const path = concrete(route, route.path.includes(':token') ? 'x'.repeat(43) : (inState.get('analysed') ?? 1));
      for (const [what, text, statuses] of bodies) {
        const token = other.csrf ?? (await other.fetchCsrf());
        const response = await other.agent[route.method](path).set('X-CSRF-Token', token).set('Content-Type', 'application/json').send(text);
        calls++;
        // A route without a body schema may accept anything; it must still not fail.
        const acceptable = statuses.includes(response.status) || (route.schemas.body === undefined && response.status < 500) || (what.startsWith('__proto__') && response.status < 500);
        if (!acceptable) failures.push(`${routeKey(route)} with ${what}: ${response.status} ${response.text.slice(0, 120)}`);
        if (response.status >= 400) failures.push(...leakProblems(`${routeKey(route)} with ${what}`, response));
      }
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(failures).toEqual([]);
    record('security: bad bodies', { routes: routes.length, kinds: bodies.length, calls });
  });

  it('answers unknown API paths with unicode, traversal and odd methods as JSON 404s', async () => {
    for (const path of ['/api/%E2%9C%93', '/api/comparisons/1/%2e%2e/%2e%2e/users', '/api/..%2Fsecret', '/api/' + 'a'.repeat(5000), '/api/comparisons/1/export/../../users']) {
      const response = await other.get(path);
      expect(response.status, path).toBe(404);
      expect(leakProblems(path, response)).toEqual([]);
    }
    const response = await other.agent.delete('/api/comparisons/1').set('X-CSRF-Token', other.csrf ?? (await other.fetchCsrf()));
    expect(response.status).toBe(404);
  });
});

/** String leaves of a zod schema, with their paths (`body.name`, `body.mapping.segments[]`). */
function stringLeaves(schema: z.ZodType | undefined, path: string, found: { path: string; pipe: boolean }[] = [], inPipe = false): { path: string; pipe: boolean }[] {
  if (!schema) return found;
  const def = (schema as unknown as { _zod: { def: Record<string, unknown> & { type: string } } })._zod.def;
  switch (def.type) {
    case 'string':
      found.push({ path, pipe: inPipe });
      break;
    case 'object':
      for (const [key, value] of Object.entries(def.shape as Record<string, z.ZodType>)) stringLeaves(value, `${path}.${key}`, found, inPipe);
      break;
    case 'optional':
    case 'nullable':
    case 'default':
    case 'prefault':
    case 'readonly':
    case 'catch':
      stringLeaves(def.innerType as z.ZodType, path, found, inPipe);
      break;
    case 'pipe':
      stringLeaves(def.in as z.ZodType, path, found, true);
      break;
    case 'array':
      stringLeaves(def.element as z.ZodType, `${path}[]`, found, inPipe);
      break;
    case 'union':
      for (const option of def.options as z.ZodType[]) stringLeaves(option, path, found, inPipe);
      break;
    default:
      break;
  }
  return found;
}

const markup = `<script>window.__xss=1</script><img src=x onerror="window.__xss=2">&amp; <b>"bold"</b> 'single' ${'\u202e'}txt.exe`;

describe('markup in every free-text field', () => {
  /**
   * Every string field of every route's body: free text is sent with markup and read back; the
   * rest is named with the reason it is not free text. A new string field fails until listed.
   */
  type ReadBack = (id: number) => Promise<unknown>;
  let scratch: number;
  const governanceOf = async (id: number) => (await other.get(`/api/comparisons/${id}/governance`)).body;
  const freeText: Record<string, { send: () => Promise<number>; read: ReadBack } | string> = {
    'POST /auth/login body.email': 'an e-mail address, validated',
    'POST /auth/login body.password': 'a password, never shown',
    'POST /auth/password-reset body.email': 'an e-mail address, validated',
    'POST /auth/tokens/:token/accept body.password': 'a password, never shown',
    'POST /users/invitations body.email': 'an e-mail address, validated',
    'POST /users/invitations body.name': {
      send: async () => (await ok(other.post('/api/users/invitations', { email: 'markup@tallowmere.test', name: markup.slice(0, 120), roles: ['policy'] }), 201)).body.user.id,
      read: async (id) => ((await other.get('/api/users')).body.users as { id: number; name: string }[]).find((user) => user.id === id)!.name,
    },
    'PATCH /users/:id body.name': {
      send: async () => (await ok(other.patch(`/api/users/${ownerId}`, { name: markup.slice(0, 120) }))).body.user.id,
      read: async (id) => ((await other.get('/api/users')).body.users as { id: number; name: string }[]).find((user) => user.id === id)!.name,
    },
    'POST /holdouts/:id/validate body.mapping.outcome': 'a column name of the file (its markup is checked through the file below)',
    'POST /holdouts/:id/validate body.mapping.badValue': 'a value of the file',
    'POST /holdouts/:id/validate body.mapping.champion': 'a column name of the file',
    'POST /holdouts/:id/validate body.mapping.challenger': 'a column name of the file',
    'POST /holdouts/:id/validate body.mapping.id': 'a column name of the file',
    'POST /holdouts/:id/validate body.mapping.segments[]': 'a column name of the file',
    'POST /holdouts/:id/validate body.mapping.exposure': 'a column name of the file',
    'POST /holdouts/:id/validate body.mapping.weight': 'a column name of the file',
    'POST /comparisons body.name': {
      send: async () => (scratch = (await ok(other.post('/api/comparisons', { name: markup, description: markup, holdoutId }), 201)).body.id),
      read: async (id) => (await other.get(`/api/comparisons/${id}`)).body.name,
    },
    'POST /comparisons body.description': { send: async () => scratch, read: async (id) => (await other.get(`/api/comparisons/${id}`)).body.description },
    'POST /comparisons/:id/scenarios body.name': {
      send: async () => (await ok(other.post(`/api/comparisons/${inState.get('analysed')!}/scenarios`, { name: markup, approvalRate: 0.6, note: markup }), 201)).body.id,
      read: async (id) => ((await other.get(`/api/comparisons/${inState.get('analysed')!}/scenarios`)).body.scenarios as { id: number; name: string }[]).find((s) => s.id === id)!.name,
    },
    'POST /comparisons/:id/scenarios body.note': {
      send: async () => ((await other.get(`/api/comparisons/${inState.get('analysed')!}/scenarios`)).body.scenarios as { id: number }[])[0].id,
      read: async (id) => ((await other.get(`/api/comparisons/${inState.get('analysed')!}/scenarios`)).body.scenarios as { id: number; note: string }[]).find((s) => s.id === id)!.note,
    },
    'POST /comparisons/:id/submit body.message': {
      send: async () => {
        const id = (await ok(owner.post('/api/comparisons', { name: 'Markup flow', holdoutId, mapping: sampleMapping, settings: { bootstrap: 0 } }), 201)).body.id;
        await t.jobs.whenIdle();
        await ok(owner.post(`/api/comparisons/${id}/submit`, { message: markup }));
        return id;
      },
      read: async (id) => ((await other.get(`/api/comparisons/${id}/audit`)).body.events as { action: string; details: { message?: string } }[]).find((e) => e.action === 'comparison.submitted')!.details.message,
    },
    'POST /comparisons/:id/review body.findings': {
      send: async () => {
        const id = (await ok(owner.get('/api/comparisons?q=Markup%20flow'))).body.items[0].id;
        await ok(other.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: markup }));
        return id;
      },
      read: async (id) => (await governanceOf(id)).reviews[0].findings,
    },
    'POST /comparisons/:id/votes body.comment': {
      send: async () => {
        const id = (await ok(owner.get('/api/comparisons?q=Markup%20flow'))).body.items[0].id;
        await ok(other.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: markup }));
        return id;
      },
      read: async (id) => (await governanceOf(id)).votes[0].comment,
    },
    'POST /comparisons/:id/decision body.rationale': {
      send: async () => {
        const id = (await ok(owner.get('/api/comparisons?q=Markup%20flow'))).body.items[0].id;
        // One vote of two: the decision is acknowledged as without quorum, the markup (over 80 characters) as its rationale.
        await ok(other.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', acknowledgeAgainstRecord: true, rationale: markup, conditions: markup }));
        return id;
      },
      read: async (id) => (await governanceOf(id)).decision.rationale,
    },
    'POST /comparisons/:id/decision body.conditions': {
      send: async () => (await ok(owner.get('/api/comparisons?q=Markup%20flow'))).body.items[0].id,
      read: async (id) => (await governanceOf(id)).decision.conditions,
    },
    'POST /comparisons/:id/decision body.effectiveDate': 'an ISO date, validated',
    'POST /comparisons/:id/decision body.strategy.keepChampion[].column': 'a segment column of the file, checked against the holdout (400 naming it otherwise)',
    'POST /comparisons/:id/decision body.strategy.keepChampion[].value': 'a segment value of the file, checked against the holdout (400 naming it otherwise)',
    'POST /comparisons/:id/mixed-strategy body.keepChampion[].column': 'a segment column of the file, checked against the holdout (400 naming it otherwise)',
    'POST /comparisons/:id/mixed-strategy body.keepChampion[].value': 'a segment value of the file, checked against the holdout (400 naming it otherwise)',
    'POST /comparisons/:id/notes body.body': {
      send: async () => (await ok(other.post(`/api/comparisons/${inState.get('analysed')!}/notes`, { body: markup }), 201)).body.id,
      read: async (id) => ((await other.get(`/api/comparisons/${inState.get('analysed')!}/notes`)).body.notes as { id: number; body: string }[]).find((n) => n.id === id)!.body,
    },
    'PUT /policy body.reason': {
      send: async () => {
        const current = (await other.get('/api/policy')).body;
        const { version: _version, ...fields } = current.policy ?? current;
        return (await ok(other.send('put', '/api/policy', { ...fields, reason: markup }))).body.policy?.version ?? 0;
      },
      read: async () => ((await other.get('/api/policy/versions')).body.versions as { reason: string }[])[0].reason,
    },
  };
  for (const kind of ['POST /comparisons', 'PUT /comparisons/:id/setup']) {
    for (const field of ['outcome', 'badValue', 'champion', 'challenger', 'id', 'segments[]', 'exposure', 'weight', 'inferredBad', 'unknownValues[]', 'period', 'grades.champion', 'grades.challenger']) {
      freeText[`${kind} body.mapping.${field}`] = 'a column name or value of the file';
    }
    freeText[`${kind} body.settings.referencePeriod`] = 'a value of the period column of the file';
  }
  for (const field of ['inferredBad', 'unknownValues[]', 'period', 'grades.champion', 'grades.challenger']) {
    freeText[`POST /holdouts/:id/validate body.mapping.${field}`] = 'a column name or value of the file';
  }
  // Several challengers: further score columns, and the modeler's names for the models (one line of
  // at most 80 characters; kept in the mapping and the report, returned as JSON like every name).
  for (const kind of ['POST /holdouts/:id/validate', 'POST /comparisons', 'PUT /comparisons/:id/setup']) {
    freeText[`${kind} body.mapping.moreChallengers[].column`] = 'a column name of the file';
    for (const field of ['championName', 'challengerName', 'moreChallengers[].name']) freeText[`${kind} body.mapping.${field}`] = 'a model name: one line, at most 80 characters, returned as JSON';
  }

  it('knows every string field of every route’s body', () => {
    const found: string[] = [];
    for (const route of routeTable(t.app)) for (const leaf of stringLeaves(route.schemas.body, 'body')) found.push(`${routeKey(route)} ${leaf.path}`);
    expect(found.sort()).toEqual(Object.keys(freeText).sort());
  });

  it('stores markup in each free-text field and returns it verbatim as JSON', async () => {
    const fields = Object.entries(freeText).filter((entry): entry is [string, { send: () => Promise<number>; read: ReadBack }] => typeof entry[1] !== 'string');
    for (const [field, { send: store, read }] of fields) {
      const id = await store();
      const value = await read(id);
      const want = field.includes('/users') ? markup.slice(0, 120) : markup;
      expect(value, field).toBe(want);
    }
    const response = await other.get(`/api/comparisons/${scratch}`);
    expect(response.headers['content-type']).toMatch(/^application\/json/);
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    record('security: markup', { freeTextFields: fields.length, otherStringFields: Object.keys(freeText).length - fields.length });
  });

  it('keeps markup in a file’s name, column names, segment values and ids as text in the holdout and the report', async () => {
    const header = `account_id,<b>segment</b>,bad,champion,challenger`;
    const lines = [header];
    for (let i = 0; i < 300; i++) lines.push(`"<img src=x onerror=alert(${i})>",${i % 2 ? '<script>x()</script>' : '"a&amp;b"'},${i % 5 === 0 ? 1 : 0},${600 + (i % 37) - (i % 5 === 0 ? 20 : 0)},${610 + (i % 41) - (i % 5 === 0 ? 30 : 0)}`);
    const upload = await ok(uploadFile(owner, lines.join('\n') + '\n', '<svg onload=alert(1)>.csv'), 201);
    expect(upload.body.fileName).toBe('<svg onload=alert(1)>.csv');
    expect(upload.body.columns.map((column: { name: string }) => column.name)).toContain('<b>segment</b>');
    const mapping: ColumnMapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' }, id: 'account_id', segments: ['<b>segment</b>'] };
    const created = await ok(owner.post('/api/comparisons', { name: 'Markup file', holdoutId: upload.body.id, mapping, settings: { bootstrap: 0 } }), 201);
    await t.jobs.whenIdle();
    const report = (await ok(owner.get(`/api/comparisons/${created.body.id}/report`))).body;
    expect(report.segments.map((row: { column: string; value: string }) => `${row.column}=${row.value}`).sort()).toEqual(['<b>segment</b>=<script>x()</script>', '<b>segment</b>=a&amp;b']);
    expect(report.input.fileName).toBe('<svg onload=alert(1)>.csv');
  });
});

describe('formula injection in every CSV export', () => {
  it('escapes every text cell of every .csv route that a spreadsheet would run, and keeps numbers numbers', async () => {
    const formulas = ['=HYPERLINK("http://x.test","y")', '+1+1', '-2+3', '@SUM(A1:A9)', '\tTAB', '\rCR', '=cmd|"/c calc"!A1', '-', '+', '='];
    const lines = ['id,segment,bad,champion,challenger'];
    for (let i = 0; i < 400; i++) {
      const bad = i % 4 === 0 ? 1 : 0;
      const id = `${formulas[i % formulas.length]}-${i}`.replace(/"/g, '""');
      lines.push(`"${id}","${formulas[(i * 7) % formulas.length].replace(/"/g, '""')}",${bad},${-(i % 37) - (bad ? 5 : 0)},${-(i % 41) - (bad ? 9 : 0) - 0.5}`);
    }
    const upload = await ok(uploadFile(owner, lines.join('\n') + '\n', '=formulas.csv'), 201);
    const mapping: ColumnMapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' }, id: 'id', segments: ['segment'] };
    const created = await ok(owner.post('/api/comparisons', { name: '=SUM(A1) +cmd', holdoutId: upload.body.id, mapping, settings: { bootstrap: 0, approvalRate: 0.5 } }), 201);
    await t.jobs.whenIdle();
    const csvRoutes = routeTable(t.app).filter((route) => route.method === 'get' && route.path.endsWith('.csv'));
    expect(csvRoutes.map((route) => route.path).sort()).toEqual(['/comparisons/:id/export/bands.csv', '/comparisons/:id/export/swap.csv']);
    const FORMULA = /^[=+\-@\t\r]/;
    const NUMBER = /^-?\d+(\.\d+)?(e[-+]?\d+)?$/;
    let cells = 0;
    let escaped = 0;
    for (const route of csvRoutes) {
      const response = await ok(other.get(concrete(route, created.body.id)));
      expect(response.headers['content-type']).toMatch(/^text\/csv/);
      expect(response.headers['content-disposition']).toMatch(/^attachment; filename="comparison-\d+-sum-a1-cmd-[a-z.-]+"$/);
      const rows = Papa.parse<string[]>(response.text, { skipEmptyLines: true }).data;
      expect(rows.length, route.path).toBeGreaterThan(2);
      for (const row of rows) {
        for (const cell of row) {
          cells++;
          if (cell.startsWith("'")) escaped++;
          if (FORMULA.test(cell)) expect(cell, `${route.path}: unescaped cell ${JSON.stringify(cell)}`).toMatch(NUMBER);
        }
      }
    }
    expect(escaped).toBeGreaterThan(50);
    record('security: formula injection', { csvRoutes: csvRoutes.length, cellsChecked: cells, cellsEscaped: escaped });
  });
});

describe('upload file names', () => {
  function tree(dir: string): string[] {
    const out: string[] = [];
    const walk = (at: string) => {
      for (const name of readdirSync(at)) {
        const full = join(at, name);
        if (statSync(full).isDirectory()) walk(full);
        else out.push(relative(dir, full));
      }
    };
    walk(dir);
    return out.sort();
  }

  it('never uses the client’s name as a path, and shows it sanitised', async () => {
    const names = [
      '../../etc/passwd',
      '..\\..\\windows\\win.ini',
      '/etc/passwd',
      'C:\\Windows\\System32\\drivers\\etc\\hosts',
      'a\u0000b.csv',
      'line\r\nbreak.csv',
      '\u202egpj.csv',
      '.hidden.csv',
      '....//....//x.csv',
      `${'a'.repeat(10_000)}.csv`,
      'con.csv',
      '%2e%2e%2f%2e%2e%2fpasswd',
      '',
    ];
    const before = tree(t.directory);
    const shown: string[] = [];
    let refusedAsMalformed = 0;
    for (const name of names) {
      const token = owner.csrf ?? (await owner.fetchCsrf());
      const response = await owner.agent.post('/api/holdouts').set('X-CSRF-Token', token).attach('file', sample2k(), { filename: name, contentType: 'text/csv' });
      if (name === '') {
        // A part without a file name is what a browser sends when no file was chosen.
        expect(response.status).toBe(400);
        expect(response.body.error.message).toBe('Attach the holdout CSV as the multipart field "file".');
        continue;
      }
      // eslint-disable-next-line no-control-regex -- control characters are what is tested
      if (response.status === 400 && /[\u0000-\u001f]/.test(name)) {
        // A NUL in a multipart header makes the request malformed (busboy refuses it): a 400 as such.
        refusedAsMalformed++;
        expect(response.body.error.message).toMatch(/could not be read as a multipart form/);
        continue;
      }
      expect(response.status, `${JSON.stringify(name.slice(0, 40))}: ${JSON.stringify(response.body).slice(0, 200)}`).toBe(201);
      const fileName = response.body.fileName as string;
      shown.push(fileName);
      expect(fileName).not.toMatch(/[/\\]/);
      // eslint-disable-next-line no-control-regex -- checking for control characters is the point
      expect(fileName).not.toMatch(/[\u0000-\u001f\u007f\u202a-\u202e\u2066-\u2069]/);
      expect(fileName).not.toMatch(/^\./);
      expect([...fileName].length).toBeLessThanOrEqual(200);
      expect(fileName.length).toBeGreaterThan(0);
      expect((await owner.get(`/api/holdouts/${response.body.id}`)).body.fileName).toBe(fileName);
    }
    // Only the database's own files changed; nothing was written under the names sent.
    const after = tree(t.directory);
    expect(after.filter((file) => !before.includes(file))).toEqual([]);
    expect(after.every((file) => /^test\.sqlite(-wal|-shm)?$/.test(file))).toBe(true);
    expect(uploadLeftovers(join(t.directory, 'uploads'))).toEqual([]);
    expect(refusedAsMalformed).toBeLessThanOrEqual(1);
    record('security: upload file names', { names: names.length, refusedAsMalformed, shown: shown.map((name) => (name.length > 40 ? `${name.slice(0, 20)}…(${name.length})` : name)) });
  });
});
