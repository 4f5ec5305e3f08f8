import ExcelJS from 'exceljs';
import { type BandTable, type Report } from '@shared/report';
import { fileWithSheet } from '@shared/input-file';
import { formatFixed } from '@shared/format';
import { calibrationSheet, stabilitySheet } from './calibration-sheets';
import { bandsOf } from '@shared/challenger-sections';
import { challengerSegmentsSheet, challengersSheet, challengerSwapSegmentsSheet, segmentFields, swapSegmentFields } from './challengers-sheets';
import { col, type Column, F, facts, type Field, intervalRows, writeFields, writeTable } from './workbook-tables';

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

function summary(workbook: ExcelJS.Workbook, report: Report, comparison: { id: number; name: string }): void {
  const sheet = workbook.addWorksheet('Summary');
  const { champion, challenger, difference, verdict } = report;
  facts(sheet, `Comparison ${comparison.id}: ${comparison.name}`, [
    ['File', fileWithSheet(report.input)],
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
      ...intervalRows('AUC interval', [champion.aucCi, challenger.aucCi, difference.aucCi]),
      ['Gini', champion.gini, challenger.gini, difference.gini],
      ...intervalRows('Gini interval', [champion.giniCi, challenger.giniCi, difference.giniCi]),
      ...intervalRows('ΔGini bootstrap interval', [null, null, difference.giniBootstrapCi]),
      ['KS', champion.ks, challenger.ks, difference.ks],
      ...intervalRows('KS interval', [champion.ksCi, challenger.ksCi, difference.ksCi]),
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
  writeFields<BandTable['rows'][number]>(
    sheet,
    `${name} (band 1 is the riskiest; trapezoid Gini ${formatFixed(table.giniTrapezoid, 4)})`,
    [
      col.text('Band', (row) => row.band),
      col.score('Score from', (row) => row.scoreMin),
      col.score('Score to', (row) => row.scoreMax),
      col.count('Accounts', (row) => row.count),
      col.count('Goods', (row) => row.goods),
      col.count('Bads', (row) => row.bads),
      col.rate('Bad rate', (row) => row.badRate),
      col.share('Cumulative share of bads', (row) => row.cumBadShare, 24),
      col.share('Cumulative share of goods', (row) => row.cumGoodShare, 24),
      col.metric('KS', (row) => row.ks),
      col.number('Odds (good:bad)', (row) => row.odds, 16),
    ],
    table.rows,
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
  writeFields<(typeof cells)[number]>(
    sheet,
    'Swap cells',
    [
      col.text('Cell', ([label]) => label, 34),
      col.count('Accounts', ([, c]) => c.count),
      col.share('Share', ([, c]) => c.share),
      col.count('Bads', ([, c]) => c.bads),
      col.rate('Bad rate', ([, c]) => c.badRate),
      ...col.interval<(typeof cells)[number]>('Interval', F.rate, ([, c]) => c.badRateCi),
      col.count('Amount', ([, c]) => c.amount),
    ],
    cells,
  );
  writeFields<Report['swap']['bySegment'][number]>(sheet, 'Swap sets by segment', swapSegmentFields(), swap.bySegment);
}

function segmentsSheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Segments');
  writeFields<Report['segments'][number]>(
    sheet,
    'ΔGini per segment value (fractions), DeLong interval and p, Holm-adjusted p across the rows, harm flags',
    segmentFields(report),
    report.segments,
  );
}

function strategySheet(workbook: ExcelJS.Workbook, report: Report): void {
  const sheet = workbook.addWorksheet('Strategy curve');
  type Point = Report['strategyCurve']['points'][number];
  const model = (name: string, key: 'champion' | 'challenger'): Field<Point>[] => [
    col.score(`${name} cut-off`, (p) => p[key].cutoff, 16),
    col.share(`${name} achieved rate`, (p) => p[key].achievedApprovalRate, 22),
    col.rate(`${name} bad rate`, (p) => p[key].portfolioBadRate, 18),
    col.rate(`${name} marginal bad rate`, (p) => p[key].marginalBadRate, 24),
  ];
  writeFields<Point>(
    sheet,
    'Bad rate of the approved book at each approval rate',
    [col.share('Approval rate', (p) => p.approvalRate, 14), ...model('Champion', 'champion'), ...model('Challenger', 'challenger')],
    report.strategyCurve.points,
  );
  const at = report.strategyCurve.atApprovalRate;
  facts(sheet, 'At the report’s approval rate', [
    ['Approval rate', at.approvalRate, F.share],
    ['Accounts approved by each book (the champion’s at its cut-off)', at.accounts, F.count],
    ['Champion approved bads', at.championBads, F.count],
    ['Challenger bads in a book of that size (tie block in proportion)', at.challengerBads, F.count],
    ['Bads avoided at equal approval', at.badsAvoided, F.count],
    ['Challenger accounts at its own cut-off', at.challengerAtCutoff.accounts, F.count],
    ['Challenger bads at its own cut-off', at.challengerAtCutoff.bads, F.count],
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
  writeFields<'champion' | 'challenger'>(
    sheet,
    'Scores as given',
    [
      col.text('Model', (key) => key, 34),
      col.score('Lowest', (key) => quality[key].min),
      col.score('Highest', (key) => quality[key].max),
      col.number('Mean', (key) => quality[key].mean),
      col.count('Distinct values', (key) => quality[key].distinct, 15),
    ],
    ['champion', 'challenger'] as const,
  );
  writeTable(sheet, 'Empty cells by column', [{ header: 'Column', width: 34 }, { header: 'Empty cells', format: F.count }], Object.entries(quality.missingByColumn));
  writeTable(sheet, 'Warnings', [{ header: 'Warning', width: 100 }], quality.warnings.map((warning) => [warning]));
}

/** Several challengers: the band table of each challenger after the first (none with one challenger). */
function moreChallengerBands(workbook: ExcelJS.Workbook, report: Report): void {
  (report.challengers ?? []).forEach((_, index) => {
    const table = bandsOf(report, index);
    if (index > 0 && table) bandSheet(workbook, `Challenger ${index + 1} bands`, table);
  });
}

/** The workbook's sheets in order; a new sheet is added here. */
const sheets: ((workbook: ExcelJS.Workbook, report: Report, comparison: { id: number; name: string }) => void)[] = [
  summary,
  challengersSheet,
  (workbook, report) => bandSheet(workbook, 'Champion bands', report.bands.champion),
  (workbook, report) => bandSheet(workbook, 'Challenger bands', report.bands.challenger),
  moreChallengerBands,
  swapSheet,
  challengerSwapSegmentsSheet,
  segmentsSheet,
  challengerSegmentsSheet,
  strategySheet,
  matrixSheet,
  qualitySheet,
  calibrationSheet,
  stabilitySheet,
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
