import { mkdtempSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { hashPassword } from '../../server/auth/password';
import { Client, holdoutCsv, mapping, type Proc, start, stopAll } from './processes';
import { createTestDatabase, testDatabaseUrl } from '../setup/test-database';

/**
 * `npm run bench:queue` (builds the server, then runs this file with tsx; needs PostgreSQL: set
 * TEST_DATABASE_URL, e.g. after `source .ci/postgres.sh`): analyses per minute at 1,000,000
 * accounts with one and with two worker processes (`dist/server/worker.js`, one analysis at a
 * time each) on one PostgreSQL database, queued through one server that runs none itself. Each
 * configuration gets a fresh database, one upload of the same seeded holdout and BENCH_ANALYSES
 * comparisons of it (default 4; bootstrap BENCH_BOOTSTRAP replicates, default 200), timed from the
 * first queued to the last done. Printed: the figures, their ratio and the machine's load average
 * (on a shared machine only the ratio of one run means much). The engine already spreads the
 * bootstrap over every core, so a second worker gains only what one analysis leaves idle
 * (loading, ranking, storing).
 */

const rows = Number(process.env.BENCH_ROWS ?? 1_000_000);
const analyses = Number(process.env.BENCH_ANALYSES ?? 4);
const bootstrap = Number(process.env.BENCH_BOOTSTRAP ?? 200);
const password = 'bench-queue-password-1';

async function measure(workerCount: number, csv: Buffer): Promise<{ seconds: number; perMinute: number }> {
  const directory = mkdtempSync(join(tmpdir(), 'scorecourt-bench-queue-'));
  const database = await createTestDatabase(directory);
  const procs: Proc[] = [];
  try {
    const common = {
      DATABASE_URL: database.address,
      DATABASE_PATH: join(directory, 'unused.sqlite'),
      SESSION_SECRET: 'bench-queue-session-secret-that-is-long-enough',
      BCRYPT_COST: '4',
      LOG_LEVEL: 'warn',
    };
    const server = await start(
      'dist/server/index.js',
      { ...common, NODE_ENV: 'development', PORT: '0', HOST: '127.0.0.1', SERVE_CLIENT: 'false', DEMO_SCENARIO: 'false', ANALYSIS_IN_SERVER: 'false', WRITES_PER_MINUTE: '100000' },
      /running at http:\/\/localhost:(\d+)/,
    );
    procs.push(server);
    const db = new pg.Client({ connectionString: database.address });
    await db.connect();
    await db.query(`UPDATE "users" SET "passwordHash" = $1, "active" = true WHERE "email" = 'modeler@tallowmere.test'`, [await hashPassword(password, 4)]);
    await db.end();
    const client = new Client(`http://127.0.0.1:${server.match[1]}`);
    const signIn = await client.send('POST', '/api/auth/login', { email: 'modeler@tallowmere.test', password });
    if (signIn.status !== 200) throw new Error(`sign-in: ${signIn.status} ${await signIn.text()}`);
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(csv)]), 'bench.csv');
    const uploaded = await client.send('POST', '/api/holdouts', form);
    if (uploaded.status !== 201) throw new Error(`upload: ${uploaded.status} ${await uploaded.text()}`);
    const holdoutId = ((await uploaded.json()) as { id: number }).id;
    for (let i = 0; i < workerCount; i++) procs.push(await start('dist/server/worker.js', { ...common, ANALYSIS_CONCURRENCY: '1' }, /analysis worker \d+ is running/));

    const started = performance.now();
    const ids: number[] = [];
    for (let i = 0; i < analyses; i++) {
      const created = await client.send('POST', '/api/comparisons', { name: `Bench ${i}`, holdoutId, mapping, settings: { bootstrap, seed: 5 } });
      if (created.status !== 201) throw new Error(`comparison: ${created.status} ${await created.text()}`);
      ids.push(((await created.json()) as { id: number }).id);
    }
    for (;;) {
      const runs = await Promise.all(ids.map(async (id) => ((await (await client.get(`/api/comparisons/${id}`)).json()) as { runs: { status: string }[] }).runs[0]));
      if (runs.some((run) => run.status === 'failed')) throw new Error(`an analysis failed: ${JSON.stringify(runs)}`);
      if (runs.every((run) => run.status === 'done')) break;
      await new Promise((resolve) => setTimeout(resolve, 500));
    }
    const seconds = (performance.now() - started) / 1000;
    return { seconds, perMinute: (analyses * 60) / seconds };
  } finally {
    await stopAll(procs.reverse());
    await database.drop();
    rmSync(directory, { recursive: true, force: true });
  }
}

async function main(): Promise<void> {
  if (!testDatabaseUrl) throw new Error('bench:queue needs PostgreSQL: set TEST_DATABASE_URL (e.g. `source .ci/postgres.sh`)');
  const csv = holdoutCsv(rows, 7);
  const load = () => loadavg().map((value) => value.toFixed(1)).join(' ');
  console.log(`bench:queue: ${analyses} analyses of ${rows.toLocaleString('en')} accounts, ${bootstrap} bootstrap replicates; load average ${load()}`);
  const results: { workers: number; seconds: number; perMinute: number }[] = [];
  for (const workers of [1, 2]) {
    const result = await measure(workers, csv);
    results.push({ workers, ...result });
    console.log(`  ${workers} worker process${workers === 1 ? '' : 'es'}: ${result.seconds.toFixed(1)} s, ${result.perMinute.toFixed(2)} analyses per minute (load average ${load()})`);
  }
  console.log(`  two workers / one worker: ${(results[1].perMinute / results[0].perMinute).toFixed(2)}×`);
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
