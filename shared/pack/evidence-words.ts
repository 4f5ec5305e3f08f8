import {
  formatAuc,
  formatAucDelta,
  formatBytes,
  formatCount,
  formatGini,
  formatGiniDelta,
  formatInterval,
  formatKs,
  formatKsDelta,
  formatMoney,
  formatNumber,
  formatPercent,
  formatPValue,
  formatScore,
  formatSignedNumber,
} from '../format';
import { fileWithSheet } from '../input-file';
import { cellAccounts, cellRateWords, populationFacts, swapUnknownNote } from '../population-words';
import { type Report, swapInRiskier } from '../report';
import { type WordedTable } from '../word-table';

/**
 * The evidence of a stored report in words: the data, the settings, the metrics table, the tests
 * table and the swap-set cells, as the committee pack (server/pack/sections.ts) and the printable
 * report (src/features/governance/components/report/report-evidence.tsx) both print them. One
 * wording, so the PDF and the page never say the same thing two ways; each lays the words out in
 * its own medium. Every number goes through shared/format.ts.
 */

export type Fact = [label: string, text: string];

const orientation = { safer: 'higher is safer', riskier: 'higher is riskier' } as const;

/** The data behind the report: the file and its hash, counts, and the columns mapped. */
export function dataFacts(report: Report): Fact[] {
  const { mapping } = report;
  return [
    ['File', fileWithSheet(report.input)],
    ['SHA-256', report.input.sha256],
    ['Size', formatBytes(report.input.bytes)],
    ['Rows read / used', `${formatCount(report.dataQuality.rowsRead)} / ${formatCount(report.population?.rows ?? report.rows)}`],
    // Applicants without an outcome or weights: the population and the inference, in words.
    ...(populationFacts(report) ?? [
      ['Goods / bads', `${formatCount(report.goods)} / ${formatCount(report.bads)}`] satisfies Fact,
      ['Bad rate', formatPercent(report.badRate, 2)] satisfies Fact,
    ]),
    ['Outcome', `${mapping.outcome} (bad = “${mapping.badValue}”)`],
    ['Champion', `${mapping.champion} (${orientation[mapping.higherIs.champion]})`],
    ['Challenger', `${mapping.challenger} (${orientation[mapping.higherIs.challenger]})`],
    ['Segments', mapping.segments && mapping.segments.length > 0 ? mapping.segments.join(', ') : 'none'],
    ['Exposure', mapping.exposure ?? 'none'],
  ];
}

/** The settings, the engine and the policy the report was made with; `run` names the analysis run. */
export function settingsFacts(report: Report, run: string): Fact[] {
  const { settings } = report;
  return [
    ['Random seed', String(settings.seed)],
    ['Bootstrap', settings.bootstrap > 0 ? `${formatCount(settings.bootstrap)} paired, stratified replicates` : 'not run'],
    ['Confidence', formatPercent(settings.confidence, 0)],
    [
      'Swap sets at',
      settings.cutoffs
        ? `cut-offs ${formatScore(settings.cutoffs.champion)} (champion) and ${formatScore(settings.cutoffs.challenger)} (challenger)`
        : `a ${formatPercent(settings.approvalRate, 1)} approval rate for both models`,
    ],
    ['Bands', formatCount(settings.bands)],
    ['Missing scores', settings.dropMissing ? 'rows left out' : 'refused'],
    ['Engine version', report.engineVersion],
    ['Analysis run', run],
    ['Adoption policy', `version ${report.policy.version}`],
  ];
}

/** Both models' AUC, Gini and KS with their intervals, and the difference. */
export function metricsTable(report: Report): WordedTable {
  const level = formatPercent(report.settings.confidence, 0);
  const { champion, challenger, difference } = report;
  const ks = (interval: [number, number] | null, format = formatKs) => (interval ? formatInterval(interval, format) : 'no bootstrap');
  return {
    note: `Point estimates with ${level} intervals: DeLong for AUC and Gini, paired bootstrap percentiles for KS. Gini and KS in points.`,
    head: ['', 'Champion', 'Challenger', 'Challenger − champion'],
    numeric: [1, 2, 3],
    rows: [
      ['AUC', formatAuc(champion.auc), formatAuc(challenger.auc), formatAucDelta(difference.auc)],
      [`AUC ${level} interval`, formatInterval(champion.aucCi, formatAuc), formatInterval(challenger.aucCi, formatAuc), formatInterval(difference.aucCi, formatAucDelta)],
      ['Gini', formatGini(champion.gini), formatGini(challenger.gini), formatGiniDelta(difference.gini)],
      [`Gini ${level} interval`, formatInterval(champion.giniCi), formatInterval(challenger.giniCi), formatInterval(difference.giniCi, formatGiniDelta)],
      ['ΔGini bootstrap interval', '', '', difference.giniBootstrapCi ? formatInterval(difference.giniBootstrapCi, formatGiniDelta) : 'no bootstrap'],
      ['KS', formatKs(champion.ks), formatKs(challenger.ks), formatKsDelta(difference.ks)],
      [`KS ${level} interval`, ks(champion.ksCi), ks(challenger.ksCi), ks(difference.ksCi, formatKsDelta)],
      ['KS reached at score', formatScore(champion.ksScore), formatScore(challenger.ksScore), ''],
    ],
  };
}

/** DeLong's test of ΔAUC, the swap-in against swap-out test and the segments' Holm count. */
export function testsTable(report: Report): WordedTable {
  const { difference, swap, segments } = report;
  const holmSignificant = segments.filter((row) => row.pHolm !== null && row.pHolm < report.policy.alpha).length;
  return {
    head: ['Test', 'Statistic', 'p-value', 'Result'],
    numeric: [],
    rows: [
      [
        'DeLong paired test of ΔAUC (DeLong, DeLong & Clarke-Pearson 1988)',
        `z = ${formatSignedNumber(difference.z)}`,
        `${formatPValue(difference.pOneSided)} one-sided, ${formatPValue(difference.pTwoSided)} two-sided`,
        `se(ΔGini) = ${formatGini(difference.giniSe)} points; correlation of the AUCs ${difference.correlation === null ? '—' : formatNumber(difference.correlation, 3)}`,
      ],
      [
        `Swap-in vs swap-out bad rate (${swap.test.method === 'fisher-exact' ? 'Fisher’s exact test' : 'two-proportion z test'})`,
        swap.test.z === null ? '—' : `z = ${formatSignedNumber(swap.test.z)}`,
        swap.test.p === null ? '—' : `${formatPValue(swap.test.p)} two-sided`,
        swap.test.reason ?? `swap-in ${cellRateWords(swap.swapIn, report.settings)} vs swap-out ${cellRateWords(swap.swapOut, report.settings)}`,
      ],
      [
        'Segments: DeLong per value, Holm-adjusted (Holm 1979)',
        `${formatCount(segments.length)} rows`,
        '',
        segments.length === 0 ? 'no segment columns' : `${formatCount(holmSignificant)} with Holm-adjusted p below α = ${report.policy.alpha}`,
      ],
    ],
  };
}

/** The four cells of the swap table, in print order, with their names. */
export const swapCells = [
  ['bothAccept', 'Both accept'],
  ['swapIn', 'Swap-in (champion declines, challenger accepts)'],
  ['swapOut', 'Swap-out (champion accepts, challenger declines)'],
  ['bothReject', 'Both decline'],
] as const;

/** A bad rate with its interval, e.g. "7.2% (5.1% to 9.8%)". */
export const rateWithInterval = (cell: { badRate: number | null; badRateCi: [number, number] | null }) =>
  cell.badRateCi ? `${formatPercent(cell.badRate)} (${formatInterval(cell.badRateCi, formatPercent)})` : formatPercent(cell.badRate);

/** Where the swap sets were cut: at a matched approval rate, or at the given cut-offs. */
export function swapBasisSentence(swap: Report['swap']): string {
  return swap.basis === 'approval-rate'
    ? `Both models at a ${formatPercent(swap.requestedApprovalRate, 1)} approval rate: cut-offs ${formatScore(swap.champion.cutoff)} (champion, ${formatPercent(swap.champion.approvalRate)} achieved) and ${formatScore(swap.challenger.cutoff)} (challenger, ${formatPercent(swap.challenger.approvalRate)}).`
    : `Cut-offs ${formatScore(swap.champion.cutoff)} (champion, ${formatPercent(swap.champion.approvalRate)} approved) and ${formatScore(swap.challenger.cutoff)} (challenger, ${formatPercent(swap.challenger.approvalRate)} approved).`;
}

/** "95%": the report's confidence level as the tables' notes and headers name it. */
const levelOf = (report: Pick<Report, 'settings'>) => formatPercent(report.settings.confidence, 0);

/**
 * The four swap cells at the report's cut-offs: accounts, share, bads, bad rate (in words when some
 * applicants have no outcome), its Wilson interval and, when an exposure column is mapped, the
 * amount. `compactMoney` writes amounts short ("1.2M"), as the printable report's narrower page does.
 */
export function swapSetsTable(report: Pick<Report, 'swap' | 'settings' | 'mapping'>, { compactMoney = false }: { compactMoney?: boolean } = {}): WordedTable {
  const { swap, settings } = report;
  const level = levelOf(report);
  const hasAmount = !!report.mapping.exposure;
  const unknownNote = swapUnknownNote(swap, settings);
  return {
    note: `Bad rates with ${level} Wilson intervals.${unknownNote ? ` ${unknownNote}` : ''}`,
    head: ['', 'Accounts', 'Share', 'Bads', 'Bad rate', `${level} interval`, ...(hasAmount ? ['Amount'] : [])],
    numeric: [1, 2, 3, 4, 5, 6],
    rows: swapCells.map(([key, label]) => {
      const cell = swap[key];
      return [
        label,
        cellAccounts(cell),
        formatPercent(cell.share),
        formatCount(cell.bads),
        cellRateWords(cell, settings),
        formatInterval(cell.badRateCi, (value) => formatPercent(value)),
        ...(hasAmount ? [formatMoney(cell.amount, { compact: compactMoney })] : []),
      ];
    }),
  };
}

/**
 * The title of challenger k's swap sets by segment after the first (the first's are the report's
 * own, at its cut-offs): each further challenger's are at the report's approval rate.
 */
export function furtherSwapSegmentsTitle(name: string, swap: Pick<Report['swap'], 'requestedApprovalRate' | 'champion'>): string {
  return `Swap sets by segment: ${name} against the champion at a ${formatPercent(swap.requestedApprovalRate ?? swap.champion.approvalRate, 1)} approval rate`;
}

/**
 * Under a further challenger's swap sets by segment on the swap-sets page: which models and cut-offs.
 * `fromCutoffs`: the page is at given cut-offs, and the rate is the champion's approval rate there.
 */
export function furtherSwapSegmentsSentence(name: string, approvalRate: number, fromCutoffs: boolean): string {
  return `${name} against the champion within each value of each segment column, both at their cut-offs for a ${formatPercent(approvalRate, 1)} approval rate${
    fromCutoffs ? ' (the champion’s approval rate at the cut-off above; the challenger’s cut-off is on its own score)' : ''
  }: where it approves more or fewer accounts than the champion, and how risky they are.`;
}

/** The flag of a segment value whose swap-in is riskier than its swap-out. */
export const swapInRiskierFlag = 'Swap-in riskier than swap-out';

/** The swap sets within each segment value (engine 1.1 and later); null when there are none. */
export function swapSegmentsTable(report: Pick<Report, 'swap' | 'settings'>): WordedTable | null {
  const { swap, settings } = report;
  if (swap.bySegment.length === 0) return null;
  const rate = (cell: Report['swap']['bySegment'][number]['swapIn']) => ((cell.unknown ?? 0) > 0 ? cellRateWords(cell, settings) : rateWithInterval(cell));
  return {
    note: `The same cut-offs within each segment value; champion → challenger. Swap-in and swap-out bad rates with ${levelOf(report)} Wilson intervals. “Swap-in riskier” flags a value where the challenger trades in riskier accounts than it turns away.`,
    head: ['Segment', 'Accounts', 'Approval rate', 'Net approvals', 'Bad rate of the approved book', 'Swap-in', 'Swap-in bad rate', 'Swap-out', 'Swap-out bad rate', 'Flag'],
    numeric: [1, 3, 5, 7],
    rows: swap.bySegment.map((row) => [
      `${row.column} = ${row.value}`,
      formatCount(Math.round(row.accounts)),
      `${formatPercent(row.champion.approvalRate)} → ${formatPercent(row.challenger.approvalRate)}`,
      formatSignedNumber(row.challenger.approved - row.champion.approved, 0),
      `${formatPercent(row.champion.approvedBadRate)} → ${formatPercent(row.challenger.approvedBadRate)}`,
      cellAccounts(row.swapIn),
      rate(row.swapIn),
      cellAccounts(row.swapOut),
      rate(row.swapOut),
      swapInRiskier(row) ? swapInRiskierFlag : '',
    ]),
  };
}
