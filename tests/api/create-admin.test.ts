import { spawnSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { projectRoot } from '@server/runtime';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient } from './helpers/client';
import { compiledEntry } from '../setup/compiled';
import { createTestDatabase, onPostgres, type TestDatabase } from '../setup/test-database';

/**
 * `npm run create-admin -- EMAIL`: the first administrator of a production database, with a
 * one-time link printed on the terminal. On the SQLite file of DATABASE_PATH, or (with
 * TEST_DATABASE_URL) on the PostgreSQL database of DATABASE_URL, as a deployment of several
 * instances runs it.
 */

const directory = mkdtempSync(join(tmpdir(), 'scorecourt-create-admin-'));
let t: TestApp | null = null;
let database: TestDatabase | null = null;
afterAll(async () => {
  await t?.close();
  await database?.drop();
});

const run = (...args: string[]) =>
  // The command compiled once for the run (tests/setup/compile-once.ts), as `npm run create-admin` runs it from dist/.
  spawnSync(process.execPath, [compiledEntry('server/cli/create-admin'), ...args], {
    cwd: projectRoot,
    encoding: 'utf8',
    env: {
      PATH: process.env.PATH,
      NODE_ENV: 'production',
      SESSION_SECRET: 's'.repeat(40),
      DATABASE_PATH: join(directory, 'test.sqlite'),
      ...(onPostgres ? { DATABASE_URL: database!.address } : {}),
      PUBLIC_URL: 'https://scorecourt.test',
    },
    timeout: 300_000,
  });

describe('create-admin', () => {
  it('creates an inactive administrator whose printed link sets the password; refuses a taken address', async () => {
    // An empty database: the command migrates it, as on a production database's first use.
    if (onPostgres) database = await createTestDatabase(directory, 'test.sqlite', { empty: true });
    const created = run('first.admin@tallowmere.test', '--name', 'First Admin');
    expect(created.status, created.stderr).toBe(0);
    const link = /https:\/\/scorecourt\.test\/accept\/([\w-]{43})/.exec(created.stdout);
    expect(link, created.stdout).not.toBeNull();
    const again = run('first.admin@tallowmere.test');
    expect(again.status).toBe(1);
    expect(again.stderr).toMatch(/already has a Scorecourt account/);
    expect(run('not-an-address').status).toBe(2);

    t = await buildTestApp({ seed: false, directory, config: onPostgres ? { databaseUrl: database!.address } : {} });
    const client = new TestClient(t.app);
    expect((await client.get(`/api/auth/tokens/${link![1]}`)).status).toBe(200);
    const accepted = await client.post(`/api/auth/tokens/${link![1]}/accept`, { password: 'a long enough password 1', name: 'First Admin' });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    const signIn = await new TestClient(t.app).signIn('first.admin@tallowmere.test', 'a long enough password 1');
    expect(signIn.status).toBe(200);
    expect(signIn.body.user.roles).toEqual(['admin']);
    // The link was printed, never queued as mail.
    // (COUNT(*) is a bigint, read as a string, on PostgreSQL.)
    expect(Number(((await t.dataSource.query('SELECT COUNT(*) AS n FROM "mail_messages"')) as { n: number | string }[])[0].n)).toBe(0);
  });
});
