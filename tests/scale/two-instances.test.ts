import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, testDatabaseUrl, type TestDatabase } from '../setup/test-database';
import { Client, holdoutCsv, mapping, type Proc, start, stopAll } from './processes';

/**
 * `npm run test:scale`: two servers and two separate worker processes (`node dist/server/worker.js`)
 * on one PostgreSQL database (a fresh one on TEST_DATABASE_URL's server). Someone signs in through one
 * server and reads through the other; ten analyses are queued through both; one worker is killed
 * with SIGKILL in the middle of the large analysis; every analysis then ends exactly once, with
 * the report the same data and settings give uninterrupted, and the audit chain verifies.
 *
 * The large holdout has SCALE_ROWS accounts (default 1,000,000; CI may set fewer, see .ci/run).
 */

const rows = Number(process.env.SCALE_ROWS ?? 1_000_000);
// Much shorter than the large analysis: the live workers renew their leases (jobs/boss-queue.ts), so every
// analysis but the interrupted one must still end on its first attempt; the killed worker's run is taken over
// within about a lease and a supervisor round.
const leaseSeconds = Number(process.env.SCALE_LEASE_SECONDS ?? 20);
const password = 'scale-test-password-1';

let directory: string;
let database: TestDatabase;
const servers: (Proc & { base: string })[] = [];
const workers: Proc[] = [];

describe.runIf(testDatabaseUrl)(`two servers and two worker processes on one PostgreSQL (${rows.toLocaleString('en')} accounts)`, () => {
  beforeAll(async () => {
    directory = mkdtempSync(join(tmpdir(), 'scorecourt-scale-'));
    database = await createTestDatabase(directory);
    const common = {
      DATABASE_URL: database.address,
      DATABASE_PATH: join(directory, 'unused.sqlite'),
      SESSION_SECRET: 'scale-test-session-secret-that-is-long-enough',
      BCRYPT_COST: '4',
      LOG_LEVEL: 'info',
      ANALYSIS_LEASE_SECONDS: String(leaseSeconds),
    };
    const serverEnv = { ...common, NODE_ENV: 'development', PORT: '0', HOST: '127.0.0.1', SERVE_CLIENT: 'false', DEMO_SCENARIO: 'false', ANALYSIS_IN_SERVER: 'false' };
    // The first server migrates and adds the demo people; the second finds them.
    for (let i = 0; i < 2; i++) {
      const server = await start('dist/server/index.js', serverEnv, /running at http:\/\/localhost:(\d+)/);
      servers.push({ ...server, base: `http://127.0.0.1:${server.match[1]}` });
    }
    for (let i = 0; i < 2; i++) workers.push(await start('dist/server/worker.js', { ...common, ANALYSIS_CONCURRENCY: '1' }, /analysis worker \d+ is running/));
  }, 300_000);

  afterAll(async () => {
    await stopAll([...workers, ...servers]);
    await database?.drop();
    if (directory) rmSync(directory, { recursive: true, force: true });
  }, 120_000);

  it('signs in on one, reads on the other; ten analyses from both; a worker killed mid-run; each analysis once, as it gives alone', async () => {
    const [one, two] = servers.map((server) => new Client(server.base));
    // The demo people have no password set outside the demo: give the modeler one through the admin's one-time link.
    const db = new pg.Client({ connectionString: database.address });
    await db.connect();
    try {
      const { hashPassword } = await import('../../server/auth/password');
      await db.query(`UPDATE "users" SET "passwordHash" = $1, "active" = true WHERE "email" IN ('modeler@tallowmere.test', 'admin@tallowmere.test')`, [
        await hashPassword(password, 4),
      ]);

      // Signed in through server one (its CSRF token), read through server two with the same cookie.
      expect((await one.send('POST', '/api/auth/login', { email: 'modeler@tallowmere.test', password })).status).toBe(200);
      two.cookie = one.cookie;
      two.csrf = one.csrf;
      const me = (await (await two.get('/api/auth/me')).json()) as { user: { email: string } };
      expect(me.user.email).toBe('modeler@tallowmere.test');

      const upload = async (client: Client, bytes: Buffer, name: string) => {
        const form = new FormData();
        form.append('file', new Blob([new Uint8Array(bytes)]), name);
        const response = await client.send('POST', '/api/holdouts', form);
        expect(response.status, await response.clone().text()).toBe(201);
        return ((await response.json()) as { id: number }).id;
      };
      // Made before uploading: seconds of synchronous work between requests here once raced the
      // servers' closing of idle keep-alive connections (EPIPE; they now keep them 65 s: index.ts).
      const largeCsv = holdoutCsv(rows, 7);
      const smallCsv = holdoutCsv(5000, 11);
      const started = performance.now();
      const large = await upload(one, largeCsv, 'large.csv');
      const small = await upload(two, smallCsv, 'small.csv');
      const uploadSeconds = (performance.now() - started) / 1000;

      const create = async (client: Client, name: string, holdoutId: number, bootstrap: number) => {
        const response = await client.send('POST', '/api/comparisons', { name, holdoutId, mapping, settings: { bootstrap, seed: 5 } });
        expect(response.status, await response.clone().text()).toBe(201);
        return ((await response.json()) as { id: number }).id;
      };
      const queuedAt = performance.now();
      type Detail = { state: string; runs: { id: number; status: string; attempts: number; progress: number }[] };
      const detail = async (client: Client, id: number) => (await (await client.get(`/api/comparisons/${id}`)).json()) as Detail;
      // The large analysis twice (one will lose its worker), eight small ones; from both servers. The large
      // ones take the default 2,000 replicates so that the first is still computing when it is caught: on a
      // quiet machine 200 replicates of a million accounts ended in under five seconds, before the
      // comparisons after it were even created (a CI run once missed it that way).
      const interrupted = await create(one, 'Large, interrupted', large, 2000);
      // Watched from the moment it is queued, while the other comparisons are created.
      const watching = (async () => {
        for (const deadline = Date.now() + 600_000; ; ) {
          const run = (await detail(two, interrupted)).runs[0];
          // Past loading (the first progress the engine reports): the analysis is in its computations.
          if (run?.status === 'running' && run.progress > 0) return run.id;
          if (run && (run.status === 'done' || run.status === 'failed')) throw new Error(`the large analysis ended before it was caught running: ${JSON.stringify(run)}`);
          if (Date.now() > deadline) throw new Error(`the large analysis did not get under way: ${JSON.stringify(run)}`);
          await new Promise((resolve) => setTimeout(resolve, 100));
        }
      })();
      watching.catch(() => undefined); // awaited below; not an unhandled rejection meanwhile
      const largeIds = [interrupted, await create(two, 'Large, uninterrupted', large, 2000)];
      const smallIds: number[] = [];
      for (let i = 0; i < 8; i++) smallIds.push(await create(i % 2 ? one : two, `Small ${i}`, small, 50));

      // The first large run under way: progress is visible through either server.
      const runId = await watching;
      const holder = workers.find((worker) => worker.output.includes(`analysis run ${runId}: started`));
      expect(holder, 'the worker running the large analysis').toBeDefined();
      holder!.child.kill('SIGKILL');
      const killedAt = performance.now();

      // Everything ends, the killed run on the other worker after its lease.
      const all = [...largeIds, ...smallIds];
      for (const deadline = Date.now() + 1_800_000; ; ) {
        const runs = await Promise.all(all.map(async (id) => (await detail(one, id)).runs[0]));
        if (runs.every((run) => run.status === 'done' || run.status === 'failed')) break;
        if (Date.now() > deadline) throw new Error(`not every analysis ended: ${JSON.stringify(runs)}`);
        await new Promise((resolve) => setTimeout(resolve, 1000));
      }
      const finishedAt = performance.now();

      for (const id of all) {
        const shown = await detail(two, id);
        expect(shown.runs, `comparison ${id}`).toHaveLength(1);
        expect(shown.runs[0].status).toBe('done');
        expect(shown.runs[0].attempts, `comparison ${id}`).toBe(id === largeIds[0] ? 2 : 1);
      }
      const report = async (id: number) => JSON.parse(await (await one.get(`/api/comparisons/${id}/report`)).text()) as unknown;
      expect(await report(largeIds[0])).toEqual(await report(largeIds[1]));
      const smallReport = await report(smallIds[0]);
      for (const id of smallIds.slice(1)) expect(await report(id)).toEqual(smallReport);

      // Nothing duplicated: one run per comparison, each stored done once.
      const done = await db.query(`SELECT "targetId", COUNT(*)::int AS n FROM "audit_events" WHERE "action" = 'analysis.done' GROUP BY "targetId"`);
      expect(done.rows.map((row: { n: number }) => row.n)).toEqual(all.map(() => 1));
      const runs = await db.query(`SELECT COUNT(*)::int AS n FROM "analysis_runs"`);
      expect(runs.rows[0].n).toBe(10);

      // The audit chain verifies (as an administrator, through server two).
      const admin = new Client(two.base);
      expect((await admin.send('POST', '/api/auth/login', { email: 'admin@tallowmere.test', password })).status).toBe(200);
      const verifying = await admin.send('POST', '/api/audit/verify');
      const verified = await verifying.text();
      expect(verifying.status, verified).toBe(200);
      expect((JSON.parse(verified) as { ok: boolean }).ok, verified).toBe(true);

      console.log(
        `[scale] ${rows.toLocaleString('en')} accounts: uploads ${uploadSeconds.toFixed(1)} s; ten analyses on two workers, one killed ` +
          `${((killedAt - queuedAt) / 1000).toFixed(1)} s after queueing, all done ${((finishedAt - queuedAt) / 1000).toFixed(1)} s after queueing ` +
          `(lease ${leaseSeconds} s)`,
      );
    } catch (error) {
      // What the processes said, to see why.
      const tails = [...servers, ...workers].map((proc, i) => `--- process ${i} (exit ${proc.child.exitCode ?? proc.child.signalCode ?? 'running'}):\n${proc.output.slice(-3000)}`);
      throw new Error(`${error instanceof Error ? error.message : String(error)}\n${tails.join('\n')}`, { cause: error });
    } finally {
      await db.end();
    }
  });
});
