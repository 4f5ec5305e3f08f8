import { spawnSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { projectRoot } from '@server/runtime';
import { buildTestApp, type TestApp } from './helpers/app';
import { TestClient } from './helpers/client';

/** `npm run create-admin -- EMAIL`: the first administrator of a production database, with a one-time link printed on the terminal. */

const directory = mkdtempSync(join(tmpdir(), 'scorecourt-create-admin-'));
let t: TestApp | null = null;
afterAll(async () => {
  await t?.close();
});

const run = (...args: string[]) =>
  spawnSync(process.execPath, ['--import', 'tsx', join(projectRoot, 'server/cli/create-admin.ts'), ...args], {
    cwd: projectRoot,
    encoding: 'utf8',
    env: { PATH: process.env.PATH, NODE_ENV: 'production', SESSION_SECRET: 's'.repeat(40), DATABASE_PATH: join(directory, 'test.sqlite'), PUBLIC_URL: 'https://scorecourt.test' },
    timeout: 60_000,
  });

describe('create-admin', () => {
  it('creates an inactive administrator whose printed link sets the password; refuses a taken address', async () => {
    const created = run('first.admin@tallowmere.test', '--name', 'First Admin');
    expect(created.status, created.stderr).toBe(0);
    const link = /https:\/\/scorecourt\.test\/accept\/([\w-]{43})/.exec(created.stdout);
    expect(link, created.stdout).not.toBeNull();
    const again = run('first.admin@tallowmere.test');
    expect(again.status).toBe(1);
    expect(again.stderr).toMatch(/already has a Scorecourt account/);
    expect(run('not-an-address').status).toBe(2);

    t = await buildTestApp({ seed: false, directory });
    const client = new TestClient(t.app);
    expect((await client.get(`/api/auth/tokens/${link![1]}`)).status).toBe(200);
    const accepted = await client.post(`/api/auth/tokens/${link![1]}/accept`, { password: 'a long enough password 1', name: 'First Admin' });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    const signIn = await new TestClient(t.app).signIn('first.admin@tallowmere.test', 'a long enough password 1');
    expect(signIn.status).toBe(200);
    expect(signIn.body.user.roles).toEqual(['admin']);
    // The link was printed, never queued as mail.
    expect(((await t.dataSource.query('SELECT COUNT(*) AS n FROM "mail_messages"')) as { n: number }[])[0].n).toBe(0);
  }, 120_000);
});
