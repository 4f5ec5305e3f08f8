import ExcelJS from 'exceljs';
import { type BandTable, type Report, swapInRiskier } from '@shared/report';

/**
 * The committee workbook (.xlsx, exceljs): one sheet each for the summary, both band tables, the
 * swap sets (cut-offs, cells, by segment), the segments, the strategy curve, the swap matrix and
 * data quality. Numbers are written as numbers, exactly as the report holds them (rates, Gini,
 * AUC and KS as fractions), with a number format for reading; text is written as text.
 *
 * Formula injection: no cell is ever written as a formula. Every value goes through `cell()`,
 * which writes a number only for a finite JS number and a string for everything else, so text
 * from a file or a person ("=HYPERLINK(…)", "＝1+1", "@SUM(…)") is a string cell and stays one.
 * A new sheet is one more function in `sheets`.
 */

type Value = string | number | null;

interface Column {
  header: string;
  /** Excel number format for numbers in this column. */
  format?: string;
  width?: number;
}

const F = {
  count: '#,##0',
  rate: '0.00%',
  share: '0.0%',
  metric: '0.0000',
  p: '0.0000E+00',
  score: '#,##0.####',
  number: '#,##0.00',
} as const;

function cell(value: unknown): string | number | null {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  return String(value);
}

function writeTable(sheet: ExcelJS.Worksheet, title: string, columns: Column[], rows: Value[][]): void {
  if (sheet.rowCount > 0) sheet.addRow([]);
  const titleRow = sheet.addRow([title]);
  titleRow.font = { bold: true };
  const head = sheet.addRow(columns.map((column) => column.header));
  head.font = { bold: true };
  head.eachCell((c) => {
    c.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFEEECE6' } };
  });
  for (const values of rows) {
    const row = sheet.addRow(values.map(cell));
    values.forEach((value, index) => {
      const format = columns[index]?.format;
      if (typeof value === 'number' && format) row.getCell(index + 1).numFmt = format;
    });
  }
  columns.forEach((column, index) => {
    const current = sheet.getColumn(index + 1);
    current.width = Math.max(current.width ?? 0, column.width ?? Math.min(60, Math.max(10, column.header.length + 2)));
  });
}

function facts(sheet: ExcelJS.Worksheet, title: string, rows: [string, Value, string?][]): void {
  writeTable(
    sheet,
    title,
    [{ header: 'Item', width: 34 }, { header: 'Value', width: 24 }],
    rows.map(([label, value]) => [label, value]),
  );
  // Per-row formats (a facts table mixes counts, rates and metrics).
  const first = sheet.rowCount - rows.length + 1;
  rows.forEach(([, value, format], index) => {
    if (typeof value === 'number' && format) sheet.getRow(first + index).getCell(2).numFmt = format;
  });
}

function summary(workbook: ExcelJS.Workbook, report: Report, comparison: { id: number; name: string }): void {
  const sheet = workbook.addWorksheet('Summary');
  const { champion, challenger, difference, verdict } = report;
  facts(sheet, `Comparison ${comparison.id}: ${comparison.name}`, [
    ['File', report.input.fileName],
    ['SHA-256', report.input.sha256],
    ['Engine version', report.engineVersion],
    ['Rows used', report.rows, F.count],
    ['Goods', report.goods, F.count],
    ['Bads', report.bads, F.count],
    ['Bad rate', report.badRate, F.rate],
    ['Confidence', report.settings.confidence, F.share],
    ['Bootstrap replicates', report.settings.bootstrap, F.count],
    ['Random seed', report.settings.seed],
    ['Verdict', verdict.outcome],
    ['Verdict summary', verdict.summary],
    ['Adoption policy version', verdict.policyVersion],
  ]);
  writeTable(
    sheet,
    'Metrics (fractions: Gini 0.4213 is 42.13 points)',
    [{ header: 'Metric', width: 34 }, { header: 'Champion', format: F.metric, width: 14 }, { header: 'Challenger', format: F.metric, width: 14 }, { header: 'Challenger − champion', format: F.metric, width: 22 }],
    [
      ['AUC', champion.auc, challenger.auc, difference.auc],
      ['AUC interval, low', champion.aucCi?.[0] ?? null, challenger.aucCi?.[0] ?? null, difference.aucCi?.[0] ?? null],
      ['AUC interval, high', champion.aucCi?.[1] ?? null, challenger.aucCi?.[1] ?? null, difference.aucCi?.[1] ?? null],
      ['Gini', champion.gini, challenger.gini, difference.gini],
      ['Gini interval, low', champion.giniCi?.[0] ?? null, challenger.giniCi?.[0] ?? null, difference.giniCi?.[0] ?? null],
      ['Gini interval, high', champion.giniCi?.[1] ?? null, challenger.giniCi?.[1] ?? null, difference.giniCi?.[1] ?? null],
      ['ΔGini bootstrap interval, low', null, null, difference.giniBootstrapCi?.[0] ?? null],
      ['ΔGini bootstrap interval, high', null, null, difference.giniBootstrapCi?.[1] ?? null],
      ['KS', champion.ks, challenger.ks, difference.ks],
      ['KS interval, low', champion.ksCi?.[0] ?? null, challenger.ksCi?.[0] ?? null, difference.ksCi?.[0] ?? null],
      ['KS interval, high', champion.ksCi?.[1] ?? null, challenger.ksCi?.[1] ?? null, difference.ksCi?.[1] ?? null],
    ],
  );
  writeTable(
    sheet,
    'Tests',
    [{ header: 'Test', width: 34 }, { header: 'Statistic', format: F.number }, { header: 'p one-sided', format: F.p }, { header: 'p two-sided', format: F.p }],
    [
      ['DeLong paired test of ΔAUC (z)', difference.z, difference.pOneSided, difference.pTwoSided],
      [`Swap-in vs swap-out bad rate (${report.swap.test.method})`, report.swap.test.z, null, report.swap.test.p],
    ],
  );
  writeTable(
    sheet,
    'Adoption criteria',
    [{ header: 'Criterion', width: 34 }, { header: 'Met' }, { header: 'Why', width: 80 }],
    verdict.criteria.map((criterion) => [criterion.label, criterion.met ? 'met' : 'not met', criterion.detail]),
  );
}

function bandSheet(workbook: ExcelJS.Workbook, name: string, table: BandTable): void {
  const sheet = workbook.addWorksheet(name);
  writeTable(
    sheet,
    `${name} (band 1 is the riskiest; trapezoid Gini ${table.giniTrapezoid.toFixed(4)})`,
    [
      { header: 'Band' },
      { header: 'Score from', format: F.score },
      { header: 'Score to', format: F.score },
      { header: 'Accounts', format: F.count },
      { header: 'Goods', format: F.count },
      { header: 'Bads', format: F.count },
      { header: 'Bad rate', format: F.rate },
      { header: 'Cumulative share of bads', format: F.share, width: 24 },
      { header: 'Cumulative share of goods', format: F.share, width: 24 },
      { header: 'KS', format: F.metric },
      { header: 'Odds (good:bad)', format: F.number, width: 16 },
    ],
    table.rows.map((row) => [row.band, row.scoreMin, row.scoreMax, row.count, row.goods, row.bads, row.badRate, row.cumBadShare, row.cumGoodShare, row.ks, row.odds]),
  );
}

function swapSheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Swap sets');
  const { swap } = report;
  writeTable(
    sheet,
    `Cut-offs (${swap.basis === 'approval-rate' ? 'matched to one approval rate' : 'given per model'})`,
    [{ header: 'Model', width: 34 }, { header: 'Cut-off', format: F.score, width: 14 }, { header: 'Approval rate', format: F.share, width: 14 }],
    [
      ['Champion', swap.champion.cutoff, swap.champion.approvalRate],
      ['Challenger', swap.challenger.cutoff, swap.challenger.approvalRate],
    ],
  );
  const cells = [
    ['Both accept', swap.bothAccept],
    ['Swap-in (champion declines, challenger accepts)', swap.swapIn],
    ['Swap-out (champion accepts, challenger declines)', swap.swapOut],
    ['Both decline', swap.bothReject],
  ] as const;
  writeTable(
    sheet,
    'Swap cells',
    [
      { header: 'Cell', width: 34 },
      { header: 'Accounts', format: F.count },
      { header: 'Share', format: F.share },
      { header: 'Bads', format: F.count },
      { header: 'Bad rate', format: F.rate },
      { header: 'Interval, low', format: F.rate },
      { header: 'Interval, high', format: F.rate },
      { header: 'Amount', format: F.count },
    ],
    cells.map(([label, c]) => [label, c.count, c.share, c.bads, c.badRate, c.badRateCi?.[0] ?? null, c.badRateCi?.[1] ?? null, c.amount]),
  );
  writeTable(
    sheet,
    'Swap sets by segment',
    [
      { header: 'Segment column', width: 18 },
      { header: 'Value', width: 18 },
      { header: 'Accounts', format: F.count },
      { header: 'Bads', format: F.count },
      { header: 'Champion approval rate', format: F.share, width: 22 },
      { header: 'Challenger approval rate', format: F.share, width: 22 },
      { header: 'Champion approved bad rate', format: F.rate, width: 24 },
      { header: 'Challenger approved bad rate', format: F.rate, width: 24 },
      { header: 'Swap-in', format: F.count },
      { header: 'Swap-in bad rate', format: F.rate, width: 16 },
      { header: 'Swap-out', format: F.count },
      { header: 'Swap-out bad rate', format: F.rate, width: 16 },
      { header: 'Flag', width: 18 },
    ],
    swap.bySegment.map((row) => [
      row.column,
      row.value,
      row.accounts,
      row.bads,
      row.champion.approvalRate,
      row.challenger.approvalRate,
      row.champion.approvedBadRate,
      row.challenger.approvedBadRate,
      row.swapIn.count,
      row.swapIn.badRate,
      row.swapOut.count,
      row.swapOut.badRate,
      swapInRiskier(row) ? 'swap-in riskier' : '',
    ]),
  );
}

function segmentsSheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Segments');
  writeTable(
    sheet,
    'ΔGini per segment value (fractions), DeLong p and Holm-adjusted p',
    [
      { header: 'Segment column', width: 18 },
      { header: 'Value', width: 18 },
      { header: 'Accounts', format: F.count },
      { header: 'Goods', format: F.count },
      { header: 'Bads', format: F.count },
      { header: 'Champion Gini', format: F.metric, width: 15 },
      { header: 'Challenger Gini', format: F.metric, width: 15 },
      { header: 'ΔGini', format: F.metric },
      { header: 'se(ΔGini)', format: F.metric },
      { header: 'p', format: F.p },
      { header: 'Holm p', format: F.p },
      { header: 'Few bads' },
      { header: 'Note', width: 40 },
    ],
    report.segments.map((row) => [row.column, row.value, row.n, row.goods, row.bads, row.championGini, row.challengerGini, row.deltaGini, row.giniSe, row.p, row.pHolm, row.tooFewBads ? 'yes' : 'no', row.note]),
  );
}

function strategySheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Strategy curve');
  writeTable(
    sheet,
    'Bad rate of the approved book at each approval rate',
    [
      { header: 'Approval rate', format: F.share, width: 14 },
      { header: 'Champion cut-off', format: F.score, width: 16 },
      { header: 'Champion achieved rate', format: F.share, width: 22 },
      { header: 'Champion bad rate', format: F.rate, width: 18 },
      { header: 'Champion marginal bad rate', format: F.rate, width: 24 },
      { header: 'Challenger cut-off', format: F.score, width: 16 },
      { header: 'Challenger achieved rate', format: F.share, width: 22 },
      { header: 'Challenger bad rate', format: F.rate, width: 18 },
      { header: 'Challenger marginal bad rate', format: F.rate, width: 24 },
    ],
    report.strategyCurve.points.map((p) => [
      p.approvalRate,
      p.champion.cutoff,
      p.champion.achievedApprovalRate,
      p.champion.portfolioBadRate,
      p.champion.marginalBadRate,
      p.challenger.cutoff,
      p.challenger.achievedApprovalRate,
      p.challenger.portfolioBadRate,
      p.challenger.marginalBadRate,
    ]),
  );
  const at = report.strategyCurve.atApprovalRate;
  facts(sheet, 'At the report’s approval rate', [
    ['Approval rate', at.approvalRate, F.share],
    ['Champion approved bads', at.championBads, F.count],
    ['Challenger approved bads', at.challengerBads, F.count],
    ['Bads avoided', at.badsAvoided, F.count],
    ['More approvals at the champion’s bad rate', at.approvalsGainedAtEqualBadRate, F.count],
  ]);
}

function matrixSheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Swap matrix');
  const matrix = report.swapMatrix;
  const columns: Column[] = [{ header: 'Champion band', width: 16 }, ...matrix.challengerBands.map((band) => ({ header: `Challenger ${band.band}`, format: F.count, width: 13 }))];
  writeTable(sheet, 'Accounts: champion band (rows) × challenger band (columns); band 1 is the riskiest', columns, matrix.cells.map((row, i) => [matrix.championBands[i].band, ...row.map((c) => c.count)]));
  writeTable(sheet, 'Bads', columns, matrix.cells.map((row, i) => [matrix.championBands[i].band, ...row.map((c) => c.bads)]));
  writeTable(
    sheet,
    'Bad rate',
    columns.map((column, index) => (index === 0 ? column : { ...column, format: F.rate })),
    matrix.cells.map((row, i) => [matrix.championBands[i].band, ...row.map((c) => c.badRate)]),
  );
  writeTable(
    sheet,
    'Band score ranges',
    [{ header: 'Band' }, { header: 'Champion from', format: F.score, width: 15 }, { header: 'Champion to', format: F.score, width: 15 }, { header: 'Challenger from', format: F.score, width: 15 }, { header: 'Challenger to', format: F.score, width: 15 }],
    matrix.championBands.map((band, i) => [band.band, band.scoreMin, band.scoreMax, matrix.challengerBands[i]?.scoreMin ?? null, matrix.challengerBands[i]?.scoreMax ?? null]),
  );
}

function qualitySheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Data quality');
  const quality = report.dataQuality;
  facts(sheet, 'Rows and scores', [
    ['Rows read', quality.rowsRead, F.count],
    ['Rows used', quality.rowsUsed, F.count],
    ['Rows left out for a missing score', quality.rowsDroppedMissingScore, F.count],
    ['Duplicate ids', quality.duplicateIds, F.count],
    ['Score correlation (Pearson)', quality.scoreCorrelation.pearson, F.metric],
    ['Score correlation (Spearman)', quality.scoreCorrelation.spearman, F.metric],
  ]);
  writeTable(
    sheet,
    'Scores as given',
    [{ header: 'Model', width: 34 }, { header: 'Lowest', format: F.score }, { header: 'Highest', format: F.score }, { header: 'Mean', format: F.number }, { header: 'Distinct values', format: F.count, width: 15 }],
    (['champion', 'challenger'] as const).map((key) => [key, quality[key].min, quality[key].max, quality[key].mean, quality[key].distinct]),
  );
  writeTable(sheet, 'Empty cells by column', [{ header: 'Column', width: 34 }, { header: 'Empty cells', format: F.count }], Object.entries(quality.missingByColumn));
  writeTable(sheet, 'Warnings', [{ header: 'Warning', width: 100 }], quality.warnings.map((warning) => [warning]));
}

/** The workbook's sheets in order; a new sheet is added here. */
const sheets: ((workbook: ExcelJS.Workbook, report: Report, comparison: { id: number; name: string }) => void)[] = [
  summary,
  (workbook, report) => bandSheet(workbook, 'Champion bands', report.bands.champion),
  (workbook, report) => bandSheet(workbook, 'Challenger bands', report.bands.challenger),
  swapSheet,
  segmentsSheet,
  strategySheet,
  matrixSheet,
  qualitySheet,
];

export async function buildWorkbook(report: Report, comparison: { id: number; name: string }): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook();
  workbook.creator = 'Scorecourt';
  // Fixed dates: the same report gives the same workbook.
  workbook.created = new Date(0);
  workbook.modified = new Date(0);
  for (const sheet of sheets) sheet(workbook, report, comparison);
  return Buffer.from(await workbook.xlsx.writeBuffer());
}
