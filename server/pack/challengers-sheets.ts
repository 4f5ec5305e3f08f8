import type ExcelJS from 'exceljs';
import { segmentsOf } from '@shared/challenger-sections';
import { championName, hasSeveralChallengers, verdictOutcomeLabels } from '@shared/challengers-words';
import { segmentFlagsText, segmentP, segmentPSidedness } from '@shared/segments-words';
import { type ChallengerResult, type ModelMetrics, type Report, type SegmentRow, statedBadRate, type SwapSegmentRow, swapInRiskier } from '@shared/report';
import { col, F, facts, type Field, writeFields } from './workbook-tables';

/**
 * The committee workbook's sheets for several challengers (none with one challenger, so a
 * two-model workbook is as before): every model with its test against the champion and the Holm
 * p, the joint test and every pair; each challenger's swap sets at the report's approval rate; the
 * approval patterns; every challenger's segment rows with their harm flags (challengerSegmentsSheet).
 * Numbers as the report holds them (fractions), text as text, never a formula.
 */
export function challengersSheet(workbook: ExcelJS.Workbook, report: Report): void {
  if (!hasSeveralChallengers(report)) return;
  const sheet = workbook.addWorksheet('Challengers');
  const champion = report.champion;
  facts(sheet, 'The choice', [
    ['Challengers', report.challengers.length, F.count],
    ['Recommended', report.choice?.recommended === null || report.choice === undefined ? 'none' : report.challengers[report.choice.recommended]!.name],
    ['Why', report.choice?.summary ?? ''],
    ['Joint test χ² (DeLong, DeLong & Clarke-Pearson 1988)', report.joint?.chi2 ?? null, F.number],
    ['Joint test degrees of freedom', report.joint?.df ?? null, F.count],
    ['Joint test p', report.joint?.p ?? null, F.p],
  ]);
  // The champion's row has its metrics only; each challenger's adds its test against the champion.
  type ModelRow = { name: string; role: string; column: string; metrics: ModelMetrics; challenger: ChallengerResult | null; index: number };
  const models: ModelRow[] = [
    { name: championName(report), role: 'champion', column: report.mapping.champion, metrics: champion, challenger: null, index: -1 },
    ...report.challengers.map((challenger, index) => ({ name: challenger.name, role: `challenger ${index + 1}`, column: challenger.column, metrics: challenger.metrics, challenger, index })),
  ];
  writeFields<ModelRow>(
    sheet,
    'Every model (fractions: Gini 0.4213 is 42.13 points); each challenger − the champion, DeLong, Holm across the challengers',
    [
      col.text('Model', (row) => row.name, 28),
      col.text('Role', (row) => row.role, 14),
      col.text('Column', (row) => row.column, 18),
      col.text('Higher is', (row) => row.metrics.higherIs, 10),
      col.metric('AUC', (row) => row.metrics.auc),
      col.metric('Gini', (row) => row.metrics.gini),
      col.metric('KS', (row) => row.metrics.ks),
      col.metric('ΔGini', (row) => row.challenger?.difference.gini ?? null),
      ...col.interval<ModelRow>('ΔGini interval', F.metric, (row) => row.challenger?.difference.giniCi, 18),
      col.metric('se(ΔGini)', (row) => row.challenger?.difference.giniSe ?? null),
      col.number('z', (row) => row.challenger?.difference.z ?? null),
      col.p('p one-sided', (row) => row.challenger?.difference.pOneSided ?? null),
      col.p('p two-sided', (row) => row.challenger?.difference.pTwoSided ?? null),
      col.p('Holm p one-sided', (row) => row.challenger?.pOneSidedHolm ?? null, 16),
      col.p('Holm p two-sided', (row) => row.challenger?.pTwoSidedHolm ?? null, 16),
      col.text('Verdict', (row) => (row.challenger ? verdictOutcomeLabels[row.challenger.verdict.outcome] : null), 20),
      col.text('Recommended', (row) => (row.challenger ? (report.choice?.recommended === row.index ? 'yes' : 'no') : null), 12),
    ],
    models,
  );
  const name = (index: number) => report.challengers[index]!.name;
  writeFields<NonNullable<Report['pairwise']>[number]>(
    sheet,
    'Every pair of challengers: second − first, DeLong (not adjusted for multiplicity)',
    [
      col.text('First', (pair) => name(pair.a), 28),
      col.text('Second', (pair) => name(pair.b), 28),
      col.metric('ΔGini', (pair) => pair.deltaGini),
      col.metric('se(ΔGini)', (pair) => pair.se),
      col.number('z', (pair) => pair.z),
      col.p('p two-sided', (pair) => pair.pTwoSided),
    ],
    report.pairwise ?? [],
  );
  type Side = ChallengerResult['swap']['swapIn'];
  const side = (label: 'Swap-in' | 'Swap-out', of: (swap: ChallengerResult['swap']) => Side): Field<ChallengerResult>[] => [
    col.count(`${label} applicants`, ({ swap }) => of(swap).accounts ?? of(swap).count, 18),
    col.count(`${label} bads`, ({ swap }) => of(swap).bads, 14),
    col.rate(`${label} bad rate`, ({ swap }) => statedBadRate(of(swap)), 16),
  ];
  writeFields<ChallengerResult>(
    sheet,
    `Swap sets of every challenger against the champion at a ${report.approvalPatterns?.approvalRate ?? report.settings.approvalRate} approval rate`,
    [
      col.text('Challenger', (challenger) => challenger.name, 28),
      col.score('Champion cut-off', ({ swap }) => swap.champion.cutoff, 16),
      col.score('Challenger cut-off', ({ swap }) => swap.challenger.cutoff, 16),
      ...side('Swap-in', (swap) => swap.swapIn),
      ...side('Swap-out', (swap) => swap.swapOut),
      col.rate('Both approve bad rate', ({ swap }) => statedBadRate(swap.bothAccept), 20),
    ],
    report.challengers,
  );
  const patterns = report.approvalPatterns;
  if (!patterns) return;
  const approvals = workbook.addWorksheet('Approval patterns');
  writeFields<(typeof patterns.models)[number]>(
    approvals,
    `Each model at its own cut-off for a ${patterns.approvalRate} approval rate`,
    [
      col.text('Model', (model) => model.name, 28),
      col.text('Column', (model) => model.column, 18),
      col.score('Cut-off', (model) => model.cutoff),
      col.share('Approval rate', (model) => model.approvalRate, 14),
    ],
    patterns.models,
  );
  writeFields<(typeof patterns.combinations)[number]>(
    approvals,
    'Applicants by the combination of models that approve them',
    [
      ...patterns.models.map((model, index) =>
        col.text<(typeof patterns.combinations)[number]>(model.name, (combination) => (combination.approved[index] ? 'approves' : 'declines'), Math.max(12, model.name.length + 2)),
      ),
      col.count('Rows', (combination) => combination.count),
      col.count('Applicants', (combination) => combination.accounts),
      col.count('With an outcome', (combination) => combination.known, 16),
      col.number('Bads', (combination) => combination.bads),
      col.rate('Bad rate', (combination) => combination.badRate),
    ],
    patterns.combinations,
  );
}

/**
 * The columns of every segments sheet, the first challenger's ("Segments") and every challenger's
 * ("Segments by challenger") alike: per value the counts, both Ginis, ΔGini with its standard
 * error and DeLong interval, the p (two-sided since engine 1.2; the header says which, as
 * segmentPSidedness does for the printed tables), the Holm-adjusted p across that challenger's
 * rows, the harm flags, "few bads" and the note. Fractions, as the report holds them.
 */
export function segmentFields<Row extends SegmentRow>(report: Pick<Report, 'segments' | 'challengers' | 'policy'>, k = 0): Field<Row>[] {
  return [
    col.text('Segment column', (row) => row.column, 18),
    col.text('Value', (row) => row.value, 18),
    col.count('Accounts', (row) => row.n),
    col.count('Goods', (row) => row.goods),
    col.count('Bads', (row) => row.bads),
    col.metric('Champion Gini', (row) => row.championGini, 15),
    col.metric('Challenger Gini', (row) => row.challengerGini, 15),
    col.metric('ΔGini', (row) => row.deltaGini),
    col.metric('se(ΔGini)', (row) => row.giniSe),
    ...col.interval<Row>('ΔGini interval', F.metric, (row) => row.giniCi ?? null, 18),
    col.p(`p, ${segmentPSidedness(report, k)}`, (row) => segmentP(row), 14),
    col.p('Holm p', (row) => row.pHolm),
    col.text('Flag', (row) => segmentFlagsText(row.flags ?? []), 30),
    col.yesNo('Few bads', (row) => row.tooFewBads),
    col.text('Note', (row) => row.note, 40),
  ];
}

/**
 * Several challengers: every challenger against the champion within each segment value, in the
 * columns of the first challenger's Segments sheet (segmentFields), the challenger named first:
 * the report's `segments` for the first, each further challenger's own rows after it. None with
 * one challenger.
 */
export function challengerSegmentsSheet(workbook: ExcelJS.Workbook, report: Report): void {
  if (!hasSeveralChallengers(report) || report.segments.length === 0) return;
  const sheet = workbook.addWorksheet('Segments by challenger');
  type Row = SegmentRow & { challenger: string };
  writeFields<Row>(
    sheet,
    'Each challenger − the champion per segment value (fractions), DeLong, Holm across that challenger’s rows',
    [col.text('Challenger', (row) => row.challenger, 28), ...segmentFields<Row>(report)],
    report.challengers.flatMap((challenger, index) => segmentsOf(report, index).map((row) => ({ ...row, challenger: challenger.name }))),
  );
}

/**
 * The columns of every "swap sets by segment" table in the workbook, the first challenger's (on
 * the Swap sets sheet, at the report's cut-offs) and every challenger's (at the report's approval
 * rate) alike: per value its applicants, both models' approval rates and the bad rates of what
 * they approve, and the swap-in and swap-out rows, applicants (weighted), bads and bad rate of
 * those with an outcome, and the flag when the swap-in is riskier.
 */
export function swapSegmentFields<Row extends SwapSegmentRow>(): Field<Row>[] {
  const side = (label: 'Swap-in' | 'Swap-out', of: (row: Row) => SwapSegmentRow['swapIn']): Field<Row>[] => [
    col.count(label, (row) => of(row).count),
    col.count(`${label} applicants`, (row) => of(row).accounts ?? of(row).count, 18),
    col.count(`${label} bads`, (row) => of(row).bads, 14),
    col.rate(`${label} bad rate`, (row) => of(row).badRate, 16),
  ];
  return [
    col.text('Segment column', (row) => row.column, 18),
    col.text('Value', (row) => row.value, 18),
    col.count('Accounts', (row) => row.accounts),
    col.count('Without an outcome', (row) => row.unknown ?? 0, 18),
    col.count('Bads', (row) => row.bads),
    col.share('Champion approval rate', (row) => row.champion.approvalRate, 22),
    col.share('Challenger approval rate', (row) => row.challenger.approvalRate, 22),
    col.rate('Champion approved bad rate', (row) => row.champion.approvedBadRate, 24),
    col.rate('Challenger approved bad rate', (row) => row.challenger.approvedBadRate, 24),
    ...side('Swap-in', (row) => row.swapIn),
    ...side('Swap-out', (row) => row.swapOut),
    col.text('Flag', (row) => (swapInRiskier(row) ? 'swap-in riskier' : ''), 18),
  ];
}

/**
 * Several challengers: who changes sides within each segment value for every challenger against
 * the champion, both at their cut-offs for the report's approval rate (each challenger's `swap`),
 * in the columns of the first challenger's table on the Swap sets sheet. None with one challenger
 * or without segment columns.
 */
export function challengerSwapSegmentsSheet(workbook: ExcelJS.Workbook, report: Report): void {
  if (!hasSeveralChallengers(report) || report.challengers.every((challenger) => challenger.swap.bySegment.length === 0)) return;
  const sheet = workbook.addWorksheet('Swap by segment, challengers');
  type Row = SwapSegmentRow & { challengerName: string };
  writeFields<Row>(
    sheet,
    `Swap sets by segment of every challenger against the champion, both at their cut-offs for a ${report.approvalPatterns?.approvalRate ?? report.settings.approvalRate} approval rate (rates as fractions)`,
    [col.text('Challenger', (row) => row.challengerName, 28), ...swapSegmentFields<Row>()],
    report.challengers.flatMap((challenger) => challenger.swap.bySegment.map((row) => ({ ...row, challengerName: challenger.name }))),
  );
}
