import { scenarioSchema, swapResultSchema } from '@shared/comparisons';
import { reportSchema, type ColumnMapping, type Report } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditDetails } from '@server/audit/audit';
import { PreparedCache, prepareHere, prepareOnWorker } from '@server/comparisons/prepared-cache';
import { swapAt } from '@server/comparisons/swap';
import { databaseAddress } from '@server/config';
import { rawQuery } from '@server/db/driver';
import { AnalysisRun, AuditEvent } from '@server/db/entities/index';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { sample2k, sampleMapping, uploadFile } from './helpers/holdouts';
import { queueWaitMs } from './helpers/governance';

let t: TestApp;
let modeler: TestClient;
let policy: TestClient;
let comparisonId: number;
let holdoutId: number;
let report: Report;

async function analysed(holdoutId: number, settings: Record<string, unknown>, mapping = sampleMapping, name = 'Swap sets'): Promise<{ id: number; report: Report }> {
  const created = await modeler.post('/api/comparisons', { name, holdoutId, mapping, settings });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  await t.jobs.whenIdle(queueWaitMs);
  const response = await modeler.get(`/api/comparisons/${created.body.id}/report`);
  expect(response.status).toBe(200);
  return { id: created.body.id, report: reportSchema.parse(response.body) };
}

beforeAll(async () => {
  t = await buildTestApp();
  modeler = await signedInAs(t.app, 'modeler');
  policy = await signedInAs(t.app, 'policy');
  const upload = await uploadFile(modeler, sample2k(), 'sample-2k.csv');
  holdoutId = upload.body.id;
  ({ id: comparisonId, report } = await analysed(holdoutId, { bootstrap: 50, seed: 2, approvalRate: 0.7 }, sampleMapping, 'Tallowmere: "quoted", =risky name'));
});
afterAll(async () => {
  await t.close();
});

describe('swap sets on demand', () => {
  it("at the report's approval rate, equal the report's swap sets, swap matrix and strategy-curve figures", async () => {
    const response = await modeler.post(`/api/comparisons/${comparisonId}/swap`, { approvalRate: 0.7 });
    expect(response.status).toBe(200);
    const result = swapResultSchema.parse(response.body);
    expect(result.swap).toEqual(report.swap);
    expect(result.swapMatrix).toEqual(report.swapMatrix);
    // Within each value of both mapped segment columns, adding up to the whole holdout's cells.
    const segmentColumns = sampleMapping.segments ?? [];
    expect(segmentColumns.length).toBeGreaterThan(0);
    for (const column of segmentColumns) {
      const rows = result.swap.bySegment.filter((row) => row.column === column);
      expect(rows.length).toBeGreaterThan(1);
      expect(rows.reduce((sum, row) => sum + row.accounts, 0)).toBe(2000);
      expect(rows.reduce((sum, row) => sum + row.swapIn.count, 0)).toBe(result.swap.swapIn.count);
      expect(rows.reduce((sum, row) => sum + row.swapOut.bads, 0)).toBe(result.swap.swapOut.bads);
    }
    expect(result.strategyPosition).toEqual({
      ...report.strategyCurve.atApprovalRate,
      championApprovalRate: report.swap.champion.approvalRate,
      challengerApprovalRate: report.swap.challenger.approvalRate,
    });
  });

  it('at given cut-offs, count the accounts as a plain pass over the file does, and equal a report run with those cut-offs', async () => {
    const cutoffs = { champion: 600, challenger: 610 };
    const response = await modeler.post(`/api/comparisons/${comparisonId}/swap`, { cutoffs });
    const result = swapResultSchema.parse(response.body);
    // Independent of the engine: the 2×2 counted here row by row from the CSV text (both scores
    // higher = safer, so a model approves at or above its cut-off), counts, bads and amounts.
    const [header, ...lines] = sample2k().toString('utf8').trim().split('\n');
    const column = (name: string) => header.split(',').indexOf(name);
    const [championAt, challengerAt, badAt, amountAt] = ['champion_points', 'challenger_points', 'bad_12m', 'loan_amount'].map(column);
    const counted = { bothAccept: [0, 0, 0], swapIn: [0, 0, 0], swapOut: [0, 0, 0], bothReject: [0, 0, 0] };
    for (const line of lines) {
      const cells = line.split(',');
      const champion = Number(cells[championAt]) >= cutoffs.champion;
      const challenger = Number(cells[challengerAt]) >= cutoffs.challenger;
      const cell = counted[champion ? (challenger ? 'bothAccept' : 'swapOut') : challenger ? 'swapIn' : 'bothReject'];
      cell[0] += 1;
      cell[1] += cells[badAt] === '1' ? 1 : 0;
      cell[2] += Number(cells[amountAt]);
    }
    for (const name of ['bothAccept', 'swapIn', 'swapOut', 'bothReject'] as const) {
      expect([result.swap[name].count, result.swap[name].bads, result.swap[name].amount], name).toEqual(counted[name]);
    }
    // The same function on another path: a second comparison whose analysis worker builds its
    // report with settings.cutoffs gives the same swap sets as the first one's on demand.
    const second = await analysed(holdoutId, { bootstrap: 0, seed: 2, cutoffs });
    expect(second.report.swap.basis).toBe('cutoffs');
    expect(result.swap).toEqual(second.report.swap);
    // Champion approves at 600 and above, the challenger at 610 and above (both higher = safer):
    // the 2×2 adds up to the holdout.
    const cells = [result.swap.bothAccept, result.swap.swapIn, result.swap.swapOut, result.swap.bothReject];
    expect(cells.reduce((sum, cell) => sum + cell.count, 0)).toBe(2000);
    expect(result.strategyPosition.championApprovalRate).toBe(result.swap.champion.approvalRate);
    expect(result.strategyPosition.badsAvoided).toBe(result.strategyPosition.championBads - result.strategyPosition.challengerBads);
    // Cut-offs win when an approval rate is sent as well.
    const both = await modeler.post(`/api/comparisons/${comparisonId}/swap`, { cutoffs, approvalRate: 0.5 });
    expect(both.body.swap).toEqual(result.swap);
  });

  it("at the report's own cut-offs, give the same cells as the matched approval rate", async () => {
    const cutoffs = { champion: report.swap.champion.cutoff, challenger: report.swap.challenger.cutoff };
    const result = swapResultSchema.parse((await modeler.post(`/api/comparisons/${comparisonId}/swap`, { cutoffs })).body);
    expect({ ...result.swap, basis: 'approval-rate', requestedApprovalRate: 0.7 }).toEqual(report.swap);
  });

  it('are the same prepared on a worker after a restart, on this thread, or handed over by the analysis', async () => {
    const run = await t.dataSource.getRepository(AnalysisRun).findOneByOrFail({ comparisonId });
    // The sort orders are stored with the run, so a preparation after a restart does not sort.
    const stored = await rawQuery<{ name: string }>(t.dataSource, `SELECT "name" FROM "run_columns" WHERE "runId" = ?`, [run.id]);
    expect(stored.map((row) => row.name).sort()).toEqual(['bad', 'challenger', 'champion', 'exposure', 'ids', 'order.challenger', 'order.champion', 'segment.0', 'segment.1']);
    const onWorker = await new PreparedCache(1e6, prepareOnWorker(databaseAddress(t.config))).get(t.dataSource, run);
    const here = await new PreparedCache(1e6, prepareHere).get(t.dataSource, run);
    for (const request of [{ basis: 'approval-rate', approvalRate: 0.55 } as const, { basis: 'cutoffs', cutoffs: { champion: 590, challenger: 620 } } as const]) {
      const fromApi = (await modeler.post(`/api/comparisons/${comparisonId}/swap`, request.basis === 'cutoffs' ? { cutoffs: request.cutoffs } : { approvalRate: request.approvalRate })).body;
      expect(swapAt(onWorker, request)).toEqual(fromApi);
      expect(swapAt(here, request)).toEqual(fromApi);
    }
  });

  it('answer 409 before any analysis is done and 400 without cut-offs or a rate', async () => {
    const bare = await modeler.post('/api/comparisons', { name: 'No run', holdoutId });
    expect((await modeler.post(`/api/comparisons/${bare.body.id}/swap`, { approvalRate: 0.7 })).status).toBe(409);
    expect((await modeler.post(`/api/comparisons/${comparisonId}/swap`, {})).status).toBe(400);
    expect((await modeler.post(`/api/comparisons/${comparisonId}/swap`, { approvalRate: 1.5 })).status).toBe(400);
  });
});

describe('cut-off scenarios', () => {
  it('the policy role saves one with its swap sets; others may read but not save', async () => {
    const response = await policy.post(`/api/comparisons/${comparisonId}/scenarios`, { name: 'Broker tightening', approvalRate: 0.65, note: 'Q3 plan' });
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const scenario = scenarioSchema.parse(response.body);
    const expected = swapResultSchema.parse((await policy.post(`/api/comparisons/${comparisonId}/swap`, { approvalRate: 0.65 })).body).swap;
    expect(scenario).toMatchObject({
      name: 'Broker tightening',
      approvalRate: 0.65,
      note: 'Q3 plan',
      cutoffs: { champion: expected.champion.cutoff, challenger: expected.challenger.cutoff },
      swapIn: { count: expected.swapIn.count, badRate: expected.swapIn.badRate },
      swapOut: { count: expected.swapOut.count, badRate: expected.swapOut.badRate },
    });
    const byCutoffs = await policy.post(`/api/comparisons/${comparisonId}/scenarios`, { name: 'Fixed', cutoffs: { champion: 600, challenger: 605 } });
    expect(byCutoffs.body).toMatchObject({ approvalRate: null, cutoffs: { champion: 600, challenger: 605 } });
    expect((await policy.post(`/api/comparisons/${comparisonId}/scenarios`, { name: 'Nothing' })).status).toBe(400);
    expect((await modeler.post(`/api/comparisons/${comparisonId}/scenarios`, { name: 'Not mine', approvalRate: 0.5 })).status).toBe(403);

    const list = await modeler.get(`/api/comparisons/${comparisonId}/scenarios`);
    expect(list.status).toBe(200);
    expect(list.body.scenarios.map((s: { name: string }) => s.name)).toEqual(['Fixed', 'Broker tightening']);
    const event = await t.dataSource.getRepository(AuditEvent).findOneByOrFail({ action: 'scenario.saved', targetId: String(comparisonId) });
    expect(auditDetails(event)).toMatchObject({ scenarioId: scenario.id, name: 'Broker tightening', approvalRate: 0.65 });
  });
});

/** Parses our own CSV output (fields quoted by fast-csv when they hold a comma, quote or line end). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') {
      row.push(field);
      field = '';
    } else if (c === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
    } else field += c;
  }
  if (field !== '' || row.length > 0) rows.push([...row, field]);
  return rows;
}

const FORMULA = /^[=+\-@\t\r]/;

describe('exports', () => {
  it('bands.csv holds both band tables, numbers as numbers, with a safe file name', async () => {
    const response = await modeler.get(`/api/comparisons/${comparisonId}/export/bands.csv`);
    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/^text\/csv/);
    expect(response.headers['content-disposition']).toBe(`attachment; filename="comparison-${comparisonId}-tallowmere-quoted-risky-name-bands.csv"`);
    const rows = parseCsv(response.text);
    expect(rows[0]).toEqual(['model', 'band', 'score_min', 'score_max', 'accounts', 'goods', 'bads', 'bad_rate', 'cum_bad_share', 'cum_good_share', 'ks', 'odds']);
    const body = rows.slice(1);
    expect(body).toHaveLength(report.bands.champion.rows.length + report.bands.challenger.rows.length);
    const first = report.bands.champion.rows[0];
    expect(body[0]).toEqual(['champion', String(first.band), String(first.scoreMin), String(first.scoreMax), String(first.count), String(first.goods), String(first.bads), String(first.badRate), String(first.cumBadShare), String(first.cumGoodShare), String(first.ks), first.odds === null ? '' : String(first.odds)]);
    for (const row of body) for (const cell of row) expect(Number.isNaN(Number(cell)) ? !FORMULA.test(cell) : true).toBe(true);
  });

  it('report.json is the report, as a download', async () => {
    const response = await modeler.get(`/api/comparisons/${comparisonId}/export/report.json`);
    expect(response.status).toBe(200);
    expect(response.headers['content-disposition']).toMatch(/^attachment; filename="comparison-\d+-[a-z0-9-]+-report\.json"$/);
    expect(JSON.parse(response.text)).toEqual(report);
  });

  it('swap.csv lists exactly the swap-in and swap-out accounts (policy role only)', async () => {
    expect((await modeler.get(`/api/comparisons/${comparisonId}/export/swap.csv`)).status).toBe(403);
    const response = await policy.get(`/api/comparisons/${comparisonId}/export/swap.csv?approvalRate=0.7`);
    expect(response.status).toBe(200);
    const rows = parseCsv(response.text);
    expect(rows[0]).toEqual(['set', 'account', 'id', 'champion_score', 'challenger_score', 'outcome', 'amount', 'product', 'channel']);
    const body = rows.slice(1);
    const swapIn = body.filter((row) => row[0] === 'swap-in');
    const swapOut = body.filter((row) => row[0] === 'swap-out');
    expect(swapIn).toHaveLength(report.swap.swapIn.count);
    expect(swapOut).toHaveLength(report.swap.swapOut.count);
    // Each account's segment values: counted per value, they are the report's swap sets by segment.
    for (const [index, column] of [[7, 'product'], [8, 'channel']] as const) {
      for (const row of report.swap.bySegment.filter((segmentRow) => segmentRow.column === column)) {
        expect(swapIn.filter((line) => line[index] === row.value), `${column} = ${row.value}`).toHaveLength(row.swapIn.count);
        expect(swapOut.filter((line) => line[index] === row.value), `${column} = ${row.value}`).toHaveLength(row.swapOut.count);
      }
    }
    expect(swapIn.filter((row) => row[5] === 'bad')).toHaveLength(report.swap.swapIn.bads);
    expect(swapOut.reduce((sum, row) => sum + Number(row[6]), 0)).toBeCloseTo(report.swap.swapOut.amount!, 6);
    // Swap-in: the champion declines (below its cut-off), the challenger accepts (at or above its own).
    for (const row of swapIn) {
      expect(Number(row[3])).toBeLessThan(report.swap.champion.cutoff);
      expect(Number(row[4])).toBeGreaterThanOrEqual(report.swap.challenger.cutoff);
    }
    expect(swapIn[0][2]).toMatch(/^TCC-25-\d{6}$/);
    // Without parameters: the report's own basis.
    const byDefault = await policy.get(`/api/comparisons/${comparisonId}/export/swap.csv`);
    expect(byDefault.text).toBe(response.text);
    expect((await policy.get(`/api/comparisons/${comparisonId}/export/swap.csv?championCutoff=600`)).status).toBe(400);
    expect((await policy.get(`/api/comparisons/${comparisonId}/export/swap.csv?approvalRate=abc`)).status).toBe(400);
  });

  it('escapes every text cell that a spreadsheet would run as a formula, and keeps negative numbers numbers', async () => {
    // Account ids and a segment crafted as formulas; scores negative (higher = safer, all below 0).
    const ids = ['=HYPERLINK("http://x.test","y")', '+1+1', '-2+3', '@SUM(A1:A9)', '\tTAB', '\rCR', 'plain', '=1,2', "'quoted"];
    const lines = ['id,segment,bad,champion,challenger'];
    for (let i = 0; i < 400; i++) {
      const bad = i % 4 === 0 ? 1 : 0;
      const champion = -(i % 37) - (bad ? 5 : 0);
      const challenger = -(i % 41) - (bad ? 9 : 0) - 0.5;
      const id = ids[i % ids.length].replace(/"/g, '""');
      lines.push(`"${id}-${i}",${i % 2 ? '=cmd|x' : 'web'},${bad},${champion},${challenger}`);
    }
    const upload = await uploadFile(modeler, lines.join('\n') + '\n', 'formulas.csv');
    expect(upload.status, JSON.stringify(upload.body)).toBe(201);
    const mapping: ColumnMapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' }, id: 'id', segments: ['segment'] };
    const { id } = await analysed(upload.body.id, { bootstrap: 0, approvalRate: 0.5 }, mapping, '=SUM(A1) +cmd');

    const swap = await policy.get(`/api/comparisons/${id}/export/swap.csv`);
    expect(swap.status).toBe(200);
    expect(swap.headers['content-disposition']).toBe(`attachment; filename="comparison-${id}-sum-a1-cmd-swap.csv"`);
    const rows = parseCsv(swap.text).slice(1);
    expect(rows.length).toBeGreaterThan(10);
    let escaped = 0;
    let negative = 0;
    for (const row of rows) {
      for (const cell of row) {
        // A cell starting with a formula character is allowed only when it is a plain number.
        if (FORMULA.test(cell)) {
          expect(cell, `unescaped cell ${JSON.stringify(cell)}`).toMatch(/^-\d+(\.\d+)?(e-?\d+)?$/);
          negative++;
        }
      }
      const original = row[2].replace(/^'/, '');
      if (FORMULA.test(original)) {
        expect(row[2]).toBe(`'${original}`);
        escaped++;
      }
    }
    expect(escaped).toBeGreaterThan(0);
    expect(negative).toBeGreaterThan(0);
    // An id that starts with an apostrophe is not a formula and is left as it is.
    for (const row of rows) if (row[2].includes('quoted')) expect(row[2]).toMatch(/^'quoted-\d+$/);

    const bands = parseCsv((await modeler.get(`/api/comparisons/${id}/export/bands.csv`)).text).slice(1);
    for (const row of bands) for (const cell of row) if (FORMULA.test(cell)) expect(cell).toMatch(/^-\d+(\.\d+)?(e-?\d+)?$/);
  });
});
