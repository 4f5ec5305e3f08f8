import { execFile } from 'node:child_process';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { reportSchema } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { projectRoot } from '@server/runtime';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { sampleDir, sampleMapping, uploadFile } from './helpers/holdouts';
import { readFileSync, writeFileSync } from 'node:fs';
import { compiledEntry } from '../setup/compiled';
import { queueWaitMs } from './helpers/governance';

/**
 * The API's report is the CLI's: the same file and settings through `server/cli/compare.ts --json`
 * (compiled and spawned, as a pipeline runs `npm run compare`) and through upload → comparison → analysis worker give
 * the same JSON, number for number.
 */

const run = promisify(execFile);

async function cli(args: string[]): Promise<unknown> {
  const { stdout } = await run(process.execPath, [compiledEntry('server/cli/compare'), ...args, '--json'], {
    cwd: projectRoot,
    maxBuffer: 64 * 1024 * 1024,
  });
  return JSON.parse(stdout);
}

let t: TestApp;
let modeler: TestClient;
beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
});
afterAll(async () => {
  await t.close();
});

async function apiReport(path: string, mapping: Record<string, unknown>, settings: Record<string, unknown>): Promise<unknown> {
  const fileName = path.split('/').pop()!;
  const upload = await uploadFile(modeler, readFileSync(path), fileName);
  expect(upload.status).toBe(201);
  const created = await modeler.post('/api/comparisons', { name: fileName, holdoutId: upload.body.id, mapping, settings });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  await t.jobs.whenIdle(queueWaitMs);
  const response = await modeler.get(`/api/comparisons/${created.body.id}/report`);
  expect(response.status).toBe(200);
  return JSON.parse(response.text);
}

describe('the report through the API equals the CLI', () => {
  it('on the demo sample with segments, exposure, ids and the bootstrap', async () => {
    const file = 'tallowmere-holdout-2025-sample-2k.csv';
    const [fromCli, fromApi] = await Promise.all([
      cli([
        join(sampleDir, file),
        ...['--outcome', 'bad_12m', '--champion', 'champion_points', '--challenger', 'challenger_points', '--higher-is', 'safer'],
        ...['--segment', 'product', '--segment', 'channel', '--exposure', 'loan_amount', '--id', 'account_id'],
        ...['--bootstrap', '300', '--seed', '11', '--approval-rate', '0.65'],
      ]),
      // sampleMapping is the mapping of the CLI flags above (bad_12m = 1 is bad, both higher = safer).
      apiReport(join(sampleDir, file), sampleMapping, { bootstrap: 300, seed: 11, approvalRate: 0.65 }),
    ]);
    reportSchema.parse(fromApi);
    expect(fromApi).toEqual(fromCli);
  });

  // The first 6,000 accounts of the PD file: the same columns, orientations and cut-offs as the
  // whole 60,000 at a tenth of the work (equality does not depend on the size). The whole file's
  // report, analysed by the worker, is checked against the CLI's printed figures in the
  // reliability suite (tests/reliability/demo-seed.test.ts).
  it('on 6,000 accounts with a PD challenger (higher = riskier) and given cut-offs', async () => {
    const lines = readFileSync(join(sampleDir, 'tallowmere-holdout-2025-pd.csv'), 'utf8').split('\n');
    const file = join(t.directory, 'pd-first-6000.csv');
    writeFileSync(file, `${lines.slice(0, 6001).join('\n')}\n`);
    const [fromCli, fromApi] = await Promise.all([
      cli([
        file,
        ...['--outcome', 'bad_12m', '--champion', 'champion_points', '--challenger', 'challenger_pd'],
        ...['--champion-higher-is', 'safer', '--challenger-higher-is', 'riskier', '--segment', 'channel'],
        ...['--bootstrap', '100', '--seed', '5', '--cutoff-champion', '600', '--cutoff-challenger', '0.08'],
      ]),
      apiReport(
        file,
        { outcome: 'bad_12m', badValue: '1', champion: 'champion_points', challenger: 'challenger_pd', higherIs: { champion: 'safer', challenger: 'riskier' }, segments: ['channel'] },
        { bootstrap: 100, seed: 5, cutoffs: { champion: 600, challenger: 0.08 } },
      ),
    ]);
    expect((fromApi as { rows: number }).rows).toBe(6000);
    expect(fromApi).toEqual(fromCli);
  });
});
