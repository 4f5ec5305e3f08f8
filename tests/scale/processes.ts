import { type ChildProcess, spawn } from 'node:child_process';

/**
 * Processes and clients for the test and the benchmark of several instances
 * (two-instances.test.ts, queue-bench.ts): servers and workers started from dist/ as separate
 * processes, a browser-like client with its cookie and CSRF token, and a deterministic holdout.
 */

export interface Proc {
  child: ChildProcess;
  output: string;
}

export function start(file: string, env: Record<string, string>, ready: RegExp): Promise<Proc & { match: RegExpMatchArray }> {
  const child = spawn(process.execPath, [file], { env: { PATH: process.env.PATH ?? '', ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  const proc: Proc = { child, output: '' };
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${file} not ready in 120 s:\n${proc.output}`)), 120_000);
    const onData = (chunk: Buffer) => {
      proc.output += chunk.toString('utf8');
      const match = ready.exec(proc.output);
      if (match) {
        clearTimeout(timer);
        resolve({ ...proc, match, child, get output() { return proc.output; } });
      }
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', onData);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`${file} exited (${code}) before it was ready:\n${proc.output}`));
    });
  });
}

/** A browser-like client of one server: its cookie and CSRF token. */
export class Client {
  cookie = '';
  csrf = '';
  constructor(public base: string) {}

  /**
   * Takes the session cookie and CSRF token of an answer, once the answer has fully arrived: the
   * server stores a changed session (a new token after signing in) before it sends the last byte,
   * so a next request made on the headers alone could reach it before that session is stored (a
   * browser's code reads the body first).
   */
  private async remember(response: Response): Promise<void> {
    await response.clone().arrayBuffer();
    const set = response.headers.getSetCookie().find((value) => value.startsWith('scorecourt.sid='));
    if (set) this.cookie = set.split(';')[0];
    const token = response.headers.get('x-csrf-token');
    if (token) this.csrf = token;
  }

  async get(path: string): Promise<Response> {
    const response = await fetch(this.base + path, { headers: { Cookie: this.cookie }, signal: AbortSignal.timeout(60_000) });
    await this.remember(response);
    return response;
  }

  async send(method: string, path: string, body?: unknown | FormData): Promise<Response> {
    if (!this.csrf) this.csrf = ((await (await this.get('/api/auth/csrf')).json()) as { token: string }).token;
    const form = body instanceof FormData;
    const response = await fetch(this.base + path, {
      method,
      headers: { Cookie: this.cookie, 'X-CSRF-Token': this.csrf, ...(form || body === undefined ? {} : { 'Content-Type': 'application/json' }) },
      body: form ? body : body === undefined ? undefined : JSON.stringify(body),
      signal: AbortSignal.timeout(300_000),
    });
    await this.remember(response);
    return response;
  }
}

/** A deterministic holdout: two scores of one latent risk, the challenger sharper. */
export function holdoutCsv(n: number, seed: number): Buffer {
  let state = seed >>> 0;
  const random = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 4294967296;
  };
  const gauss = () => Math.sqrt(-2 * Math.log(random() + 1e-12)) * Math.cos(2 * Math.PI * random());
  const lines = ['account_id,bad,champion,challenger'];
  for (let i = 0; i < n; i++) {
    const risk = gauss();
    const bad = random() < 1 / (1 + Math.exp(-(-2.6 + 1.1 * risk))) ? 1 : 0;
    const champion = Math.round(600 - 40 * (risk + 0.9 * gauss()));
    const challenger = Math.round(600 - 40 * (risk + 0.6 * gauss()));
    lines.push(`A${i},${bad},${champion},${challenger}`);
  }
  return Buffer.from(lines.join('\n') + '\n', 'utf8');
}

export const mapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' }, id: 'account_id' };

/** Stops each process still running: SIGTERM, then SIGKILL after 15 s. */
export async function stopAll(procs: Proc[]): Promise<void> {
  for (const proc of procs) {
    if (proc.child.exitCode === null && proc.child.signalCode === null) {
      const exited = new Promise((resolve) => proc.child.once('exit', resolve));
      proc.child.kill('SIGTERM');
      await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 15_000))]);
      if (proc.child.exitCode === null && proc.child.signalCode === null) proc.child.kill('SIGKILL');
    }
  }
}
