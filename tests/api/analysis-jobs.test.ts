import { comparisonDetailSchema } from '@shared/comparisons';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditDetails } from '@server/audit/audit';
import { AnalysisRun, AuditEvent } from '@server/db/entities/index';
import { JobRunner, type JobRunnerOptions } from '@server/jobs/runner';
import { createLogger } from '@server/log';
import { databaseAddress } from '@server/config';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { sample2k, sampleMapping, uploadFile } from './helpers/holdouts';
import { analysisHandlers } from '@server/comparisons/analysis-handlers';
import { queueWaitMs } from './helpers/governance';

/**
 * The analysis queue: restarts, dying workers, concurrency. Runs are real (the 2,000-row demo
 * sample, 40 bootstrap replicates); faults come from substitute workers in helpers/workers/.
 */

let t: TestApp;
let modeler: TestClient;
let holdoutId: number;
const settings = { bootstrap: 40, seed: 9 };

beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
  holdoutId = (await uploadFile(modeler, sample2k(), 'sample-2k.csv')).body.id;
});
afterAll(async () => {
  await t.close();
});

function runner(options: Partial<JobRunnerOptions> = {}): JobRunner {
  return new JobRunner({
    dataSource: t.dataSource,
    databasePath: databaseAddress(t.config),
    concurrency: 1,
    log: createLogger('silent'),
    handlers: analysisHandlers({ dataSource: t.dataSource }),
    ...options,
  });
}

/** Runs the test's work with the app's own queue stopped and `replacement` in its place. */
async function withQueue<T>(replacement: JobRunner, work: () => Promise<T>): Promise<T> {
  await t.jobs.stop();
  try {
    return await work();
  } finally {
    await replacement.stop();
    await t.jobs.start();
  }
}

async function createComparison(name: string) {
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
const reportOf = async (id: number) => (await modeler.get(`/api/comparisons/${id}/report`)).text;

describe('restarts', () => {
  it('queues a run left running by a stopped server again, and it finishes with the same report as an uninterrupted run', async () => {
    const reference = await createComparison('Uninterrupted');
    await t.jobs.whenIdle(queueWaitMs);

    const restarted = runner();
    const id = await withQueue(restarted, async () => {
      const created = await createComparison('Interrupted');
      // As if the process had been killed during the run's first attempt.
      const run = await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ comparisonId: created });
      expect(run.status).toBe('queued');
      await t.dataSource.getRepository(AnalysisRun).update({ id: run.id }, { status: 'running', attempts: 1, startedAt: new Date(), progress: 0.4, stage: 'Bootstrap 16 of 40' });

      await restarted.start();
      await restarted.whenIdle(queueWaitMs);
      return created;
    });
    const shown = await detail(id);
    expect(shown.state).toBe('analysed');
    expect(shown.runs[0]).toMatchObject({ status: 'done', attempts: 2, error: null, progress: 1 });
    const trail = await actions(id);
    expect(trail.map((event) => event.action)).toEqual(['comparison.created', 'analysis.requeued', 'analysis.done', 'comparison.analysed', 'verdict.recorded']);
    expect(trail[1].details).toMatchObject({ runId: shown.runs[0].id, attempts: 1 });

    expect(JSON.parse(await reportOf(id))).toEqual(JSON.parse(await reportOf(reference)));
  });

  it('fails a run that was interrupted on its last attempt, with the reason, and leaves the comparison a draft', async () => {
    const restarted = runner();
    const id = await withQueue(restarted, async () => {
      const created = await createComparison('Interrupted twice');
      await t.dataSource.getRepository(AnalysisRun).update({ comparisonId: created }, { status: 'running', attempts: 2, startedAt: new Date() });
      await restarted.start();
      await restarted.whenIdle(queueWaitMs);
      return created;
    });
    const shown = await detail(id);
    expect(shown.state).toBe('draft');
    expect(shown.runs[0].status).toBe('failed');
    expect(shown.runs[0].error).toMatch(/server stopped while this analysis was running, on each of its 2 attempts/);
    expect((await actions(id)).map((event) => event.action)).toEqual(['comparison.created', 'analysis.failed']);
    expect((await modeler.get(`/api/comparisons/${id}/report`)).status).toBe(409);
  });

  it('puts a running run back in the queue, attempt uncounted, on a clean stop', async () => {
    const slow = runner();
    await withQueue(slow, async () => {
      await slow.start();
      const id = await createComparison('Stopped cleanly');
      slow.kick();
      const deadline = Date.now() + 10_000;
      while ((await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ comparisonId: id })).status !== 'running') {
        if (Date.now() > deadline) throw new Error('the run did not start');
        await new Promise((resolve) => setTimeout(resolve, 5));
      }
      await slow.stop();
      const run = await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ comparisonId: id });
      // Unless it finished in the moment before the stop.
      if (run.status !== 'done') expect(run).toMatchObject({ status: 'queued', attempts: 0 });
    });
    await t.jobs.whenIdle(queueWaitMs);
  });
});

describe('workers that die', () => {
  it('retries a run whose worker exits, and the second attempt finishes it', async () => {
    const faulty = runner({ workerPath: 'tests/api/helpers/workers/crash-once-worker' });
    const id = await withQueue(faulty, async () => {
      await faulty.start();
      const created = await createComparison('Crash once');
      faulty.kick();
      await faulty.whenIdle(queueWaitMs);
      return created;
    });
    const shown = await detail(id);
    expect(shown.state).toBe('analysed');
    expect(shown.runs[0]).toMatchObject({ status: 'done', attempts: 2 });
    const trail = await actions(id);
    expect(trail.map((event) => event.action)).toEqual(['comparison.created', 'analysis.retried', 'analysis.done', 'comparison.analysed', 'verdict.recorded']);
    expect(trail[1].details.reason).toMatch(/stopped without a result \(exit code 3\)/);
  });

  it('fails a run whose worker crashes on both attempts, with the reason, and keeps serving', async () => {
    const faulty = runner({ workerPath: 'tests/api/helpers/workers/always-crash-worker' });
    const id = await withQueue(faulty, async () => {
      await faulty.start();
      const created = await createComparison('Always crashes');
      faulty.kick();
      await faulty.whenIdle(queueWaitMs);
      return created;
    });
    const shown = await detail(id);
    expect(shown.state).toBe('draft');
    expect(shown.runs[0]).toMatchObject({ status: 'failed', attempts: 2 });
    expect(shown.runs[0].error).toMatch(/failed on each of its 2 attempts; the last time the analysis worker failed \(simulated crash in the analysis worker\)/);
    expect((await actions(id)).map((event) => event.action)).toEqual(['comparison.created', 'analysis.retried', 'analysis.failed']);
    expect((await modeler.get('/api/health')).body).toEqual({ ok: true });
  });

  it('retries a run whose worker dies in the middle of the analysis, and keeps serving meanwhile', async () => {
    const faulty = runner({ workerPath: 'tests/api/helpers/workers/die-mid-analysis-once-worker' });
    const served: number[] = [];
    const id = await withQueue(faulty, async () => {
      await faulty.start();
      // 400 replicates: the second attempt lasts long enough for the requests below to be answered
      // while it runs (the rule does not depend on the size; 2,000 made it five times longer).
      const response = await modeler.post('/api/comparisons', { name: 'Dies mid-analysis once', holdoutId, mapping: sampleMapping, settings: { bootstrap: 400, seed: 9 } });
      expect(response.status).toBe(201);
      faulty.kick();
      const idle = faulty.whenIdle(queueWaitMs);
      let finished = false;
      void idle.finally(() => (finished = true));
      while (!finished) {
        served.push((await modeler.get('/api/health')).status, (await modeler.get(`/api/comparisons/${response.body.id}`)).status);
        await new Promise((resolve) => setTimeout(resolve, 20));
      }
      await idle;
      return response.body.id as number;
    });
    const shown = await detail(id);
    expect(shown.state).toBe('analysed');
    expect(shown.runs[0]).toMatchObject({ status: 'done', attempts: 2, error: null });
    const trail = await actions(id);
    expect(trail.map((event) => event.action)).toEqual(['comparison.created', 'analysis.retried', 'analysis.done', 'comparison.analysed', 'verdict.recorded']);
    expect(trail[1].details).toMatchObject({ attempt: 1, reason: 'the analysis worker stopped without a result (exit code 5)' });
    expect(served.length).toBeGreaterThan(2);
    expect(new Set(served)).toEqual(new Set([200]));
  });

  it('fails a run whose worker dies in the middle of both attempts, with the reason', async () => {
    const faulty = runner({ workerPath: 'tests/api/helpers/workers/die-mid-analysis-always-worker' });
    const id = await withQueue(faulty, async () => {
      await faulty.start();
      const response = await modeler.post('/api/comparisons', { name: 'Dies mid-analysis always', holdoutId, mapping: sampleMapping, settings: { bootstrap: 2000, seed: 9 } });
      faulty.kick();
      await faulty.whenIdle(queueWaitMs);
      return response.body.id as number;
    });
    const shown = await detail(id);
    expect(shown.state).toBe('draft');
    expect(shown.runs[0]).toMatchObject({ status: 'failed', attempts: 2 });
    expect(shown.runs[0].error).toBe('The analysis failed on each of its 2 attempts; the last time the analysis worker stopped without a result (exit code 6).');
    expect((await actions(id)).map((event) => event.action)).toEqual(['comparison.created', 'analysis.retried', 'analysis.failed']);
    expect((await modeler.get(`/api/comparisons/${id}/report`)).status).toBe(409);
  });

  it('fails a run whose worker runs out of memory, naming it', async () => {
    const faulty = runner({ workerPath: 'tests/api/helpers/workers/out-of-memory-worker', resourceLimits: { maxOldGenerationSizeMb: 48, maxYoungGenerationSizeMb: 8 } });
    const id = await withQueue(faulty, async () => {
      await faulty.start();
      const created = await createComparison('Out of memory');
      faulty.kick();
      await faulty.whenIdle(queueWaitMs);
      return created;
    });
    const shown = await detail(id);
    expect(shown.runs[0]).toMatchObject({ status: 'failed', attempts: 2 });
    expect(shown.runs[0].error).toMatch(/ran out of memory/);
  });
});

describe('concurrency', () => {
  it('runs at most ANALYSIS_CONCURRENCY analyses at once (1 by default), oldest first', async () => {
    expect(t.config.analysisConcurrency).toBe(1);
    const seen: number[] = [];
    const ids = [await createComparison('Queue 1'), await createComparison('Queue 2'), await createComparison('Queue 3')];
    const sampler = setInterval(() => seen.push(t.jobs.activeRuns.length), 2);
    await t.jobs.whenIdle(queueWaitMs);
    clearInterval(sampler);
    expect(Math.max(...seen)).toBeLessThanOrEqual(1);
    const runs = await t.dataSource.getRepository(AnalysisRun).find({ where: ids.map((comparisonId) => ({ comparisonId })), order: { id: 'ASC' } });
    expect(runs.map((run) => run.status)).toEqual(['done', 'done', 'done']);
    for (let i = 1; i < runs.length; i++) expect(runs[i].startedAt!.getTime()).toBeGreaterThanOrEqual(runs[i - 1].finishedAt!.getTime());
  });
});
