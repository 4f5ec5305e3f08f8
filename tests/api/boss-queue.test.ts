import { comparisonDetailSchema } from '@shared/comparisons';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditDetails } from '@server/audit/audit';
import { analysisHandlers } from '@server/comparisons/analysis-handlers';
import { openDatabase } from '@server/db/data-source';
import { AnalysisRun, AuditEvent } from '@server/db/entities/index';
import { BossQueue } from '@server/jobs/boss-queue';
import { JobRunner } from '@server/jobs/runner';
import { createLogger } from '@server/log';
import { onPostgres } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { sample2k, sampleMapping, uploadFile } from './helpers/holdouts';

/**
 * The analysis queue on pg-boss (PostgreSQL only): two "instances" — each its own data source,
 * pool and pg-boss — share the queue. Every run ends exactly once with the report it gives alone;
 * a worker that goes silent mid-run (as a killed process does) has its run taken over by another
 * once its lease has passed. Runs are real (the 2,000-row sample, 40 bootstrap replicates).
 * The kill of a real worker process is in tests/scale/ (`npm run test:scale`).
 */

let t: TestApp;
let other: DataSource;
let modeler: TestClient;
let holdoutId: number;
const settings = { bootstrap: 40, seed: 9 };

describe.runIf(onPostgres)('the analysis queue on pg-boss', () => {
  beforeAll(async () => {
    t = await buildTestApp();
    // The app's own in-process queue is stopped: the pg-boss queues below take the runs.
    await t.jobs.stop();
    other = await openDatabase(t.config.databaseUrl!);
    modeler = await signedInAs(t.app, 'modeler');
    holdoutId = (await uploadFile(modeler, sample2k(), 'sample-2k.csv')).body.id as number;
  });
  afterAll(async () => {
    await other?.destroy();
    await t?.close();
  });

  function bossQueue(dataSource: DataSource, options: { workerPath?: string; leaseSeconds?: number } = {}): BossQueue {
    const log = createLogger('silent');
    const runner = new JobRunner({
      dataSource,
      databasePath: t.config.databaseUrl!,
      concurrency: 1,
      log,
      handlers: analysisHandlers({ dataSource }),
      takesQueuedRuns: false,
      workerPath: options.workerPath,
    });
    return new BossQueue({ dataSource, databaseUrl: t.config.databaseUrl!, runner, log, workers: 1, leaseSeconds: options.leaseSeconds ?? 600, pollSeconds: 0.5, superviseSeconds: 1 });
  }

  async function createComparison(name: string): Promise<number> {
    const response = await modeler.post('/api/comparisons', { name, holdoutId, mapping: sampleMapping, settings });
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    return response.body.id as number;
  }
  const detail = async (id: number) => comparisonDetailSchema.parse((await modeler.get(`/api/comparisons/${id}`)).body);
  const actions = async (id: number) =>
    (await t.dataSource.getRepository(AuditEvent).find({ where: { targetType: 'comparison', targetId: String(id) }, order: { id: 'ASC' } })).map((event) => ({
      action: event.action,
      details: auditDetails(event),
    }));
  const reportOf = async (id: number) => JSON.parse((await modeler.get(`/api/comparisons/${id}/report`)).text) as unknown;

  it('runs every queued analysis exactly once across two instances, each with the report it gives alone', async () => {
    const ids: number[] = [];
    for (let i = 0; i < 4; i++) ids.push(await createComparison(`Shared queue ${i}`));
    const a = bossQueue(t.dataSource);
    const b = bossQueue(other);
    await Promise.all([a.start(), b.start()]);
    try {
      // Queued again from both instances: duplicates must not run twice.
      a.kick();
      b.kick();
      await a.whenIdle(180_000);
    } finally {
      await Promise.all([a.stop(), b.stop()]);
    }
    const reference = await reportOf(ids[0]);
    for (const id of ids) {
      const shown = await detail(id);
      expect(shown.state).toBe('analysed');
      expect(shown.runs).toHaveLength(1);
      expect(shown.runs[0]).toMatchObject({ status: 'done', attempts: 1, error: null, progress: 1 });
      expect((await actions(id)).filter((event) => event.action === 'analysis.done')).toHaveLength(1);
      expect(await reportOf(id)).toEqual(reference);
    }
  }, 240_000);

  it('gives a run whose worker went silent to another worker after its lease, which stores it once', async () => {
    const reference = (await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ status: 'done' })).comparisonId;
    const id = await createComparison('Silent worker');
    const silent = bossQueue(t.dataSource, { workerPath: 'tests/api/helpers/workers/hang-first-attempt-worker', leaseSeconds: 20 });
    const rescuer = bossQueue(other, { leaseSeconds: 20 });
    await silent.start();
    try {
      // The first attempt is under way on the silent instance (its worker goes silent at 10%; that
      // progress message itself may not be stored, as progress is written at most twice a second)…
      const deadline = Date.now() + 120_000;
      for (;;) {
        const run = await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ comparisonId: id });
        if (run.status === 'running' && run.attempts === 1) break;
        if (Date.now() > deadline) throw new Error(`the first attempt did not start: ${run.status} ${run.progress}`);
        await new Promise((resolve) => setTimeout(resolve, 100));
      }
      // …then another instance joins; after the lease the run is taken over.
      await rescuer.start();
      await rescuer.whenIdle(180_000);
    } finally {
      await rescuer.stop();
      await silent.stop();
    }
    const shown = await detail(id);
    expect(shown.state).toBe('analysed');
    expect(shown.runs[0]).toMatchObject({ status: 'done', attempts: 2, error: null, progress: 1 });
    const trail = await actions(id);
    expect(trail.map((event) => event.action)).toEqual(['comparison.created', 'analysis.retried', 'analysis.done', 'comparison.analysed', 'verdict.recorded']);
    expect(trail[1].details).toMatchObject({ attempt: 1, reason: expect.stringMatching(/lease expired/) });
    expect(await reportOf(id)).toEqual(await reportOf(reference));
  }, 330_000);
});
