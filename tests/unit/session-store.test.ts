import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { SessionData } from 'express-session';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { SqliteSessionStore } from '@server/auth/session-store';
import { openDatabase } from '@server/db/data-source';
import { Session, User } from '@server/db/entities/index';
import { createLogger } from '@server/log';
import { createTestDatabase, onPostgres, type TestDatabase } from '../setup/test-database';

let directory: string;
let dataSource: DataSource;
let store: SqliteSessionStore;
let database: TestDatabase;

beforeAll(async () => {
  directory = mkdtempSync(join(tmpdir(), 'scorecourt-sessions-'));
  database = await createTestDatabase(directory, 'db.sqlite');
  dataSource = await openDatabase(database.address);
  store = new SqliteSessionStore(dataSource, createLogger('silent'));
  await dataSource.getRepository(User).save({ email: 'a@tallowmere.test', name: 'A', passwordHash: null, roles: ['admin'], active: true, createdAt: new Date() });
});
afterAll(async () => {
  store.close();
  await dataSource.destroy();
  await database.drop();
  rmSync(directory, { recursive: true, force: true });
});

const call = <T>(run: (callback: (error: unknown, value?: T) => void) => void) =>
  new Promise<T | undefined>((resolve, reject) => run((error, value) => (error ? reject(error) : resolve(value))));

function sessionFor(expires: Date, user?: number): SessionData {
  return { cookie: { expires, originalMaxAge: 1000, httpOnly: true, path: '/' }, ...(user ? { passport: { user } } : {}) } as unknown as SessionData;
}

describe('SQLite session store', () => {
  it('stores, reads, touches and destroys a session, recording whose it is', async () => {
    const later = new Date(Date.now() + 60_000);
    await call((cb) => store.set('s1', sessionFor(later, 1), cb));
    expect((await dataSource.getRepository(Session).findOneByOrFail({ sid: 's1' })).userId).toBe(1);
    const read = await call<SessionData | null>((cb) => store.get('s1', cb));
    expect((read as unknown as { passport: { user: number } }).passport.user).toBe(1);

    const evenLater = new Date(Date.now() + 120_000);
    await call((cb) => store.touch('s1', sessionFor(evenLater, 1), cb));
    expect((await dataSource.getRepository(Session).findOneByOrFail({ sid: 's1' })).expiresAt.getTime()).toBe(evenLater.getTime());
    // A touch that would move the expiry by less than a minute is not written.
    await call((cb) => store.touch('s1', sessionFor(new Date(evenLater.getTime() + 30_000), 1), cb));
    expect((await dataSource.getRepository(Session).findOneByOrFail({ sid: 's1' })).expiresAt.getTime()).toBe(evenLater.getTime());

    await call((cb) => store.destroy('s1', cb));
    expect(await call((cb) => store.get('s1', cb))).toBeNull();
  });

  it('touches a session read a moment ago without any write (rolling sessions touch on every request)', async () => {
    const later = new Date(Date.now() + 60_000);
    await call((cb) => store.set('s2', sessionFor(later, 1), cb));
    await call((cb) => store.get('s2', cb));
    const update = vi.spyOn(dataSource.getRepository(Session), 'update');
    try {
      for (let i = 0; i < 5; i++) await call((cb) => store.touch('s2', sessionFor(new Date(later.getTime() + i * 1000), 1), cb));
      expect(update).not.toHaveBeenCalled();
      // More than a minute on, it is written, once.
      await call((cb) => store.touch('s2', sessionFor(new Date(later.getTime() + 90_000), 1), cb));
      await call((cb) => store.touch('s2', sessionFor(new Date(later.getTime() + 91_000), 1), cb));
      expect(update).toHaveBeenCalledTimes(1);
    } finally {
      update.mockRestore();
    }
    expect((await dataSource.getRepository(Session).findOneByOrFail({ sid: 's2' })).expiresAt.getTime()).toBe(later.getTime() + 90_000);
    // A session removed behind the store's back (a deactivation) is not found again.
    await dataSource.getRepository(Session).delete({ sid: 's2' });
    expect(await call((cb) => store.get('s2', cb))).toBeNull();
  });

  it('ignores and prunes expired sessions', async () => {
    await call((cb) => store.set('old', sessionFor(new Date(Date.now() - 1000), 1), cb));
    await call((cb) => store.set('new', sessionFor(new Date(Date.now() + 60_000), 1), cb));
    expect(await call((cb) => store.get('old', cb))).toBeNull();
    await call((cb) => store.set('old2', sessionFor(new Date(Date.now() - 1000), 1), cb));
    expect(await store.prune()).toBe(1);
    expect(await call((cb) => store.get('new', cb))).not.toBeNull();
  });

  // SQLite only: on PostgreSQL they are stored for every instance (tests/api/two-instances.test.ts).
  it.skipIf(onPostgres)('keeps sessions without a signed-in person in memory only, and moves a signed-out one out of the database (SQLite only: on PostgreSQL they are stored for every instance)', async () => {
    const later = new Date(Date.now() + 60_000);
    const rows = () => dataSource.getRepository(Session).count();
    const before = await rows();
    for (let i = 0; i < 100; i++) await call((cb) => store.set(`anonymous-${i}`, sessionFor(later), cb));
    expect(await rows()).toBe(before);
    expect(await call((cb) => store.get('anonymous-7', cb))).not.toBeNull();
    await call((cb) => store.set('person', sessionFor(later, 1), cb));
    expect(await rows()).toBe(before + 1);
    await call((cb) => store.set('person', sessionFor(later), cb));
    expect(await rows()).toBe(before);
    await call((cb) => store.destroy('anonymous-7', cb));
    expect(await call((cb) => store.get('anonymous-7', cb))).toBeNull();
  });
});
