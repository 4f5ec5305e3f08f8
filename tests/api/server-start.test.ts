import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, onTestFailed } from 'vitest';
import { compiledEntry } from '../setup/compiled';

/**
 * server/index.ts as `npm start` runs it (compiled, from this run's build: tests/setup/compile-once.ts): an empty
 * database is migrated and seeded, the URL and demo sign-ins are printed, SIGTERM stops it
 * cleanly, and a restart on the same database keeps the session. Only the demo people are added
 * here (DEMO_SCENARIO=false): tests/reliability/demo-seed.test.ts runs the demo scenario, and the browser
 * test of the README's screenshots starts the built server with it.
 */

const directory = mkdtempSync(join(tmpdir(), 'scorecourt-start-'));
const children: ChildProcess[] = [];
const outputs: (() => string)[] = [];
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
  // No clock of its own: on a loaded machine start-up takes what it takes; the test's timeout
  // bounds it, and a failure prints what the server said (onTestFailed below).
  outputs.push(() => text);
  return new Promise((resolve, reject) => {
    child.stdout!.on('data', () => {
      const match = /running at (http:\/\/localhost:\d+)/.exec(text);
      if (match && text.includes('Demo sign-ins')) resolve({ child, url: match[1], output: () => text });
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
    onTestFailed(() => console.error(`What the server printed:\n${outputs.map((output) => output()).join('\n---\n')}`));
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

  it('refuses a bad configuration before opening anything, as the worker process does (server/start-up.ts)', () => {
    const run = (entry: string, env: Record<string, string>) =>
      spawnSync(process.execPath, [compiledEntry(entry)], { env: { ...process.env, DATABASE_PATH: join(directory, 'refused.sqlite'), LOG_LEVEL: 'warn', ...env }, encoding: 'utf8' });
    const server = run('server/index', { PORT: 'eighty' });
    expect(server.status).toBe(1);
    expect(server.stderr).toMatch(/PORT: /);
    const worker = run('server/worker', { PORT: 'eighty', DATABASE_URL: '' });
    expect(worker.status).toBe(1);
    expect(worker.stderr).toMatch(/PORT: /);
    // The worker needs the shared PostgreSQL database; without one it names the setting.
    const alone = run('server/worker', { DATABASE_URL: '' });
    expect(alone.status).toBe(1);
    expect(alone.stderr).toContain('DATABASE_URL: required by `npm run worker`');
    expect(existsSync(join(directory, 'refused.sqlite'))).toBe(false);
  });
});
