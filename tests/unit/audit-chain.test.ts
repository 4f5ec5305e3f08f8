import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import type { DataSource } from 'typeorm';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { genesisHash, hashEvent, recordAudit, verifyAuditChain } from '@server/audit/audit';
import { canonicalJson } from '@server/audit/canonical-json';
import { openDatabase } from '@server/db/data-source';
import { AuditEvent, User } from '@server/db/entities/index';
import { inTransaction } from '@server/db/transaction';
import pg from 'pg';
import { createTestDatabase, onPostgres, type TestDatabase } from '../setup/test-database';

let directory: string;
let dataSource: DataSource;
let database: TestDatabase;
let file: string;

beforeEach(async () => {
  directory = mkdtempSync(join(tmpdir(), 'scorecourt-audit-'));
  database = await createTestDatabase(directory, 'audit.sqlite');
  file = database.address;
  dataSource = await openDatabase(file);
});
afterEach(async () => {
  if (dataSource.isInitialized) await dataSource.destroy();
  await database.drop();
  rmSync(directory, { recursive: true, force: true });
});

async function addEvents(count: number) {
  const user = await dataSource.getRepository(User).save({ email: 'a@tallowmere.test', name: 'A', passwordHash: null, roles: ['admin'], active: true, createdAt: new Date() });
  for (let i = 0; i < count; i++) {
    await inTransaction(dataSource, (manager) =>
      recordAudit(manager, { actor: i % 2 ? user : null, action: 'test.step', target: { type: 'thing', id: i }, details: { step: i, note: `é${i}`, nested: { b: 2, a: 1 } } }),
    );
  }
  return user;
}

/** Raw access that bypasses the triggers, as someone tampering with the database would. */
async function tamper(sql: string) {
  if (onPostgres) {
    const raw = new pg.Client({ connectionString: file });
    await raw.connect();
    await raw.query(`ALTER TABLE audit_events DISABLE TRIGGER USER; ${sql}`);
    await raw.end();
    return;
  }
  const raw = new Database(file);
  raw.exec('DROP TRIGGER audit_events_no_update; DROP TRIGGER audit_events_no_delete;');
  raw.exec(sql);
  raw.close();
}

describe('canonical JSON', () => {
  it('sorts keys at every level and drops undefined members', () => {
    // computed by hand
    expect(canonicalJson({ b: 1, a: { d: [3, { z: 1, y: undefined }], c: null } })).toBe('{"a":{"c":null,"d":[3,{"z":1}]},"b":1}');
  });
  it('refuses values JSON cannot hold faithfully', () => {
    expect(() => canonicalJson({ x: Number.NaN })).toThrow(/\$\.x is not a finite number/);
  });
});

describe('audit chain', () => {
  it('links each event to the one before, starting from 64 zeros', async () => {
    await addEvents(3);
    const events = await dataSource.getRepository(AuditEvent).find({ order: { id: 'ASC' } });
    expect(events[0].prevHash).toBe(genesisHash);
    expect(events[1].prevHash).toBe(events[0].hash);
    expect(events[2].prevHash).toBe(events[1].hash);
    expect(events[2].hash).toBe(hashEvent(events[2]));
    expect(events[0].details).toBe('{"nested":{"a":1,"b":2},"note":"é0","step":0}');
  });

  it('verifies an untouched chain, in batches', async () => {
    await addEvents(7);
    expect(await verifyAuditChain(dataSource, 3)).toEqual({ ok: true, events: 7 });
  });

  it('detects a changed event', async () => {
    await addEvents(5);
    await dataSource.destroy();
    await tamper(`UPDATE audit_events SET details = '{"nested":{"a":1,"b":2},"note":"é2","step":99}' WHERE id = 3`);
    dataSource = await openDatabase(file);
    const check = await verifyAuditChain(dataSource);
    expect(check).toMatchObject({ ok: false, brokenAt: 3, events: 2 });
  });

  it('keeps the actor’s name and e-mail of the time in the event, and a changed name breaks the chain', async () => {
    const user = await addEvents(3);
    // Event 2 (i = 1) was by the person; renaming them later changes nothing recorded.
    await dataSource.getRepository(User).update({ id: user.id }, { name: 'A. Renamed', email: 'renamed@tallowmere.test' });
    expect(await dataSource.getRepository(AuditEvent).findOneByOrFail({ id: 2 })).toMatchObject({ actorId: user.id, actorName: 'A', actorEmail: 'a@tallowmere.test' });
    expect(await dataSource.getRepository(AuditEvent).findOneByOrFail({ id: 1 })).toMatchObject({ actorId: null, actorName: null, actorEmail: null });
    expect(await verifyAuditChain(dataSource)).toMatchObject({ ok: true, events: 3 });
    await dataSource.destroy();
    await tamper(`UPDATE audit_events SET "actorName" = 'Someone else' WHERE id = 2`);
    dataSource = await openDatabase(file);
    expect(await verifyAuditChain(dataSource)).toMatchObject({ ok: false, brokenAt: 2 });
  });

  it('verifies events recorded before names were kept (no name, no e-mail) with their original hash', async () => {
    await addEvents(2);
    const second = await dataSource.getRepository(AuditEvent).findOneByOrFail({ id: 2 });
    // The hash an event without the two columns had: the canonical form leaves absent names out.
    const old = { ...second, actorName: null, actorEmail: null };
    const oldHash = hashEvent(old);
    expect(oldHash).not.toBe(second.hash);
    await dataSource.destroy();
    await tamper(`UPDATE audit_events SET "actorName" = NULL, "actorEmail" = NULL, hash = '${oldHash}' WHERE id = 2`);
    dataSource = await openDatabase(file);
    // Event 2 verifies as an event from before names were kept: the whole chain verifies.
    expect(await verifyAuditChain(dataSource)).toMatchObject({ ok: true, events: 2 });
  });

  it('detects a changed event whose hash was recomputed, at the next event', async () => {
    await addEvents(5);
    const third = await dataSource.getRepository(AuditEvent).findOneByOrFail({ id: 3 });
    const forged = { ...third, action: 'test.forged' };
    const forgedHash = hashEvent(forged);
    await dataSource.destroy();
    await tamper(`UPDATE audit_events SET action = 'test.forged', hash = '${forgedHash}' WHERE id = 3`);
    dataSource = await openDatabase(file);
    expect(await verifyAuditChain(dataSource)).toMatchObject({ ok: false, brokenAt: 4 });
  });

  it('detects a removed event', async () => {
    await addEvents(5);
    await dataSource.destroy();
    await tamper('DELETE FROM audit_events WHERE id = 2');
    dataSource = await openDatabase(file);
    expect(await verifyAuditChain(dataSource)).toMatchObject({ ok: false, brokenAt: 3 });
  });

  it('the database refuses UPDATE and DELETE on audit events', async () => {
    await addEvents(2);
    await expect(dataSource.query(`UPDATE audit_events SET action = 'x' WHERE id = 1`)).rejects.toThrow(/append-only/);
    await expect(dataSource.query('DELETE FROM audit_events')).rejects.toThrow(/append-only/);
    await expect(dataSource.getRepository(AuditEvent).delete({ id: 1 })).rejects.toThrow(/append-only/);
    expect(await dataSource.getRepository(AuditEvent).count()).toBe(2);
  });

  it('must be recorded inside a transaction', async () => {
    await expect(recordAudit(dataSource.manager, { actor: null, action: 'x', target: { type: 't', id: null } })).rejects.toThrow(/inside the transaction/);
  });

  it('is rolled back with the change it records', async () => {
    await expect(
      inTransaction(dataSource, async (manager) => {
        await recordAudit(manager, { actor: null, action: 'test.rolled_back', target: { type: 't', id: 1 } });
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');
    expect(await dataSource.getRepository(AuditEvent).countBy({ action: 'test.rolled_back' })).toBe(0);
  });

  it('stays one chain when many transactions run at once', async () => {
    await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        inTransaction(dataSource, async (manager) => {
          await new Promise((resolve) => setTimeout(resolve, (i * 7) % 5)); // awaits real time inside
          return recordAudit(manager, { actor: null, action: 'test.concurrent', target: { type: 't', id: i } });
        }),
      ),
    );
    expect(await verifyAuditChain(dataSource)).toEqual({ ok: true, events: 20 });
  });

  // Several server instances on one PostgreSQL database: each its own pool, the writes of all in
  // one order (the advisory lock in db/transaction.ts). SQLite is one process's database.
  it.runIf(onPostgres)('stays one chain when two instances append at once', async () => {
    const other = await openDatabase(file);
    try {
      const append = (source: DataSource, i: number) =>
        inTransaction(source, async (manager) => {
          await new Promise((resolve) => setTimeout(resolve, (i * 7) % 5));
          return recordAudit(manager, { actor: null, action: 'test.two-instances', target: { type: 't', id: i } });
        });
      await Promise.all(Array.from({ length: 30 }, (_, i) => append(i % 2 ? other : dataSource, i)));
      expect(await verifyAuditChain(dataSource)).toEqual({ ok: true, events: 30 });
      const events = await dataSource.getRepository(AuditEvent).find({ order: { id: 'ASC' } });
      expect(new Set(events.map((event) => event.prevHash)).size).toBe(30);
    } finally {
      await other.destroy();
    }
  });
});
