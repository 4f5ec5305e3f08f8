import { type ComparisonDetail } from '@shared/comparisons';
import { type Report, type SwapSets, swapInRiskier } from '@shared/report';
import {
  formatAuc,
  formatAucDelta,
  formatBytes,
  formatCount,
  formatDateTime,
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
} from '@/lib/format';
import { FactList, ReportBlock, ReportTable } from '@/features/governance/components/report/report-table';

/**
 * The evidence parts of the printable report: the data and its hash, the settings and seed, the
 * engine, both models' metrics with their intervals, the tests with their results, the swap sets
 * at the chosen cut-offs and the segments. Everything comes from the stored report of the run.
 */

const orientation = { safer: 'higher is safer', riskier: 'higher is riskier' } as const;

export function ReportData({ report, comparison }: { report: Report; comparison: ComparisonDetail }) {
  const run = comparison.runs.find((candidate) => candidate.id === comparison.currentRunId) ?? null;
  const { settings, mapping } = report;
  return (
    <div className="grid gap-6 md:grid-cols-2 print:grid-cols-2">
      <ReportBlock title="Data">
        <FactList
          facts={[
            ['File', report.input.fileName],
            ['SHA-256', <code key="hash" className="font-mono text-xs break-all">{report.input.sha256}</code>],
            ['Size', formatBytes(report.input.bytes)],
            ['Rows read / used', `${formatCount(report.dataQuality.rowsRead)} / ${formatCount(report.rows)}`],
            ['Goods / bads', `${formatCount(report.goods)} / ${formatCount(report.bads)}`],
            ['Bad rate', formatPercent(report.badRate, 2)],
            ['Outcome', `${mapping.outcome} (bad = “${mapping.badValue}”)`],
            ['Champion', `${mapping.champion} (${orientation[mapping.higherIs.champion]})`],
            ['Challenger', `${mapping.challenger} (${orientation[mapping.higherIs.challenger]})`],
            ['Segments', mapping.segments && mapping.segments.length > 0 ? mapping.segments.join(', ') : 'none'],
            ['Exposure', mapping.exposure ?? 'none'],
          ]}
        />
      </ReportBlock>
      <ReportBlock title="Settings and engine">
        <FactList
          facts={[
            ['Random seed', String(settings.seed)],
            ['Bootstrap', settings.bootstrap > 0 ? `${formatCount(settings.bootstrap)} paired, stratified replicates` : 'not run'],
            ['Confidence', formatPercent(settings.confidence, 0)],
            [
              'Swap sets at',
              settings.cutoffs
                ? `cut-offs ${formatScore(settings.cutoffs.champion)} (champion) and ${formatScore(settings.cutoffs.challenger)} (challenger)`
                : `a ${formatPercent(settings.approvalRate, 1)} approval rate for both models`,
            ],
            ['Bands', String(settings.bands)],
            ['Missing scores', settings.dropMissing ? 'rows left out' : 'refused'],
            ['Engine version', report.engineVersion],
            ['Analysis run', run ? `${run.id}, finished ${formatDateTime(run.finishedAt)}` : '—'],
            ['Adoption policy', `version ${report.policy.version}`],
          ]}
        />
      </ReportBlock>
    </div>
  );
}

export function ReportMetrics({ report }: { report: Report }) {
  const level = formatPercent(report.settings.confidence, 0);
  const { champion, challenger, difference } = report;
  const ks = (interval: [number, number] | null, format = formatKs) => (interval ? formatInterval(interval, format) : 'no bootstrap');
  return (
    <ReportBlock title="Metrics" note={`Point estimates with ${level} intervals: DeLong for AUC and Gini, paired bootstrap percentiles for KS. Gini and KS in points.`}>
      <ReportTable
        caption="Metrics of both models and their difference"
        head={['', 'Champion', 'Challenger', 'Challenger − champion']}
        numeric={[1, 2, 3]}
        rows={[
          ['AUC', formatAuc(champion.auc), formatAuc(challenger.auc), formatAucDelta(difference.auc)],
          [`AUC ${level} interval`, formatInterval(champion.aucCi, formatAuc), formatInterval(challenger.aucCi, formatAuc), formatInterval(difference.aucCi, formatAucDelta)],
          ['Gini', formatGini(champion.gini), formatGini(challenger.gini), formatGiniDelta(difference.gini)],
          [`Gini ${level} interval`, formatInterval(champion.giniCi), formatInterval(challenger.giniCi), formatInterval(difference.giniCi, formatGiniDelta)],
          ['ΔGini bootstrap interval', '', '', difference.giniBootstrapCi ? formatInterval(difference.giniBootstrapCi, formatGiniDelta) : 'no bootstrap'],
          ['KS', formatKs(champion.ks), formatKs(challenger.ks), formatKsDelta(difference.ks)],
          [`KS ${level} interval`, ks(champion.ksCi), ks(challenger.ksCi), ks(difference.ksCi, formatKsDelta)],
          ['KS reached at score', formatScore(champion.ksScore), formatScore(challenger.ksScore), ''],
        ]}
      />
    </ReportBlock>
  );
}

export function ReportTests({ report }: { report: Report }) {
  const { difference, swap, segments } = report;
  const holmSignificant = segments.filter((row) => row.pHolm !== null && row.pHolm < report.policy.alpha).length;
  return (
    <ReportBlock title="Tests" note="Two-sided and one-sided (challenger better) p-values; the adoption policy’s α applies to the side it names.">
      <ReportTable
        caption="Statistical tests and their results"
        head={['Test', 'Statistic', 'p-value', 'Result']}
        nowrap={[1]}
        rows={[
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
            swap.test.reason ?? `swap-in ${formatPercent(swap.swapIn.badRate)} vs swap-out ${formatPercent(swap.swapOut.badRate)}`,
          ],
          [
            'Segments: DeLong per value, Holm-adjusted (Holm 1979)',
            `${formatCount(segments.length)} rows`,
            '',
            segments.length === 0 ? 'no segment columns' : `${holmSignificant} with Holm-adjusted p below α = ${report.policy.alpha}`,
          ],
        ]}
      />
    </ReportBlock>
  );
}

const cells = [
  ['bothAccept', 'Both accept'],
  ['swapIn', 'Swap-in (champion declines, challenger accepts)'],
  ['swapOut', 'Swap-out (champion accepts, challenger declines)'],
  ['bothReject', 'Both decline'],
] as const;

export function ReportSwapTable({ swap, confidence, hasAmount, title }: { swap: SwapSets; confidence: number; hasAmount: boolean; title: string }) {
  const level = formatPercent(confidence, 0);
  const where =
    swap.basis === 'approval-rate'
      ? `Both models at a ${formatPercent(swap.requestedApprovalRate, 1)} approval rate: cut-offs ${formatScore(swap.champion.cutoff)} (champion, ${formatPercent(swap.champion.approvalRate)} achieved) and ${formatScore(swap.challenger.cutoff)} (challenger, ${formatPercent(swap.challenger.approvalRate)}).`
      : `Cut-offs ${formatScore(swap.champion.cutoff)} (champion, ${formatPercent(swap.champion.approvalRate)} approved) and ${formatScore(swap.challenger.cutoff)} (challenger, ${formatPercent(swap.challenger.approvalRate)} approved).`;
  return (
    <ReportBlock title={title} note={`${where} Bad rates with ${level} Wilson intervals.`}>
      <ReportTable
        caption={title}
        head={['', 'Accounts', 'Share', 'Bads', 'Bad rate', `${level} interval`, ...(hasAmount ? ['Amount'] : [])]}
        numeric={[1, 2, 3, 4, 5, 6]}
        rows={cells.map(([key, label]) => {
          const cell = swap[key];
          return [
            label,
            formatCount(cell.count),
            formatPercent(cell.share),
            formatCount(cell.bads),
            formatPercent(cell.badRate),
            formatInterval(cell.badRateCi, (value) => formatPercent(value)),
            ...(hasAmount ? [formatMoney(cell.amount, { compact: true })] : []),
          ];
        })}
      />
    </ReportBlock>
  );
}

const rateWithInterval = (cell: { badRate: number | null; badRateCi: [number, number] | null }) =>
  cell.badRateCi ? `${formatPercent(cell.badRate)} (${formatInterval(cell.badRateCi, formatPercent)})` : formatPercent(cell.badRate);

/** The report's swap sets within each segment value (engine 1.1 and later). */
export function ReportSwapSegments({ swap, confidence }: { swap: SwapSets; confidence: number }) {
  if (swap.bySegment.length === 0) return null;
  const level = formatPercent(confidence, 0);
  return (
    <ReportBlock
      title="Swap sets by segment"
      note={`The same cut-offs within each segment value; champion → challenger. Swap-in and swap-out bad rates with ${level} Wilson intervals.`}
    >
      <ReportTable
        caption="Swap sets by segment"
        head={['Segment', 'Accounts', 'Approval rate', 'Net approvals', 'Bad rate of the approved book', 'Swap-in', 'Swap-in bad rate', 'Swap-out', 'Swap-out bad rate', 'Note']}
        numeric={[1, 2, 3, 4, 5, 6, 7, 8]}
        nowrap={[0]}
        rows={swap.bySegment.map((row) => [
          `${row.column} = ${row.value}`,
          formatCount(row.accounts),
          `${formatPercent(row.champion.approvalRate)} → ${formatPercent(row.challenger.approvalRate)}`,
          formatSignedNumber(row.challenger.approved - row.champion.approved, 0),
          `${formatPercent(row.champion.approvedBadRate)} → ${formatPercent(row.challenger.approvedBadRate)}`,
          formatCount(row.swapIn.count),
          rateWithInterval(row.swapIn),
          formatCount(row.swapOut.count),
          rateWithInterval(row.swapOut),
          // Non-breaking hyphens: the flag may wrap between words, never inside "swap-in".
          swapInRiskier(row) ? 'Swap\u2011in riskier than swap\u2011out' : '',
        ])}
      />
    </ReportBlock>
  );
}

export function ReportStrategy({ report }: { report: Report }) {
  const at = report.strategyCurve.atApprovalRate;
  return (
    <p className="text-sm text-ink">
      At a {formatPercent(at.approvalRate, 1)} approval rate the champion approves {formatCount(at.championBads)} bads and the challenger{' '}
      {formatCount(at.challengerBads)}: {at.badsAvoided >= 0 ? `${formatCount(at.badsAvoided)} bads avoided` : `${formatCount(-at.badsAvoided)} more bads`}.{' '}
      {at.approvalsGainedAtEqualBadRate === null
        ? ''
        : `At the champion’s bad rate the challenger could approve ${formatCount(at.approvalsGainedAtEqualBadRate)} more accounts.`}
    </p>
  );
}

export function ReportSegments({ report }: { report: Report }) {
  if (report.segments.length === 0) return <p className="text-sm text-ink-soft">No segment columns were mapped.</p>;
  const sided = report.policy.sided === 'one-sided' ? 'one-sided' : 'two-sided';
  return (
    <ReportBlock title="Segments" note={`ΔGini per segment value with its DeLong p (${sided}) and the Holm-adjusted p across all rows. “Few bads” marks values with too few bads to read.`}>
      <ReportTable
        caption="Segments"
        head={['Segment', 'Accounts', 'Bads', 'Champion Gini', 'Challenger Gini', 'ΔGini', 'p', 'Holm p', 'Note']}
        numeric={[1, 2, 3, 4, 5, 6, 7]}
        rows={report.segments.map((row) => [
          `${row.column} = ${row.value}`,
          formatCount(row.n),
          formatCount(row.bads),
          formatGini(row.championGini),
          formatGini(row.challengerGini),
          formatGiniDelta(row.deltaGini),
          formatPValue(row.p),
          formatPValue(row.pHolm),
          [row.tooFewBads ? 'few bads' : null, row.note].filter(Boolean).join('; '),
        ])}
      />
    </ReportBlock>
  );
}
