import { type ChildProcess, spawn } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { projectRoot } from '@server/runtime';
import { freePort } from '../e2e/helpers/server';
import { record } from './helpers/figures';
import { Session } from './helpers/session';

/**
 * The server's log target fails: stdout and stderr on a full disk (/dev/full answers every write
 * with ENOSPC, as a log file on a full partition does), or a pipe whose reader has gone (EPIPE).
 * The server must start, answer, log through it, and still answer afterwards. Before the fix
 * (server/log.ts) the first line it could not write ended the process: Node turns the stream's
 * 'error' event into an uncaught exception.
 */

const entry = path.join(projectRoot, 'dist/server/index.js');
let child: ChildProcess | null = null;
let dir = '';

afterEach(() => {
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  child = null;
  if (dir) rmSync(dir, { recursive: true, force: true });
  dir = '';
});

async function start(stdio: 'dev-full' | 'pipe'): Promise<{ url: string; child: ChildProcess }> {
  if (!existsSync(entry)) throw new Error('dist/server/index.js is missing: run `npm run build` first.');
  const port = await freePort();
  dir = mkdtempSync(path.join(tmpdir(), 'scorecourt-log-'));
  const full = stdio === 'dev-full' ? openSync('/dev/full', 'w') : null;
  child = spawn(process.execPath, [entry], {
    cwd: projectRoot,
    env: {
      PATH: process.env.PATH,
      NODE_ENV: 'development',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATABASE_PATH: path.join(dir, 'db.sqlite'),
      BCRYPT_COST: '4',
      LOG_LEVEL: 'debug',
      SERVE_CLIENT: 'false',
      DEMO_SCENARIO: 'false',
    },
    stdio: full === null ? ['ignore', 'pipe', 'pipe'] : ['ignore', full, full],
  });
  if (full !== null) closeSync(full);
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null || child.signalCode !== null) throw new Error(`the server exited (${child.exitCode ?? child.signalCode}) before answering`);
    try {
      if ((await fetch(`${url}/api/health`)).ok) return { url, child };
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error('the server did not answer within 60 s');
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** Requests that make the server log (warnings and errors: a reset for an unknown address, a wrong sign-in, a 404 to a bad route…). */
async function makeItLog(url: string): Promise<number> {
  let logged = 0;
  const session = new Session(url);
  for (let i = 0; i < 40; i++) {
    await session.request('POST', '/api/auth/password-reset', { email: `nobody-${i}@tallowmere.test` });
    await session.request('POST', '/api/auth/login', { email: `someone-${i}@tallowmere.test`, password: 'wrong' });
    logged += 2;
  }
  await session.signIn('modeler@tallowmere.test');
  return logged;
}

describe('a log target that fails', () => {
  it('on a full disk (ENOSPC on every line): the server keeps serving', async () => {
    const { url, child: server } = await start('dev-full');
    const requests = await makeItLog(url);
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect(server.exitCode).toBeNull();
    expect((await fetch(`${url}/api/health`)).status).toBe(200);
    record('faults: log on a full disk', { requests, alive: server.exitCode === null });
  });

  it('on a pipe whose reader has gone (EPIPE): the server keeps serving', async () => {
    const { url, child: server } = await start('pipe');
    server.stdout!.destroy();
    server.stderr!.destroy();
    const requests = await makeItLog(url);
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect(server.exitCode).toBeNull();
    expect((await fetch(`${url}/api/health`)).status).toBe(200);
    record('faults: log pipe closed', { requests, alive: server.exitCode === null });
  });
});
