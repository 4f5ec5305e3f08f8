import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { projectRoot } from '@server/runtime';
import { writeBenchHoldout } from './holdout';

/**
 * The service end to end at 1,000,000 rows, against the compiled server (`npm run build:server`
 * first, then `npx tsx bench/api.ts [continuous|points] [replicates]`): upload → comparison with
 * a mapping → analysis on the worker thread → report → swap sets on demand, with GET /api/health
 * polled every 50 ms while the analysis runs. The same seeded file as `npm run bench` (generated
 * once into $TMPDIR/scorecourt-bench). Figures, not a test: they depend on the machine and on what
 * else runs on it, so the load average and this process's own event-loop delay are printed too.
 */

const scores = process.argv[2] === 'points' ? 'points' : 'continuous';
const replicates = Number(process.argv[3] ?? 2000);
const rows = 1_000_000;

const dataDir = join(tmpdir(), 'scorecourt-bench');
const file = join(dataDir, `holdout-${rows}-${scores}.csv`);
if (!existsSync(file)) {
  mkdirSync(dataDir, { recursive: true });
  await writeBenchHoldout(file, { rows, seed: `bench-${rows}-${scores}`, scores });
}
const entry = join(projectRoot, 'dist/server/index.js');
if (!existsSync(entry)) throw new Error('build the server first: npm run build:server');

const dir = mkdtempSync(join(tmpdir(), 'scorecourt-api-bench-'));
const port = 3900 + Math.floor(Math.random() * 90);
const server = spawn(process.execPath, [entry], {
  env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', DATABASE_PATH: join(dir, 'db.sqlite'), SERVE_CLIENT: 'false', LOG_LEVEL: 'warn', BCRYPT_COST: '4', NODE_ENV: 'development', DEMO_SCENARIO: 'false' },
  stdio: ['ignore', 'pipe', 'inherit'],
});
await new Promise<void>((resolve) => server.stdout!.on('data', (data: Buffer) => String(data).includes('running at') && resolve()));

const base = `http://127.0.0.1:${port}/api`;
let cookie = '';
let csrf = '';
async function call(method: string, path: string, body?: RequestInit['body'], headers: Record<string, string> = {}): Promise<Response> {
  const response = await fetch(base + path, { method, body, headers: { cookie, 'x-csrf-token': csrf, ...headers } });
  for (const set of response.headers.getSetCookie()) if (set.startsWith('scorecourt.sid=')) cookie = set.split(';')[0];
  csrf = response.headers.get('x-csrf-token') ?? csrf;
  return response;
}
const json = { 'content-type': 'application/json' };
const ms = (start: number) => `${(performance.now() - start).toFixed(0)} ms`;

try {
  csrf = ((await (await call('GET', '/auth/csrf')).json()) as { token: string }).token;
  const login = await call('POST', '/auth/login', JSON.stringify({ email: 'modeler@tallowmere.test', password: 'scorecourt-demo' }), json);
  if (login.status !== 200) throw new Error(`sign-in: ${login.status}`);

  const bytes = readFileSync(file);
  const form = new FormData();
  form.append('file', new Blob([bytes]), `holdout-${rows}-${scores}.csv`);
  let start = performance.now();
  const upload = await call('POST', '/holdouts', form);
  const holdout = (await upload.json()) as { id: number; rowCount: number };
  const uploadMs = performance.now() - start;
  console.log(`upload ${(bytes.length / 1e6).toFixed(1)} MB, ${holdout.rowCount} rows: ${upload.status} in ${ms(start)} (to disk, scan on a worker, stored in chunks)`);

  const higherIs = scores === 'points' ? 'safer' : 'riskier';
  const mapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: higherIs, challenger: higherIs }, id: 'account_id', segments: ['channel'], exposure: 'loan_amount' };
  start = performance.now();
  const created = await call('POST', '/comparisons', JSON.stringify({ name: 'Bench', holdoutId: holdout.id, mapping, settings: { bootstrap: replicates, seed: 7 } }), json);
  const comparison = (await created.json()) as { id: number };
  const createMs = performance.now() - start;
  console.log(`comparison with the mapping (stored bytes read on a worker, typed-array columns stored): ${created.status} in ${ms(start)}`);

  const health: number[] = [];
  let running = true;
  const lag = monitorEventLoopDelay({ resolution: 10 });
  lag.enable();
  const poller = (async () => {
    while (running) {
      const at = performance.now();
      await (await fetch(`${base}/health`)).json();
      health.push(performance.now() - at);
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
  })();
  start = performance.now();
  let run: { status: string; error: string | null };
  for (;;) {
    run = ((await (await call('GET', `/comparisons/${comparison.id}`)).json()) as { runs: { status: string; error: string | null }[] }).runs[0];
    if (run.status === 'done' || run.status === 'failed') break;
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  const analysisMs = performance.now() - start;
  running = false;
  await poller;
  lag.disable();
  health.sort((a, b) => a - b);
  const at = (p: number) => health[Math.min(health.length - 1, Math.floor(p * health.length))].toFixed(1);
  console.log(`analysis, ${replicates} bootstrap replicates: ${run.status}${run.error ? ` (${run.error})` : ''} in ${(analysisMs / 1000).toFixed(1)} s`);
  console.log(`GET /api/health meanwhile: ${health.length} calls, median ${at(0.5)} ms, p99 ${at(0.99)} ms, max ${health[health.length - 1].toFixed(1)} ms`);
  console.log(`  (this process's own event-loop delay: p99 ${(lag.percentile(99) / 1e6).toFixed(1)} ms, max ${(lag.max / 1e6).toFixed(1)} ms; load average ${loadavg().map((v) => v.toFixed(1)).join(' ')})`);
  console.log(`upload → report, end to end: ${((uploadMs + createMs + analysisMs) / 1000).toFixed(1)} s`);

  start = performance.now();
  const report = await call('GET', `/comparisons/${comparison.id}/report`);
  console.log(`report: ${report.status}, ${(await report.text()).length} bytes in ${ms(start)}`);
  for (const body of [{ approvalRate: 0.7 }, { approvalRate: 0.6 }, { approvalRate: 0.8 }, { approvalRate: 0.5 }]) {
    start = performance.now();
    const swap = await call('POST', `/comparisons/${comparison.id}/swap`, JSON.stringify(body), json);
    await swap.json();
    console.log(`swap sets on demand ${JSON.stringify(body)}: ${swap.status} in ${ms(start)}`);
  }
} finally {
  server.kill('SIGTERM');
  await new Promise((resolve) => server.on('exit', resolve));
  rmSync(dir, { recursive: true, force: true });
}
