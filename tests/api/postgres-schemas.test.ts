import { comparisonDetailSchema } from '@shared/comparisons';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyAuditChain } from '@server/audit/audit';
import { analysisHandlers } from '@server/comparisons/analysis-handlers';
import { BossQueue } from '@server/jobs/boss-queue';
import { JobRunner } from '@server/jobs/runner';
import { createLogger } from '@server/log';
import { createTestDatabase, onPostgres, type TestDatabase } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs } from './helpers/client';
import { sample2k, sampleMapping, uploadFile } from './helpers/holdouts';

/**
 * Two deployments sharing one PostgreSQL database, each in a schema of its own chosen through
 * DATABASE_URL's search_path (`?options=-c search_path=<schema>`), as README "Running several
 * instances" allows: each migrates, stores and queues in its own schema (pg-boss in
 * `<schema>_pgboss`, boss-queue.ts), and neither sees the other's data, people or audit chain.
 * Nothing lands in `public`.
 */

const schemas = ['deploy_north', 'deploy_south'] as const;
let database: TestDatabase;
let directory: string;
const apps: TestApp[] = [];

/** The database's address with the deployment's schema first in the search path. */
const inSchema = (address: string, schema: string) => `${address}?options=${encodeURIComponent(`-c search_path=${schema}`)}`;

async function onDatabase<T>(sql: string, params: unknown[] = []): Promise<T[]> {
  const client = new pg.Client({ connectionString: database.address });
  await client.connect();
  try {
    return (await client.query(sql, params)).rows as T[];
  } finally {
    await client.end();
  }
}

const tablesIn = async (schema: string) =>
  (await onDatabase<{ table_name: string }>('SELECT table_name FROM information_schema.tables WHERE table_schema = $1', [schema])).map((row) => row.table_name);

describe.runIf(onPostgres)('two deployments in schemas of one database', () => {
  beforeAll(async () => {
    directory = mkdtempSync(join(tmpdir(), 'scorecourt-schemas-'));
    database = await createTestDatabase(directory, 'unused.sqlite', { empty: true });
    for (const schema of schemas) await onDatabase(`CREATE SCHEMA ${schema}`);
    // One after the other: each migrates its own schema and seeds its own demo people.
    for (const schema of schemas) apps.push(await buildTestApp({ config: { databaseUrl: inSchema(database.address, schema) } }));
  }, 240_000);
  afterAll(async () => {
    for (const app of apps) await app.close();
    await database?.drop();
    rmSync(directory, { recursive: true, force: true });
  });

  it('migrates each schema and leaves public empty', async () => {
    const [north, south] = await Promise.all(schemas.map(tablesIn));
    expect(north).toContain('comparisons');
    expect(north).toContain('audit_events');
    expect(north).toContain('migrations');
    expect([...south].sort()).toEqual([...north].sort());
    expect(await tablesIn('public')).toEqual([]);
  });

  it('keeps each deployment’s data, queue and audit chain to itself', async () => {
    const [north, south] = apps;
    const modeler = await signedInAs(north.app, 'modeler');
    const upload = await uploadFile(modeler, sample2k(), 'sample-2k.csv');
    expect(upload.status, JSON.stringify(upload.body)).toBe(201);
    // The app's in-process queue gives way to pg-boss, as on a server with DATABASE_URL.
    await north.jobs.stop();
    const created = await modeler.post('/api/comparisons', { name: 'North only', holdoutId: upload.body.id as number, mapping: sampleMapping, settings: { bootstrap: 20, seed: 3 } });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const id = created.body.id as number;

    const log = createLogger('silent');
    const runner = new JobRunner({
      dataSource: north.dataSource,
      databasePath: north.config.databaseUrl!,
      concurrency: 1,
      log,
      handlers: analysisHandlers({ dataSource: north.dataSource }),
      takesQueuedRuns: false,
    });
    const queue = new BossQueue({ dataSource: north.dataSource, databaseUrl: north.config.databaseUrl!, runner, log, workers: 1, leaseSeconds: 600, pollSeconds: 0.5, superviseSeconds: 1 });
    await queue.start();
    try {
      queue.kick();
      await queue.whenIdle(180_000);
    } finally {
      await queue.stop();
    }
    expect(comparisonDetailSchema.parse((await modeler.get(`/api/comparisons/${id}`)).body).state).toBe('analysed');

    // pg-boss kept its tables beside the deployment's schema, not in the shared `pgboss`.
    const bossSchemas = (await onDatabase<{ schema_name: string }>("SELECT schema_name FROM information_schema.schemata WHERE schema_name LIKE '%pgboss'")).map((row) => row.schema_name);
    expect(bossSchemas).toEqual(['deploy_north_pgboss']);
    expect(await tablesIn('deploy_north_pgboss')).toContain('job');

    // The other deployment has its own people (same demo e-mails, other rows) and none of this data.
    const southModeler = await signedInAs(south.app, 'modeler');
    expect((await southModeler.get('/api/comparisons')).body).toMatchObject({ items: [] });
    expect((await southModeler.get(`/api/comparisons/${id}`)).status).toBe(404);
    const [northRows] = await onDatabase<{ n: string }>('SELECT COUNT(*) AS n FROM deploy_north.audit_events');
    const [southRows] = await onDatabase<{ n: string }>('SELECT COUNT(*) AS n FROM deploy_south.audit_events');
    expect(Number(northRows.n)).toBeGreaterThan(Number(southRows.n));
    for (const app of apps) expect((await verifyAuditChain(app.dataSource)).ok).toBe(true);
  }, 240_000);
});
