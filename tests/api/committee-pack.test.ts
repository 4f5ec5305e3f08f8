import { createHash } from 'node:crypto';
import { auditTrailSchema } from '@shared/governance';
import { formatAuc, formatCount, formatGini, formatGiniDelta, formatKs, formatPercent, formatPValue, formatScore } from '@shared/format';
import { type Report, swapInRiskier } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DecisionPack } from '@server/db/entities/index';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { lastOutboxId, waitForRuns } from './helpers/governance';
import { sample2k, sampleMapping, uploadFile } from './helpers/holdouts';
import { download, pdfPages, pdfPageSizes, rawSheetXml, readWorkbook, sharedStringsXml, sheetRows } from './helpers/pack';
import { renderPackPdf } from '@server/pack/pdf';
import { packInput } from '@server/pack/service';

/**
 * The committee pack through the API: the server's PDF read back with pdf.js (pdfjs-dist) and the
 * workbook read back with exceljs and, for the raw cells, Python's zipfile; both hold the numbers
 * of the report JSON. Segment values in the holdout start with "=" and a full-width "＝" so the
 * workbook's text cells are tested against formula injection. At the decision the PDF is archived:
 * its SHA-256 in the audit trail, the same bytes served afterwards.
 */

let t: TestApp;
let clients: Record<'modeler' | 'analyst' | 'committee' | 'policy' | 'admin', TestClient>;
let id: number;
let report: Report;

const injected = { 'credit-card': '=HYPERLINK("http://x.test","card")', 'personal-loan': '＝1+2' } as const;

beforeAll(async () => {
  t = await buildTestApp();
  const roles = ['modeler', 'analyst', 'committee', 'policy', 'admin'] as const;
  const signed = await Promise.all(roles.map((role) => signedInAs(t.app, role)));
  clients = Object.fromEntries(roles.map((role, index) => [role, signed[index]])) as typeof clients;
  // The sample with its product values replaced by text that a spreadsheet would take for a formula.
  const csv = sample2k()
    .toString('utf8')
    .replace(/,credit-card,/g, `,"${injected['credit-card'].replace(/"/g, '""')}",`)
    .replace(/,personal-loan,/g, `,${injected['personal-loan']},`);
  const upload = await uploadFile(clients.modeler, csv, 'tallowmere-injected.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  const created = await clients.modeler.post('/api/comparisons', {
    name: 'Pack check',
    holdoutId: (upload.body as { id: number }).id,
    mapping: sampleMapping,
    settings: { bootstrap: 50 },
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  id = (created.body as { id: number }).id;
  await waitForRuns(t);
  report = (await clients.modeler.get(`/api/comparisons/${id}/report`)).body as Report;
  expect(report.segments.map((row) => row.value)).toEqual(expect.arrayContaining([injected['credit-card'], injected['personal-loan']]));
});

afterAll(async () => {
  await t.close();
});

describe('the committee pack as PDF', () => {
  let pages: string[];
  let text: string;

  it('downloads for every role as a PDF attachment', async () => {
    for (const role of Object.keys(clients) as (keyof typeof clients)[]) {
      const response = await download(clients[role], `/api/comparisons/${id}/export/pack.pdf`);
      expect(response.status, role).toBe(200);
      expect(response.headers['content-type']).toBe('application/pdf');
      expect(response.headers['content-disposition']).toBe(`attachment; filename="comparison-${id}-pack-check-pack.pdf"`);
      expect(response.body.subarray(0, 5).toString('latin1')).toBe('%PDF-');
      expect(response.headers['x-pack-sha256']).toBe(createHash('sha256').update(response.body).digest('hex'));
      if (role === 'committee') {
        pages = await pdfPages(response.body);
        text = pages.join(' ');
      }
    }
    // Each is laid out afresh on a worker thread: slow under tsx on a loaded machine.
  }, 400_000);

  it('holds the report’s numbers as the pages format them (pdf.js text)', () => {
    const { champion, challenger, difference, swap } = report;
    for (const value of [
      formatAuc(champion.auc),
      formatAuc(challenger.auc),
      formatGini(champion.gini),
      formatGini(challenger.gini),
      formatKs(champion.ks),
      formatKs(challenger.ks),
      formatPValue(difference.pOneSided),
      formatCount(swap.swapIn.count),
      formatCount(swap.swapOut.count),
      formatCount(swap.bothAccept.count),
      formatPercent(swap.swapIn.badRate),
      formatPercent(swap.swapOut.badRate),
      formatScore(swap.champion.cutoff),
      formatCount(report.dataQuality.rowsRead),
      report.input.sha256,
    ]) {
      expect(text, value).toContain(value);
    }
    expect(text).toContain(`ΔGini ${formatGiniDelta(difference.gini)}`.slice(1));
    for (const table of [report.bands.champion, report.bands.challenger]) {
      for (const row of table.rows) expect(text).toContain(`${formatScore(row.scoreMin)} ${formatScore(row.scoreMax)} ${formatCount(row.count)} ${formatCount(row.goods)} ${formatCount(row.bads)}`);
    }
    for (const row of report.segments) {
      expect(text).toContain(`${formatCount(row.n)} ${formatCount(row.bads)} ${formatGini(row.championGini)} ${formatGini(row.challengerGini)}`);
    }
    for (const row of report.swap.bySegment) expect(text).toContain(`${formatCount(row.swapIn.count)}`);
    // The flag in each riskier row, besides the one mention in the table's note.
    // (pdf.js joins a cell's wrapped lines without a space: "Swap-in" / "riskier" reads "Swap-inriskier".)
    const flags = text.split(/Swap-in ?riskier/).length - 1;
    expect(flags).toBe(report.swap.bySegment.filter(swapInRiskier).length + (report.swap.bySegment.length > 0 ? 1 : 0));
    for (const point of report.strategyCurve.points.slice(0, 5)) expect(text).toContain(formatPercent(point.champion.portfolioBadRate, 2));
    const firstRow = report.swapMatrix.cells[0].map((cell) => formatCount(cell.count)).join(' ');
    expect(text).toContain(firstRow);
  });

  it('has every part, the charts’ captions, and page numbers', () => {
    for (const title of ['committee pack', 'Evidence: metrics and tests', 'Who changes sides', 'Segments', 'Band tables', 'Swap matrix', 'Data quality', 'Verdict, review and decision', 'Audit trail']) {
      expect(text).toContain(title);
    }
    for (const chart of ['Uplift with its interval', 'ROC curves', 'Kolmogorov', 'Swap sets', 'Strategy curve', 'Segment intervals']) expect(text).toContain(chart);
    expect(pages.at(-1)).toContain(`page ${pages.length} of ${pages.length}`);
  });
});

describe('the PDF layout of wide tables', () => {
  it('puts a table too wide for a portrait page on landscape pages, and splits one too wide for those by columns', async () => {
    // The swap matrix with 40 bands: 42 columns, wider than a landscape A4 page.
    const bands = 40;
    const wide = structuredClone(report);
    wide.swapMatrix = {
      bands,
      championBands: Array.from({ length: bands }, (_, i) => ({ band: i + 1, scoreMin: 400 + i * 10, scoreMax: 409 + i * 10 })),
      challengerBands: Array.from({ length: bands }, (_, i) => ({ band: i + 1, scoreMin: 400 + i * 10, scoreMax: 409 + i * 10 })),
      cells: Array.from({ length: bands }, (_, i) => Array.from({ length: bands }, (_, j) => ({ count: 1000 + i * bands + j, bads: 10, badRate: 0.01 }))),
    };
    const input = await packInput(t.dataSource, id, { generatedFor: null, archived: false });
    const pdf = await renderPackPdf({ ...input, report: wide });
    const document = await pdfPages(pdf);
    const text = document.join(' ');
    expect(text).toMatch(/Accounts by champion band \(rows\) and challenger band \(columns\) \(columns, part 1 of [2-9]\)/);
    // Every count of the last challenger band, in the last part, is there.
    for (let i = 0; i < bands; i++) expect(text).toContain(formatCount(1000 + i * bands + bands - 1));
    const sizes = await pdfPageSizes(pdf);
    expect(sizes.some(([w, h]) => w > h)).toBe(true);
  });
});

describe('the committee workbook', () => {
  let bytes: Buffer;

  it('downloads for every role as .xlsx', async () => {
    for (const role of Object.keys(clients) as (keyof typeof clients)[]) {
      const response = await download(clients[role], `/api/comparisons/${id}/export/workbook.xlsx`);
      expect(response.status, role).toBe(200);
      expect(response.headers['content-type']).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
      expect(response.headers['content-disposition']).toBe(`attachment; filename="comparison-${id}-pack-check-workbook.xlsx"`);
      bytes = response.body;
    }
  });

  it('has one sheet per part, with the report’s numbers as numbers', async () => {
    const workbook = await readWorkbook(bytes);
    expect(workbook.worksheets.map((sheet) => sheet.name)).toEqual(['Summary', 'Champion bands', 'Challenger bands', 'Swap sets', 'Segments', 'Strategy curve', 'Swap matrix', 'Data quality']);
    const summary = sheetRows(workbook.getWorksheet('Summary')!);
    const gini = summary.find((row) => row[0] === 'Gini')!;
    expect(gini.slice(1, 4)).toEqual([report.champion.gini, report.challenger.gini, report.difference.gini]);
    expect(summary.find((row) => row[0] === 'AUC')!.slice(1, 4)).toEqual([report.champion.auc, report.challenger.auc, report.difference.auc]);
    const bands = sheetRows(workbook.getWorksheet('Champion bands')!).filter((row) => typeof row[0] === 'number');
    expect(bands).toEqual(report.bands.champion.rows.map((row) => [row.band, row.scoreMin, row.scoreMax, row.count, row.goods, row.bads, row.badRate, row.cumBadShare, row.cumGoodShare, row.ks, row.odds]));
    const swap = sheetRows(workbook.getWorksheet('Swap sets')!);
    expect(swap.find((row) => String(row[0]).startsWith('Swap-in'))!.slice(1, 5)).toEqual([report.swap.swapIn.count, report.swap.swapIn.share, report.swap.swapIn.bads, report.swap.swapIn.badRate]);
    const bySegmentHead = swap.find((row) => row[0] === 'Segment column')!.map(String);
    const bySegment = swap.filter((row) => row.length >= 12 && typeof row[2] === 'number');
    expect(bySegment.map((row) => ['Segment column', 'Value', 'Accounts', 'Swap-in', 'Swap-out'].map((name) => row[bySegmentHead.indexOf(name)]))).toEqual(
      report.swap.bySegment.map((row) => [row.column, row.value, row.accounts, row.swapIn.count, row.swapOut.count]),
    );
    const segments = sheetRows(workbook.getWorksheet('Segments')!).filter((row) => typeof row[2] === 'number');
    expect(segments.map((row) => row.slice(0, 8))).toEqual(report.segments.map((row) => [row.column, row.value, row.n, row.goods, row.bads, row.championGini, row.challengerGini, row.deltaGini]));
    const strategy = sheetRows(workbook.getWorksheet('Strategy curve')!).filter((row) => typeof row[0] === 'number');
    expect(strategy.map((row) => row[3])).toEqual(report.strategyCurve.points.map((point) => point.champion.portfolioBadRate));
    const matrix = sheetRows(workbook.getWorksheet('Swap matrix')!);
    const counts = matrix.slice(2, 2 + report.swapMatrix.bands).map((row) => row.slice(1));
    expect(counts).toEqual(report.swapMatrix.cells.map((row) => row.map((cell) => cell.count)));
    const quality = sheetRows(workbook.getWorksheet('Data quality')!);
    expect(quality.find((row) => row[0] === 'Rows read')![1]).toBe(report.dataQuality.rowsRead);
    // A number format on numbers (rates as percentages).
    const rate = workbook.getWorksheet('Champion bands')!.getRow(3).getCell(7);
    expect(typeof rate.value).toBe('number');
    expect(rate.numFmt).toBe('0.00%');
  });

  it('writes text that looks like a formula as text: no formula anywhere in the file', async () => {
    const workbook = await readWorkbook(bytes);
    const segments = sheetRows(workbook.getWorksheet('Segments')!);
    const values = segments.map((row) => row[1]);
    expect(values).toContain(injected['credit-card']);
    expect(values).toContain(injected['personal-loan']);
    workbook.eachSheet((sheet) =>
      sheet.eachRow((row) =>
        row.eachCell((c) => {
          expect(c.formula, `${sheet.name}!${c.address}`).toBeUndefined();
          expect(typeof c.value === 'number' || typeof c.value === 'string' || c.value === null, `${sheet.name}!${c.address}`).toBe(true);
        }),
      ),
    );
    // The file itself, read with another reader: no <f> element, and the injected values are shared strings.
    for (const xml of rawSheetXml(bytes)) expect(xml).not.toMatch(/<f[ >]/);
    const strings = sharedStringsXml(bytes);
    expect(strings).toContain('=HYPERLINK(&quot;http://x.test&quot;,&quot;card&quot;)');
    expect(strings).toContain('＝1+2');
  });
});

describe('the pack archived with the decision', () => {
  it('e-mails the committee a link to the PDF at validated', async () => {
    expect((await clients.modeler.post(`/api/comparisons/${id}/submit`, { message: 'For the pack.' })).status).toBe(200);
    const before = await lastOutboxId(t);
    const validated = await clients.analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Checked.' });
    expect(validated.status, JSON.stringify(validated.body)).toBe(200);
    const mail = await t.deliveredMail({ to: 'committee@tallowmere.test', afterId: before });
    expect(mail.receivedText).toContain(`http://scorecourt.test/comparisons/${id}/report?pack=pdf`);
  });

  it('stores the PDF with the decision, records its SHA-256 in the audit trail, and serves those bytes afterwards', async () => {
    // The default quorum is two votes: both demo committee members vote before the decision.
    const committee2 = new TestClient(t.app);
    expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
    for (const member of [clients.committee, committee2]) expect((await member.post(`/api/comparisons/${id}/votes`, { vote: 'adopt' })).status).toBe(200);
    const decided = await clients.committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Pack rationale: uplift is material.' });
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    const stored = await t.dataSource.getRepository(DecisionPack).find();
    expect(stored).toHaveLength(1);
    const trail = auditTrailSchema.parse((await clients.policy.get(`/api/comparisons/${id}/audit`)).body);
    const archived = trail.events.find((event) => event.action === 'comparison.pack_archived')!;
    const decidedEvent = trail.events.find((event) => event.action === 'comparison.decided')!;
    expect(archived.id).toBe(decidedEvent.id + 1);
    expect(archived.details).toMatchObject({ decisionId: stored[0].decisionId, sha256: stored[0].sha256, bytes: stored[0].bytes });
    expect(createHash('sha256').update(stored[0].pdf).digest('hex')).toBe(stored[0].sha256);

    const first = await download(clients.modeler, `/api/comparisons/${id}/export/pack.pdf`);
    const second = await download(clients.admin, `/api/comparisons/${id}/export/pack.pdf`);
    expect(first.headers['x-pack-archived']).toBe('decision');
    expect(first.headers['content-disposition']).toBe(`attachment; filename="comparison-${id}-pack-check-decided-pack.pdf"`);
    expect(createHash('sha256').update(first.body).digest('hex')).toBe(archived.details.sha256);
    expect(second.body.equals(first.body)).toBe(true);
    const text = (await pdfPages(first.body)).join(' ');
    expect(text).toContain('Pack rationale: uplift is material.');
    expect(text).toContain('archived with the committee’s decision');
    expect(text).toContain('Checked.');
  });
});
