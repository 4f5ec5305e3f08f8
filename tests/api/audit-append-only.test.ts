import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { roles, type Role } from '@shared/roles';
import { auditTrailSchema } from '@shared/governance';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeTable } from '@server/app';
import { verifyAuditChain } from '@server/audit/audit';
import type { RouteDefinition } from '@server/http/routes';
import { rawQuery } from '@server/db/driver';
import { dropTrigger, onPostgres } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { analysedComparison } from './helpers/governance';

/**
 * The audit trail is append-only: calling every route of the registry, as anonymous and as every
 * role, on real comparisons (one decided, one analysed), adds events but never changes or removes
 * one; the database refuses UPDATE and DELETE; no server code writes to audit_events except by
 * inserting; and a changed event is reported by the chain checks the API serves (the full one,
 * and the incremental one for the newest event).
 */

let t: TestApp;
let decidedId: number;
let analysedId: number;
const clients = new Map<Role | 'anonymous', TestClient>();

type Row = Record<string, unknown>;
const snapshot = async (): Promise<Row[]> => (await t.dataSource.query('SELECT * FROM "audit_events" ORDER BY "id"')) as Row[];

beforeAll(async () => {
  t = await buildTestApp();
  const anonymous = new TestClient(t.app);
  await anonymous.fetchCsrf();
  clients.set('anonymous', anonymous);
  for (const role of roles) clients.set(role, await signedInAs(t.app, role));
  const modeler = clients.get('modeler')!;
  // 300 accounts each: the trail's rule does not depend on the size, and each of the ~430 calls
  // below that reads, exports or recomputes a comparison does a sixth of the whole sample's work.
  decidedId = await analysedComparison(t, modeler, { name: 'Decided one', rows: 300 });
  analysedId = await analysedComparison(t, modeler, { name: 'Analysed one', rows: 300 });
  const step = async (client: TestClient, path: string, body: object) => {
    const response = await client.post(`/api/comparisons/${decidedId}/${path}`, body);
    expect(response.status, JSON.stringify(response.body)).toBe(200);
  };
  await step(modeler, 'submit', {});
  await step(clients.get('analyst')!, 'review', { outcome: 'validated', findings: 'Sound.' });
  // The default quorum is two votes: the demo's second committee member votes too.
  const committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  await step(clients.get('committee')!, 'votes', { vote: 'adopt' });
  await step(committee2, 'votes', { vote: 'adopt' });
  await step(clients.get('committee')!, 'decision', { outcome: 'adopt', rationale: 'Clear gain.' });
  expect((await clients.get('policy')!.post(`/api/comparisons/${decidedId}/notes`, { anchor: 'swap-in', body: 'Swap-in looks clean.' })).status).toBe(201);
  // Two analyses and a decision, which lays out and archives the committee pack.
});
afterAll(async () => {
  await t.close();
});

function pathFor(route: RouteDefinition, id: number): string {
  return `/api${route.path.replace(/:(\w+)/g, (_match, name: string) => (name === 'id' ? String(id) : 'x'.repeat(43)))}`;
}

async function call(client: TestClient, route: RouteDefinition, id: number): Promise<number> {
  const path = pathFor(route, id);
  if (route.method === 'get') return (await client.get(path)).status;
  return (await client.send(route.method, path, {})).status;
}

describe('the audit trail is append-only', () => {
  it('keeps every event exactly as it was while every route is called as everyone', async () => {
    const before = await snapshot();
    expect(before.length).toBeGreaterThan(15);
    const routes = routeTable(t.app);
    const statuses = new Set<number>();
    for (const id of [decidedId, analysedId]) {
      for (const [who, client] of clients) {
        for (const route of routes) {
          // Signing out would end the client's session for the rest of the loop; it runs last.
          if (route.path === '/auth/logout' || (route.access !== 'public' && who === 'anonymous')) continue;
          statuses.add(await call(client, route, id));
        }
      }
    }
    for (const client of clients.values()) statuses.add(await call(client, routes.find((route) => route.path === '/auth/logout')!, decidedId));
    // The calls did things: successes, refusals and conflicts alike.
    expect([...statuses]).toEqual(expect.arrayContaining([200, 201, 400, 403, 409]));

    const after = await snapshot();
    expect(after.length).toBeGreaterThan(before.length);
    expect(after.slice(0, before.length)).toEqual(before);
    expect(await verifyAuditChain(t.dataSource)).toEqual({ ok: true, events: after.length });
    // Every role downloads the analysed comparison's committee pack, each laid out on a worker thread.
    // About 430 calls: under a minute on a quiet machine; the bound is for a machine at load 40,
    // where it took more than 400 s.
  }, 900_000);

  it('is refused UPDATE and DELETE by the database', async () => {
    await expect(t.dataSource.query(`UPDATE "audit_events" SET "details" = '{}' WHERE "id" = 1`)).rejects.toThrow(/append-only/);
    await expect(t.dataSource.query(`DELETE FROM "audit_events" WHERE "id" = 1`)).rejects.toThrow(/append-only/);
    if (onPostgres) await expect(t.dataSource.query(`TRUNCATE "audit_events"`)).rejects.toThrow(/append-only/);
    // The workflow's own records are kept as written too.
    for (const table of ['reviews', 'votes', 'decisions', 'verdict_records', 'policy_versions']) {
      await expect(t.dataSource.query(`DELETE FROM "${table}"`), table).rejects.toThrow(/kept as written/);
      await expect(t.dataSource.query(`UPDATE "${table}" SET "createdAt" = "createdAt"`), table).rejects.toThrow(/kept as written/);
    }
  });

  it('has no server code that updates or deletes audit events', () => {
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (path.endsWith('.ts')) files.push(path);
      }
    };
    walk(join(import.meta.dirname, '..', '..', 'server'));
    const offenders = files.filter((file) => {
      const text = readFileSync(file, 'utf8');
      return /(update|delete|remove|softDelete|increment|upsert)\(\s*AuditEvent\b/.test(text) || /(UPDATE|DELETE FROM)\s+"?audit_events/i.test(text.replace(/RAISE\(ABORT[^)]*\)/g, ''));
    });
    // Only the migration names the table in SQL (its triggers and its down()).
    expect(offenders.filter((file) => !file.includes(`${join('db', 'migrations')}`))).toEqual([]);
    expect(files.length).toBeGreaterThan(50);
  });

  it('reports a changed event through the chain check the audit route serves', async () => {
    const analyst = clients.get('analyst')!;
    await analyst.signIn('analyst@tallowmere.test');
    const clean = auditTrailSchema.parse((await analyst.get(`/api/comparisons/${decidedId}/audit`)).body);
    expect(clean.chainValid).toBe(true);
    expect(clean.events.map((event) => event.action)).toEqual(expect.arrayContaining(['comparison.decided', 'note.added', 'vote.cast']));
    // Tamper with the file as an attacker with database access would: drop the trigger, edit one event.
    await dropTrigger(t.dataSource, 'audit_events', 'audit_events_no_update');
    const decided = clean.events.find((event) => event.action === 'comparison.decided')!;
    await rawQuery(t.dataSource, `UPDATE "audit_events" SET "details" = ? WHERE "id" = ?`, [JSON.stringify({ ...decided.details, outcome: 'keep' }), decided.id]);
    // Each audit call verifies only the events appended since the last verified one (the chain's
    // head), so an edit to an old event is found by the full verification: at start-up, and the
    // admin's action. After it, every trail reports the chain broken.
    expect(await verifyAuditChain(t.dataSource)).toMatchObject({ ok: false, brokenAt: decided.id });
    const refused = await analyst.post('/api/audit/verify', {});
    expect(refused.status).toBe(403);
    const admin = clients.get('admin')!;
    await admin.signIn('admin@tallowmere.test');
    const full = await admin.post('/api/audit/verify', {});
    expect(full.status).toBe(200);
    expect(full.body).toMatchObject({ ok: false, brokenAt: decided.id, reason: expect.stringMatching(/changed/) });
    const tampered = auditTrailSchema.parse((await analyst.get(`/api/comparisons/${decidedId}/audit`)).body);
    expect(tampered.chainValid).toBe(false);
  });

  it('notices at once an edit to the newest verified event, without a full verification', async () => {
    const fresh = await buildTestApp();
    try {
      const modeler = await signedInAs(fresh.app, 'modeler');
      const id = await analysedComparison(fresh, modeler, { name: 'Head', rows: 300 });
      expect((await modeler.post(`/api/comparisons/${id}/notes`, { body: 'The newest event.' })).status).toBe(201);
      expect(auditTrailSchema.parse((await modeler.get(`/api/comparisons/${id}/audit`)).body).chainValid).toBe(true);
      await dropTrigger(fresh.dataSource, 'audit_events', 'audit_events_no_update');
      await fresh.dataSource.query(`UPDATE "audit_events" SET "details" = '{"body":"edited"}' WHERE "id" = (SELECT MAX("id") FROM "audit_events")`);
      expect(auditTrailSchema.parse((await modeler.get(`/api/comparisons/${id}/audit`)).body).chainValid).toBe(false);
    } finally {
      await fresh.close();
    }
  });
});
