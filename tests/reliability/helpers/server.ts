/**
 * The compiled server (`dist/server/index.js`, from `npm run build`) as a child process on a free
 * loopback port, with its database in a folder the test owns, so it can be killed (SIGKILL) and
 * started again on the same database. Everything it prints is kept for failure messages.
 */
import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { freePort } from '../../e2e/helpers/server';
import { projectRoot } from '@server/runtime';

const entry = path.join(projectRoot, 'dist/server/index.js');

export interface CompiledServer {
  url: string;
  port: number;
  dir: string;
  databasePath: string;
  uploadDir: string;
  pid: number;
  /** Everything printed since the first start (stdout and stderr). */
  output: () => string;
  /** Sends the signal and waits for the process to end; resolves with its exit code or signal. */
  kill: (signal?: NodeJS.Signals) => Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  /**
   * Starts the server again on the same database and port (after kill or stop); `fileSizeLimitBytes`
   * (null: none) caps every file the process writes, as a full disk would (ulimit -f).
   */
  restart: (env?: Record<string, string>, limits?: { fileSizeLimitBytes?: number | null }) => Promise<void>;
  /** SIGTERM (SIGKILL after 10 s) and, unless `keep`, removes the folder. */
  stop: (options?: { keep?: boolean }) => Promise<void>;
}

export interface StartOptions {
  env?: Record<string, string>;
  /** Flags for node itself, before the entry point (e.g. --cpu-prof). */
  nodeArgs?: string[];
  dir?: string;
  timeoutMs?: number;
  /**
   * The largest file the server may write (RLIMIT_FSIZE through `ulimit -f`, with SIGXFSZ ignored
   * so a write past it fails with EFBIG as on a full disk, instead of killing the process).
   */
  fileSizeLimitBytes?: number | null;
}

/** The command that starts node, under a file-size limit when one is given. */
function command(args: string[], fileSizeLimitBytes: number | null | undefined): [string, string[]] {
  if (fileSizeLimitBytes === null || fileSizeLimitBytes === undefined) return [process.execPath, args];
  const quoted = [process.execPath, ...args].map((arg) => `'${arg.replaceAll("'", `'\\''`)}'`).join(' ');
  return ['/bin/sh', ['-c', `trap '' XFSZ; ulimit -f ${Math.ceil(fileSizeLimitBytes / 512)} && exec ${quoted}`]];
}

function exited(child: ChildProcess): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) resolve({ code: child.exitCode, signal: child.signalCode });
    else child.once('exit', (code, signal) => resolve({ code, signal }));
  });
}

/** The environment of a test server: development, quick bcrypt, quiet logs, loopback only, no demo comparisons. */
function baseEnv(port: number, databasePath: string, extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    TMPDIR: process.env.TMPDIR,
    NODE_ENV: 'development',
    HOST: '127.0.0.1',
    PORT: String(port),
    DATABASE_PATH: databasePath,
    BCRYPT_COST: '4',
    LOG_LEVEL: 'warn',
    SERVE_CLIENT: 'false',
    // The demo people only, not the demo's comparisons (as the browser tests' server helper).
    DEMO_SCENARIO: 'false',
    // The suites send thousands of changes as one person; the limit itself is tested in tests/api/write-limits.test.ts.
    WRITES_PER_MINUTE: '1000000',
    ...extra,
  };
  for (const [key, value] of Object.entries(env)) if (value === undefined || value === '') delete env[key];
  return env;
}

export async function startCompiled(options: StartOptions = {}): Promise<CompiledServer> {
  if (!existsSync(entry)) throw new Error('dist/server/index.js is missing: run `npm run build` first (npm run test:reliability does).');
  const port = await freePort();
  const dir = options.dir ?? mkdtempSync(path.join(tmpdir(), 'scorecourt-reliability-'));
  const databasePath = path.join(dir, 'scorecourt.sqlite');
  let log = '';
  let child: ChildProcess | null = null;
  const url = `http://127.0.0.1:${port}`;
  let env = options.env ?? {};
  let fileSizeLimitBytes = options.fileSizeLimitBytes ?? null;

  const launch = async () => {
    log += `\n--- start (pid pending) ---\n`;
    const [file, args] = command([...(options.nodeArgs ?? []), entry], fileSizeLimitBytes);
    child = spawn(file, args, { cwd: projectRoot, env: baseEnv(port, databasePath, env), stdio: ['ignore', 'pipe', 'pipe'] });
    child.stdout?.on('data', (chunk: Buffer) => (log += chunk.toString()));
    child.stderr?.on('data', (chunk: Buffer) => (log += chunk.toString()));
    const deadline = Date.now() + (options.timeoutMs ?? 30_000);
    while (Date.now() < deadline) {
      if (child.exitCode !== null || child.signalCode !== null) throw new Error(`The server exited (${child.exitCode ?? child.signalCode}) before answering /api/health:\n${log.slice(-3000)}`);
      try {
        const response = await fetch(`${url}/api/health`);
        if (response.ok) return;
      } catch {
        // not listening yet
      }
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    child.kill('SIGKILL');
    throw new Error(`The server did not answer /api/health within ${options.timeoutMs ?? 30_000} ms:\n${log.slice(-3000)}`);
  };
  await launch();

  const server: CompiledServer = {
    url,
    port,
    dir,
    databasePath,
    uploadDir: path.join(dir, 'uploads'),
    get pid() {
      return child?.pid ?? -1;
    },
    output: () => log,
    kill: async (signal = 'SIGKILL') => {
      const current = child!;
      if (current.exitCode !== null || current.signalCode !== null) return { code: current.exitCode, signal: current.signalCode };
      current.kill(signal);
      return exited(current);
    },
    restart: async (extra, limits) => {
      if (extra) env = { ...env, ...extra };
      if (limits && limits.fileSizeLimitBytes !== undefined) fileSizeLimitBytes = limits.fileSizeLimitBytes;
      await launch();
    },
    stop: async ({ keep = false } = {}) => {
      const current = child;
      if (current && current.exitCode === null && current.signalCode === null) {
        current.kill('SIGTERM');
        const timer = setTimeout(() => current.kill('SIGKILL'), 10_000);
        await exited(current);
        clearTimeout(timer);
      }
      if (!keep && !options.dir) rmSync(dir, { recursive: true, force: true });
    },
  };
  return server;
}

/** Runs the compiled server with `env` and waits for it to exit by itself (a refused start). */
export async function startExpectingExit(env: Record<string, string>, timeoutMs = 15_000): Promise<{ code: number | null; output: string; ms: number }> {
  const port = await freePort();
  const dir = mkdtempSync(path.join(tmpdir(), 'scorecourt-reliability-start-'));
  const started = performance.now();
  const child = spawn(process.execPath, [entry], { cwd: projectRoot, env: baseEnv(port, path.join(dir, 'db.sqlite'), env), stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
  const { code } = await exited(child);
  clearTimeout(timer);
  rmSync(dir, { recursive: true, force: true });
  return { code, output, ms: performance.now() - started };
}
