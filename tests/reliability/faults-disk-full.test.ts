import { statSync } from 'node:fs';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiErrorSchema } from '@shared/errors';
import { invariantProblems, inspect, uploadLeftovers } from './helpers/db';
import { record } from './helpers/figures';
import { validHoldout } from './helpers/holdouts';
import { type CompiledServer, startCompiled } from './helpers/server';
import { Session } from './helpers/session';

/**
 * The disk fills under the compiled server. The server runs under a file-size limit (`ulimit -f`,
 * SIGXFSZ ignored: a write past it fails as on a full disk, no root or tmpfs needed) a little
 * above its database's size, and is sent comparisons and notes until its writes fail. Every write
 * it acknowledged (201) must be in the file after a clean stop and a restart without the limit;
 * the refused ones get 507 or 503 in the one error shape; /api/health says the database is
 * unwritable meanwhile; an upload during the full disk is answered 507, not 400, and logged.
 *
 * Before the fix (connection-guard.ts) a failed COMMIT left TypeORM's runner inside a transaction
 * that never committed again: every later write was answered 201 and lost (e.g. 398 acknowledged,
 * 96 stored).
 */

let server: CompiledServer;
let modeler: Session;
let holdoutId: number;
let comparisonId: number;

beforeAll(async () => {
  server = await startCompiled({ env: { LOG_LEVEL: 'warn' } });
  modeler = await new Session(server.url).signIn('modeler@tallowmere.test');
  const upload = await modeler.upload(new TextEncoder().encode(validHoldout(200)));
  expect(upload.status).toBe(201);
  holdoutId = upload.body.id!;
  const created = await modeler.request<{ id: number }>('POST', '/api/comparisons', { name: 'Before the disk filled', holdoutId });
  expect(created.status).toBe(201);
  comparisonId = created.body.id;
}, 120_000);
afterAll(async () => {
  await server?.stop();
});

const size = (file: string) => {
  try {
    return statSync(file).size;
  } catch {
    return 0;
  }
};

describe('the disk fills while people write', () => {
  it('never acknowledges a write it did not store, answers 507/503, reports health, and recovers', async () => {
    // A clean stop checkpoints the WAL into the database; the limit leaves ~1.5 MB of room.
    await server.kill('SIGTERM');
    const limit = Math.max(size(server.databasePath), size(`${server.databasePath}-wal`)) + 1_500_000;
    await server.restart(undefined, { fileSizeLimitBytes: limit });
    await modeler.signIn('modeler@tallowmere.test');

    const acknowledged = { comparisons: [] as string[], notes: [] as string[] };
    const refused: Record<number, number> = {};
    let healthWhileFull: { status: number; body: unknown } | null = null;
    let uploadWhileFull: { status: number; body: unknown } | null = null;
    let attempts = 0;
    let failures = 0;
    for (let i = 0; i < 1500 && failures < 30; i++) {
      attempts += 1;
      const marker = `disk-full-${i}`;
      const response =
        i % 3 === 0
          ? await modeler.request('POST', '/api/comparisons', { name: marker, holdoutId })
          : await modeler.request('POST', `/api/comparisons/${comparisonId}/notes`, { body: `${marker} ${'x'.repeat(7000)}` });
      if (response.status === 201) {
        (i % 3 === 0 ? acknowledged.comparisons : acknowledged.notes).push(marker);
        continue;
      }
      failures += 1;
      refused[response.status] = (refused[response.status] ?? 0) + 1;
      expect([503, 507], `write ${i}: ${response.text}`).toContain(response.status);
      expect(apiErrorSchema.safeParse(response.body).success, response.text).toBe(true);
      if (healthWhileFull === null) {
        const health = await fetch(`${server.url}/api/health`);
        healthWhileFull = { status: health.status, body: await health.json() };
        // An upload bigger than the room left (the upload folder's file hits the limit while it is
        // received): refused as the server's trouble (507), not the client's (400).
        const rows = validHoldout(1900);
        const upload = await modeler.upload(new TextEncoder().encode(rows + rows.slice(rows.indexOf('\n') + 1).repeat(Math.ceil((limit * 1.5) / rows.length))));
        uploadWhileFull = { status: upload.status, body: upload.body };
      }
    }
    // Stop cleanly, start without the limit: every acknowledged write is in the file.
    await server.kill('SIGTERM');
    await server.restart(undefined, { fileSizeLimitBytes: null });
    const db = new Database(server.databasePath, { readonly: true });
    const storedComparisons = new Set((db.prepare(`SELECT "name" FROM "comparisons" WHERE "name" LIKE 'disk-full-%'`).all() as { name: string }[]).map((row) => row.name));
    const storedNotes = new Set(
      (db.prepare(`SELECT substr("body", 1, instr("body", ' ') - 1) AS marker FROM "notes" WHERE "body" LIKE 'disk-full-%'`).all() as { marker: string }[]).map((row) => row.marker),
    );
    db.close();
    const lostComparisons = acknowledged.comparisons.filter((name) => !storedComparisons.has(name));
    const lostNotes = acknowledged.notes.filter((marker) => !storedNotes.has(marker));
    record('faults: disk full', {
      fileSizeLimitBytes: limit,
      attempts,
      refused,
      acknowledged: { comparisons: acknowledged.comparisons.length, notes: acknowledged.notes.length },
      stored: { comparisons: storedComparisons.size, notes: storedNotes.size },
      health: healthWhileFull,
      upload: uploadWhileFull?.status,
    });
    expect(failures, 'the file-size limit was reached').toBeGreaterThan(0);
    expect(healthWhileFull?.status).toBe(503);
    expect(healthWhileFull?.body).toMatchObject({ ok: false, database: 'unwritable' });
    expect(uploadWhileFull?.status, JSON.stringify(uploadWhileFull).slice(0, 500)).toBe(507);
    expect(server.output()).toMatch(/→ 50[37] storage_(full|unavailable)/);
    expect(uploadLeftovers(server.uploadDir)).toEqual([]);

    expect(lostComparisons, 'comparisons answered 201 and not stored').toEqual([]);
    expect(lostNotes, 'notes answered 201 and not stored').toEqual([]);
    // Refused writes left nothing behind either.
    expect(storedComparisons.size).toBe(acknowledged.comparisons.length);
    expect(storedNotes.size).toBe(acknowledged.notes.length);
    expect(invariantProblems(inspect(server.databasePath))).toEqual([]);

    // With room again, the server takes writes and health is ok.
    const after = await modeler.request('POST', `/api/comparisons/${comparisonId}/notes`, { body: 'After the disk was freed' });
    expect(after.status).toBe(201);
    expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
  });
});
