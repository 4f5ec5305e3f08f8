import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { compiledEntry } from '../setup/compiled';

/**
 * server/index.ts as `npm start` runs it (compiled, from this run's build: tests/setup/compile-once.ts): an empty
 * database is migrated and seeded, the URL and demo sign-ins are printed, SIGTERM stops it
 * cleanly, and a restart on the same database keeps the session. Only the demo people are added
 * here (DEMO_SCENARIO=false): tests/api/demo-seed.test.ts runs the demo scenario, and the browser
 * test of the README's screenshots starts the built server with it.
 */

const directory = mkdtempSync(join(tmpdir(), 'scorecourt-start-'));
const children: ChildProcess[] = [];
afterAll(() => {
  // A failed assertion must not leave a server running.
  for (const child of children) if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  rmSync(directory, { recursive: true, force: true });
});

interface Running {
  child: ChildProcess;
  url: string;
  output: () => string;
}

function start(): Promise<Running> {
  const child = spawn(process.execPath, [compiledEntry('server/index')], {
    env: { ...process.env, NODE_ENV: 'development', PORT: '0', DATABASE_PATH: join(directory, 'db.sqlite'), BCRYPT_COST: '4', SMTP_URL: '', LOG_LEVEL: 'warn', DEMO_SCENARIO: 'false' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  let text = '';
  child.stdout!.on('data', (chunk: Buffer) => (text += chunk.toString()));
  child.stderr!.on('data', (chunk: Buffer) => (text += chunk.toString()));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start:\n${text}`)), 20_000);
    child.stdout!.on('data', () => {
      const match = /running at (http:\/\/localhost:\d+)/.exec(text);
      if (match && text.includes('Demo sign-ins')) {
        clearTimeout(timer);
        resolve({ child, url: match[1], output: () => text });
      }
    });
    child.once('exit', (code) => reject(new Error(`server exited with ${code}:\n${text}`)));
  });
}

function stop(running: Running): Promise<number | null> {
  return new Promise((resolve) => {
    running.child.once('exit', (code) => resolve(code));
    running.child.kill('SIGTERM');
  });
}

async function signIn(url: string): Promise<string> {
  const csrf = await fetch(`${url}/api/auth/csrf`);
  const cookie = csrf.headers.get('set-cookie')!.split(';')[0];
  const { token } = (await csrf.json()) as { token: string };
  const login = await fetch(`${url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie },
    body: JSON.stringify({ email: 'committee@tallowmere.test', password: 'scorecourt-demo' }),
  });
  expect(login.status).toBe(200);
  return login.headers.get('set-cookie')!.split(';')[0];
}

describe('server start-up', () => {
  it('starts on an empty database, prints the demo sign-ins, stops on SIGTERM and keeps sessions across a restart', async () => {
    const first = await start();
    expect(first.output()).toMatch(/The database was empty: added 6 demo people/);
    for (const email of ['admin', 'modeler', 'analyst', 'policy', 'committee', 'committee2']) expect(first.output()).toContain(`${email}@tallowmere.test`);
    expect(first.output()).toContain('scorecourt-demo');
    expect(first.output()).toContain('local mail sink');
    expect(await (await fetch(`${first.url}/api/health`)).json()).toEqual({ ok: true });
    const cookie = await signIn(first.url);
    expect(await stop(first)).toBe(0);

    const second = await start();
    expect(second.output()).not.toMatch(/database was empty/);
    const me = await fetch(`${second.url}/api/auth/me`, { headers: { cookie } });
    expect(me.status).toBe(200);
    expect(((await me.json()) as { user: { email: string } }).user.email).toBe('committee@tallowmere.test');
    expect(await stop(second)).toBe(0);
  });
});
