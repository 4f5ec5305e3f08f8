/**
 * Starts the compiled server (`dist/server/index.js`, from `npm run build`) on a free port with a
 * temporary SQLite file, and waits until GET /api/health answers. It builds nothing itself.
 */
import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const repoRoot = fileURLToPath(new URL('../../..', import.meta.url));
const entry = path.join(repoRoot, 'dist/server/index.js');

export interface RunningServer {
  url: string;
  port: number;
  databasePath: string;
  /** Everything the server printed so far (stdout and stderr), for failure messages. */
  output: () => string;
  stop: () => Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.unref();
    probe.on('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

function exited(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) resolve();
    else child.once('exit', () => resolve());
  });
}

export async function startServer(options: { env?: Record<string, string>; timeoutMs?: number } = {}): Promise<RunningServer> {
  if (!existsSync(entry)) throw new Error(`${path.relative(repoRoot, entry)} is missing: run \`npm run build\` first (npm run test:e2e does).`);
  const port = await freePort();
  const dir = await mkdtemp(path.join(tmpdir(), 'scorecourt-e2e-'));
  const databasePath = path.join(dir, 'scorecourt.sqlite');
  // Only the demo people unless a test asks for the demo's comparisons too (DEMO_SCENARIO: 'true').
  const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'development', PORT: String(port), DATABASE_PATH: databasePath, DEMO_SCENARIO: 'false', ...options.env };
  delete env.SMTP_URL; // the server's own SMTP sink captures mail into the outbox
  if (options.env?.SMTP_URL) env.SMTP_URL = options.env.SMTP_URL;

  let log = '';
  const child = spawn(process.execPath, [entry], { cwd: repoRoot, env, stdio: ['ignore', 'pipe', 'pipe'] });
  child.stdout?.on('data', (chunk: Buffer) => (log += chunk.toString()));
  child.stderr?.on('data', (chunk: Buffer) => (log += chunk.toString()));

  const url = `http://127.0.0.1:${port}`;
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 5000);
      await exited(child);
      clearTimeout(timer);
    }
    await rm(dir, { recursive: true, force: true });
  };

  const deadline = Date.now() + (options.timeoutMs ?? 30_000);
  while (Date.now() < deadline) {
    if (child.exitCode !== null) {
      await stop();
      throw new Error(`The server exited with code ${child.exitCode} before answering /api/health:\n${log}`);
    }
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok && ((await response.json()) as { ok?: boolean }).ok === true) {
        return { url, port, databasePath, output: () => log, stop };
      }
    } catch {
      // not listening yet
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  await stop();
  throw new Error(`The server did not answer /api/health within ${options.timeoutMs ?? 30_000} ms:\n${log}`);
}
