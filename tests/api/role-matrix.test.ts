import { roles, type Role } from '@shared/roles';
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeTable } from '@server/app';
import { describeAccess, type RouteDefinition } from '@server/http/routes';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient, signedInAs } from './helpers/client';

/**
 * The role matrix, generated from the route registry itself: every guarded route × anonymous and
 * each role. Expected: anonymous → 401; a role the rule does not name → 403; a role it names →
 * neither 401 nor 403 (usually 200, or 400 for the empty body sent here). Every request carries a
 * valid CSRF token, so a 403 can only come from the role guard.
 */

/**
 * Who may call what, written out by hand from docs/design.md ("Workflow and roles"). The registry must
 * match it exactly: a new route, or a changed rule, fails here until this table says so too.
 */
const intendedAccess: Record<string, string> = {
  'GET /health': 'public',
  'GET /auth/csrf': 'public',
  'POST /auth/login': 'public',
  'POST /auth/logout': 'public',
  'GET /auth/me': 'signed-in',
  'POST /auth/password-reset': 'public',
  'GET /auth/tokens/:token': 'public',
  'POST /auth/tokens/:token/accept': 'public',
  'GET /users': 'admin',
  'POST /users/invitations': 'admin',
  'PATCH /users/:id': 'admin',
  'GET /outbox': 'admin',
  'POST /holdouts': 'modeler',
  'GET /holdouts/:id': 'signed-in',
  'POST /holdouts/:id/validate': 'modeler',
  'POST /comparisons': 'modeler',
  'PUT /comparisons/:id/setup': 'modeler',
  'GET /comparisons': 'signed-in',
  'GET /comparisons/:id': 'signed-in',
  'GET /comparisons/:id/report': 'signed-in',
  'POST /comparisons/:id/swap': 'signed-in',
  // Several challengers side by side: the same figures as the swap sets, for every challenger.
  'POST /comparisons/:id/challengers/swap': 'signed-in',
  // Conditional adoption is worked out by the people who set and adopt credit policy.
  'POST /comparisons/:id/mixed-strategy': 'policy | committee',
  'GET /comparisons/:id/scenarios': 'signed-in',
  'POST /comparisons/:id/scenarios': 'policy',
  'GET /comparisons/:id/export/bands.csv': 'signed-in',
  'GET /comparisons/:id/export/swap.csv': 'policy',
  'GET /comparisons/:id/export/report.json': 'signed-in',
  'GET /comparisons/:id/governance': 'signed-in',
  'POST /comparisons/:id/submit': 'modeler',
  'POST /comparisons/:id/review': 'analyst',
  'POST /comparisons/:id/votes': 'committee',
  'POST /comparisons/:id/decision': 'committee',
  'POST /comparisons/:id/verdicts': 'analyst | committee | admin',
  'GET /comparisons/:id/audit': 'signed-in',
  'GET /comparisons/:id/evidence.json': 'signed-in',
  // The committee pack: read by every role (committees, validators, modelers, credit policy, admins).
  'GET /comparisons/:id/export/pack.pdf': 'signed-in',
  'GET /comparisons/:id/export/workbook.xlsx': 'signed-in',
  // Notes: anyone signed in writes in the discussion; swap-set anchors need the policy role (the service answers 403).
  'GET /comparisons/:id/notes': 'signed-in',
  'POST /comparisons/:id/notes': 'signed-in',
  'GET /policy': 'signed-in',
  'PUT /policy': 'admin',
  'GET /policy/versions': 'signed-in',
  // The full verification of the audit chain (the routes above check only new events).
  'POST /audit/verify': 'admin',
};

let t: TestApp;
const clients = new Map<Role | 'anonymous', TestClient>();

beforeAll(async () => {
  t = await buildTestApp();
  const anonymous = new TestClient(t.app);
  await anonymous.fetchCsrf();
  clients.set('anonymous', anonymous);
  for (const role of roles) clients.set(role, await signedInAs(t.app, role));
});
afterAll(async () => {
  await t.close();
});

function concretePath(route: RouteDefinition): string {
  // A parameter becomes a value that passes type checks but names nothing that exists.
  return `/api${route.path.replace(/:(\w+)/g, (_match, name: string) => (name === 'id' ? '999999' : 'x'.repeat(43)))}`;
}

function expected(route: RouteDefinition, actor: Role | 'anonymous'): 'allowed' | 401 | 403 {
  if (route.access === 'public') return 'allowed';
  if (actor === 'anonymous') return 401;
  if (route.access === 'signed-in') return 'allowed';
  return route.access.includes(actor) ? 'allowed' : 403;
}

async function call(client: TestClient, route: RouteDefinition): Promise<number> {
  const path = concretePath(route);
  if (route.method === 'get') return (await client.get(path)).status;
  return (await client.send(route.method, path, {})).status;
}

/** Every (method, path) Express actually has under /api, read from the router's own stack. */
function mountedApiRoutes(app: Express): string[] {
  type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] }; matchers?: unknown };
  const root = (app as unknown as { router: { stack: Layer[] } }).router.stack;
  const found: string[] = [];
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [method, on] of Object.entries(layer.route.methods)) if (on && method !== '_all') found.push(`${method.toUpperCase()} ${layer.route.path}`);
      } else if (layer.handle?.stack) walk(layer.handle.stack);
    }
  };
  walk(root);
  return found;
}

describe('route registry', () => {
  it('holds every route Express serves, and nothing else', () => {
    const registry = routeTable(t.app).map((route) => `${route.method.toUpperCase()} ${route.path}`);
    const mounted = mountedApiRoutes(t.app).filter((key) => !key.endsWith('/{*path}'));
    expect(mounted.sort()).toEqual([...registry].sort());
  });

  it('declares exactly the intended access rule for every route', () => {
    const declared = Object.fromEntries(routeTable(t.app).map((route) => [`${route.method.toUpperCase()} ${route.path}`, describeAccess(route.access)]));
    expect(declared).toEqual(intendedAccess);
  });

  it('gives every route an access rule and at least one route per rule kind', () => {
    const table = routeTable(t.app);
    expect(table.length).toBeGreaterThanOrEqual(11);
    expect(table.some((route) => route.access === 'public')).toBe(true);
    expect(table.some((route) => route.access === 'signed-in')).toBe(true);
    expect(table.some((route) => Array.isArray(route.access))).toBe(true);
  });
});

describe('role matrix', () => {
  const actors: (Role | 'anonymous')[] = ['anonymous', ...roles];
  it('answers each guarded route as its access rule says, for anonymous and every role', async () => {
    const guarded = routeTable(t.app).filter((route) => route.access !== 'public');
    const failures: string[] = [];
    // A floor, so an empty or shrunken route table cannot pass the matrix vacuously.
    expect(guarded.length).toBeGreaterThan(20);
    for (const route of guarded) {
      for (const actor of actors) {
        const want = expected(route, actor);
        const status = await call(clients.get(actor)!, route);
        const ok = want === 'allowed' ? status !== 401 && status !== 403 : status === want;
        if (!ok) failures.push(`${route.method.toUpperCase()} ${route.path} [${describeAccess(route.access)}] as ${actor}: got ${status}, want ${want}`);
      }
    }
    expect(failures).toEqual([]);
  });

  it('lets anyone reach the public routes without signing in', async () => {
    const anonymous = clients.get('anonymous')!;
    for (const route of routeTable(t.app).filter((r) => r.access === 'public' && r.path !== '/auth/logout')) {
      const status = await call(anonymous, route);
      expect([401, 403], `${route.method} ${route.path} → ${status}`).not.toContain(status);
    }
  });
});
