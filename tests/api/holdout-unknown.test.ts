import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reportSchema } from '@shared/report';
import { projectRoot } from '@server/runtime';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { uploadFile } from './helpers/holdouts';
import { queueWaitMs } from './helpers/governance';

/**
 * A through-the-door holdout through the API as written: applicants the champion declined carry
 * no outcome (blank or coded "R"), most of them a probability of bad, and goods are weighted. The
 * check passes without editing the file, the analysis runs, the report equals the CLI's, and the
 * swap sets on demand carry the unknown applicants.
 */
const run = promisify(execFile);

// Built from the committed weighted reference file: rows with a champion score below 2960 lose
// their outcome (every second one coded "R", the rest blank) and get a probability of bad.
function throughTheDoor(): { path: string; text: string } {
  const lines = readFileSync(join(projectRoot, 'tests/reference/weights/weighted-3000.csv'), 'utf8').trim().split('\n');
  const out = [`${lines[0]},pb`];
  lines.slice(1).forEach((line, i) => {
    const [id, bad, champion, challenger, w, segment] = line.split(',');
    const declined = Number(champion) < 2960;
    const outcome = declined ? (i % 2 ? 'R' : '') : bad;
    const pb = declined ? (0.05 + (i % 7) * 0.05).toFixed(2) : '';
    out.push([id, outcome, champion, challenger, w, segment, pb].join(','));
  });
  const text = `${out.join('\n')}\n`;
  const path = join(mkdtempSync(join(tmpdir(), 'scorecourt-ttd-')), 'through-the-door.csv');
  writeFileSync(path, text);
  return { path, text };
}

const mapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'safer' },
  segments: ['segment'],
  weight: 'w',
  keepUnknown: true,
  unknownValues: ['R'],
  inferredBad: 'pb',
};
const settings = { bootstrap: 100, seed: 4, rejectInference: { method: 'column', parcelFactor: 1 } };

let t: TestApp;
let modeler: TestClient;
beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
});
afterAll(async () => {
  await t.close();
});

describe('a through-the-door holdout through the API', () => {
  it('is checked without editing, analysed, and gives the CLI report', async () => {
    const file = throughTheDoor();
    const upload = await uploadFile(modeler, Buffer.from(file.text), 'through-the-door.csv');
    expect(upload.status).toBe(201);

    // Without the option the blank outcomes are problems naming row and column.
    const refused = await modeler.post(`/api/holdouts/${upload.body.id}/validate`, { mapping: { ...mapping, keepUnknown: undefined, unknownValues: undefined, inferredBad: undefined } });
    expect(refused.body.ok).toBe(false);
    expect(refused.body.errors[0]).toMatchObject({ column: 'bad' });

    const checked = await modeler.post(`/api/holdouts/${upload.body.id}/validate`, { mapping });
    expect(checked.status).toBe(200);
    expect(checked.body.ok, JSON.stringify(checked.body.errors)).toBe(true);
    expect(checked.body.summary.unknownRows).toBeGreaterThan(0);

    const created = await modeler.post('/api/comparisons', { name: 'Through the door', holdoutId: upload.body.id, mapping, settings });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    await t.jobs.whenIdle(queueWaitMs);
    const response = await modeler.get(`/api/comparisons/${created.body.id}/report`);
    expect(response.status).toBe(200);
    const fromApi = JSON.parse(response.text);
    reportSchema.parse(fromApi);
    expect(fromApi.population.unknown.rows).toBe(checked.body.summary.unknownRows);
    expect(fromApi.swap.swapIn.unknown).toBeGreaterThan(0);
    expect(fromApi.swap.swapIn.inferred.method).toBe('column');

    const { stdout } = await run(
      process.execPath,
      [
        '--import',
        'tsx',
        join(projectRoot, 'server/cli/compare.ts'),
        file.path,
        ...['--outcome', 'bad', '--segment', 'segment', '--weight', 'w', '--keep-unknown', '--unknown-value', 'R', '--inferred-bad', 'pb'],
        ...['--reject-inference', 'column', '--bootstrap', '100', '--seed', '4', '--json'],
      ],
      { cwd: projectRoot, maxBuffer: 64 * 1024 * 1024 },
    );
    const fromCli = JSON.parse(stdout);
    fromCli.input.fileName = fromApi.input.fileName;
    expect(fromApi).toEqual(fromCli);

    // Swap sets on demand carry the same cells.
    const swap = await modeler.post(`/api/comparisons/${created.body.id}/swap`, { approvalRate: fromApi.settings.approvalRate });
    expect(swap.status).toBe(200);
    expect(swap.body.swap.swapIn).toEqual(fromApi.swap.swapIn);
  });
});
