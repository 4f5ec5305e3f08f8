import { type SwapResult, swapResultSchema } from '@shared/comparisons';
import { type ColumnMapping, type Report, reportSchema } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { waitForRuns } from './helpers/governance';
import { uploadFile } from './helpers/holdouts';
import { download, pdfPages, readWorkbook, sheetRows } from './helpers/pack';
import { furtherSwapSegmentsTitle } from '@shared/pack/evidence-words';

/**
 * Who changes sides within each segment value, for a further challenger: POST …/swap with
 * { challenger: k } against a direct count over the rows of a small holdout with sampling weights
 * and applicants without an outcome, written out plainly here (no engine code); the 400 naming an
 * index the comparison does not have; the workbook's sheet for every challenger.
 */

interface Row {
  id: string;
  bad: '1' | '0' | '';
  champion: number;
  c1: number;
  c2: number;
  region: 'N' | 'S';
  weight: number;
}

// 90 rows; every third weighs 3, every seventh has no outcome; the three scores rank differently.
const rows: Row[] = Array.from({ length: 90 }, (_, i) => ({
  id: `R${i}`,
  bad: i % 7 === 0 ? '' : (i * 13) % 5 === 0 || (i % 11 === 3 && i % 2 === 0) ? '1' : '0',
  champion: 500 + ((i * 37) % 90),
  c1: 500 + ((i * 53) % 90),
  c2: 500 + ((i * 29 + 11) % 90),
  region: i % 2 === 0 ? 'N' : 'S',
  weight: i % 3 === 0 ? 3 : 1,
}));
const csv = ['id,bad,champion,c1,c2,region,weight', ...rows.map((r) => [r.id, r.bad, r.champion, r.c1, r.c2, r.region, r.weight].join(','))].join('\n');

const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'c1',
  higherIs: { champion: 'safer', challenger: 'safer' },
  id: 'id',
  segments: ['region'],
  weight: 'weight',
  keepUnknown: true,
  championName: 'AS-19',
  challengerName: 'CF-3 bureau',
  moreChallengers: [{ column: 'c2', higherIs: 'safer', name: 'CF-4 open banking' }],
};

/** A swap cell counted directly: rows, applicants (weights), with an outcome, bads, bad rate of those with an outcome. */
function countCell(cell: Row[]) {
  const sum = (of: Row[]) => of.reduce((total, r) => total + r.weight, 0);
  const known = cell.filter((r) => r.bad !== '');
  const bads = sum(known.filter((r) => r.bad === '1'));
  return { count: cell.length, accounts: sum(cell), known: sum(known), unknown: sum(cell) - sum(known), bads, badRate: sum(known) > 0 ? bads / sum(known) : null };
}

/** One model's approvals within a value counted directly: applicants approved, their share, the bad rate of those approved with an outcome. */
function countApproval(value: Row[], approved: (r: Row) => boolean) {
  const sum = (of: Row[]) => of.reduce((total, r) => total + r.weight, 0);
  const book = value.filter(approved);
  const known = book.filter((r) => r.bad !== '');
  return { approved: sum(book), approvalRate: sum(book) / sum(value), approvedBadRate: sum(known) > 0 ? sum(known.filter((r) => r.bad === '1')) / sum(known) : null };
}

let t: TestApp;
let analyst: TestClient;
let committee: TestClient;
let id: number;
let twoModelId: number;
let report: Report;

beforeAll(async () => {
  t = await buildTestApp();
  [analyst, committee] = await Promise.all((['analyst', 'committee'] as const).map((role) => signedInAs(t.app, role)));
  const modeler = await signedInAs(t.app, 'modeler');
  const upload = await uploadFile(modeler, csv, 'small-regions.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  const holdoutId = (upload.body as { id: number }).id;
  const created = await modeler.post('/api/comparisons', { name: 'Swap sets by segment, two challengers', holdoutId, mapping, settings: { bootstrap: 0 } });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  id = (created.body as { id: number }).id;
  const { moreChallengers: _, ...twoModels } = mapping;
  const single = await modeler.post('/api/comparisons', { name: 'Swap sets by segment, one challenger', holdoutId, mapping: twoModels, settings: { bootstrap: 0 } });
  expect(single.status, JSON.stringify(single.body)).toBe(201);
  twoModelId = (single.body as { id: number }).id;
  await waitForRuns(t);
  report = reportSchema.parse((await analyst.get(`/api/comparisons/${id}/report`)).body);
});
afterAll(async () => {
  await t.close();
});

const message = (response: { body: unknown }) => (response.body as { error: { message: string } }).error.message;

describe('swap sets by segment for a further challenger', () => {
  it('counts who changes sides in each value as a direct count over the rows does: weighted, with rows without an outcome', async () => {
    const cutoffs = { champion: 540, challenger: 530 };
    const response = await analyst.post(`/api/comparisons/${id}/swap`, { cutoffs, challenger: 1 });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const { swap } = swapResultSchema.parse(response.body) as SwapResult;
    // Higher is safer: a model accepts an account whose score is at or above its cut-off.
    const byChampion = (r: Row) => r.champion >= cutoffs.champion;
    const byChallenger = (r: Row) => r.c2 >= cutoffs.challenger;
    expect(swap.challenger.cutoff).toBe(cutoffs.challenger);
    expect(swap.bySegment.map((row) => row.value)).toEqual(['N', 'S']);
    for (const row of swap.bySegment) {
      const value = rows.filter((r) => r.region === row.value);
      const expected = {
        swapIn: countCell(value.filter((r) => !byChampion(r) && byChallenger(r))),
        swapOut: countCell(value.filter((r) => byChampion(r) && !byChallenger(r))),
      };
      expect(row.column).toBe('region');
      expect(row.accounts).toBe(value.reduce((total, r) => total + r.weight, 0));
      expect(row.unknown).toBe(value.filter((r) => r.bad === '').reduce((total, r) => total + r.weight, 0));
      expect(row.bads).toBe(value.filter((r) => r.bad === '1').reduce((total, r) => total + r.weight, 0));
      for (const side of ['swapIn', 'swapOut'] as const) {
        const cell = row[side];
        expect({ count: cell.count, accounts: cell.accounts, known: cell.known, unknown: cell.unknown, bads: cell.bads }).toEqual({ ...expected[side], badRate: undefined });
        if (expected[side].badRate === null) expect(cell.badRate).toBeNull();
        else expect(cell.badRate).toBeCloseTo(expected[side].badRate!, 12);
      }
      const champion = countApproval(value, byChampion);
      const challenger = countApproval(value, byChallenger);
      expect(row.champion.approved).toBe(champion.approved);
      expect(row.challenger.approved).toBe(challenger.approved);
      expect(row.champion.approvalRate).toBeCloseTo(champion.approvalRate, 12);
      expect(row.challenger.approvalRate).toBeCloseTo(challenger.approvalRate, 12);
      expect(row.champion.approvedBadRate).toBeCloseTo(champion.approvedBadRate!, 12);
      expect(row.challenger.approvedBadRate).toBeCloseTo(challenger.approvedBadRate!, 12);
    }
    // Something happens in each value: the check is not one of empty cells.
    expect(swap.bySegment.every((row) => row.swapIn.count > 0 && row.swapOut.count > 0 && (row.swapIn.unknown ?? 0) + (row.swapOut.unknown ?? 0) > 0)).toBe(true);
    // The whole holdout's swap-in, counted the same way.
    expect(swap.swapIn).toMatchObject({ ...countCell(rows.filter((r) => !byChampion(r) && byChallenger(r))), badRate: expect.any(Number) });
  });

  it('is the first challenger’s without an index or with 0, and at the report’s approval rate the report’s own', async () => {
    const body = { approvalRate: report.settings.approvalRate };
    const plain = (await analyst.post(`/api/comparisons/${id}/swap`, body)).body as SwapResult;
    expect((await analyst.post(`/api/comparisons/${id}/swap`, { ...body, challenger: 0 })).body).toEqual(plain);
    const further = (await analyst.post(`/api/comparisons/${id}/swap`, { ...body, challenger: 1 })).body as SwapResult;
    expect(further.swap).toEqual(report.challengers![1].swap);
    expect(plain.swap).toEqual(report.challengers![0].swap);
    // Its own score: its own swap cells and its own swap matrix (the scores here take the same values, so the cut-offs agree).
    expect(further.swap.swapIn).not.toEqual(plain.swap.swapIn);
    expect(further.swapMatrix.cells).not.toEqual(plain.swapMatrix.cells);
  });

  it('refuses an index the comparison does not have with a 400 naming it', async () => {
    const beyond = await analyst.post(`/api/comparisons/${id}/swap`, { approvalRate: 0.7, challenger: 2 });
    expect(beyond.status).toBe(400);
    expect(message(beyond)).toBe('Challenger 2 does not exist: this comparison has 2 challengers (0 to 1).');
    const single = await analyst.post(`/api/comparisons/${twoModelId}/swap`, { approvalRate: 0.7, challenger: 1 });
    expect(single.status).toBe(400);
    expect(message(single)).toBe('Challenger 1 does not exist: this comparison has one challenger (0).');
    for (const challenger of [-1, 1.5, 'x', 9]) {
      const bad = await analyst.post(`/api/comparisons/${id}/swap`, { approvalRate: 0.7, challenger });
      expect(bad.status, String(challenger)).toBe(400);
      expect(JSON.stringify(bad.body)).toContain('challenger');
    }
  });

  it('is in the workbook for every challenger and in the PDF pack for each further one, where the first challenger’s is', async () => {
    const workbook = await readWorkbook((await download(committee, `/api/comparisons/${id}/export/workbook.xlsx`)).body);
    const sheet = sheetRows(workbook.getWorksheet('Swap by segment, challengers')!);
    const head = sheet.find((row) => row[0] === 'Challenger')!.map(String);
    const at = (name: string) => head.indexOf(name);
    for (const [k, challenger] of report.challengers!.entries()) {
      const lines = sheet.filter((row) => row[0] === challenger.name);
      expect(lines.map((row) => row[at('Value')])).toEqual(challenger.swap.bySegment.map((row) => row.value));
      expect(lines.map((row) => row[at('Swap-in applicants')])).toEqual(report.challengers![k].swap.bySegment.map((row) => row.swapIn.accounts));
      expect(lines.map((row) => row[at('Swap-out bads')])).toEqual(report.challengers![k].swap.bySegment.map((row) => row.swapOut.bads));
    }
    // The PDF pack: the first challenger's in the swap sets section, each further one's in the section for several challengers.
    const text = (await pdfPages((await download(committee, `/api/comparisons/${id}/export/pack.pdf`)).body)).join(' ').replace(/\s+/g, ' ');
    expect(text).toContain('Swap sets by segment');
    expect(text).toContain(furtherSwapSegmentsTitle('CF-4 open banking', report.challengers![1].swap));
    expect(text).not.toContain('Swap sets by segment: CF-3 bureau');
  });
});
