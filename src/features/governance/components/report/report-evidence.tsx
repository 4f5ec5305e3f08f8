import { equalApprovalSentence } from '@shared/equal-approval-words';
import { type ComparisonDetail } from '@shared/comparisons';
import { type Report } from '@shared/report';
import { formatDateTime } from '@/lib/format';
import { noSegmentsSentence, segmentsTable } from '@shared/segments-words';
import { dataFacts, metricsTable, settingsFacts, swapBasisSentence, swapSegmentsTable, swapSetsTable, testsTable } from '@shared/pack/evidence-words';
import { FactList, ReportBlock, ReportTable } from '@/features/governance/components/report/report-table';

/**
 * The evidence parts of the printable report: the data and its hash, the settings and seed, the
 * engine, both models' metrics with their intervals, the tests with their results, the swap sets
 * at the chosen cut-offs and the segments. Everything comes from the stored report of the run;
 * the words and tables are shared/pack/evidence-words.ts, which the committee pack prints too, so
 * these components only lay them out.
 */

export function ReportData({ report, comparison }: { report: Report; comparison: ComparisonDetail }) {
  const run = comparison.runs.find((candidate) => candidate.id === comparison.currentRunId) ?? null;
  return (
    <div className="grid gap-6 md:grid-cols-2 print:grid-cols-2">
      <ReportBlock title="Data">
        <FactList
          facts={dataFacts(report).map(([label, text]) =>
            label === 'SHA-256' ? [label, <code key="hash" className="font-mono text-xs break-all">{text}</code>] : [label, text],
          )}
        />
      </ReportBlock>
      <ReportBlock title="Settings and engine">
        <FactList facts={settingsFacts(report, run ? `${run.id}, finished ${formatDateTime(run.finishedAt)}` : '—')} />
      </ReportBlock>
    </div>
  );
}

export function ReportMetrics({ report }: { report: Report }) {
  const { note, ...table } = metricsTable(report);
  return (
    <ReportBlock title="Metrics" note={note}>
      <ReportTable caption="Metrics of both models and their difference" {...table} />
    </ReportBlock>
  );
}

export function ReportTests({ report }: { report: Report }) {
  return (
    <ReportBlock title="Tests" note="Two-sided and one-sided (challenger better) p-values; the adoption policy’s α applies to the side it names.">
      <ReportTable caption="Statistical tests and their results" nowrap={[1]} {...testsTable(report)} />
    </ReportBlock>
  );
}

/** The swap sets at the report's cut-offs: where they were cut, then the four cells. */
export function ReportSwapTable({ report, title }: { report: Report; title: string }) {
  const { note, ...table } = swapSetsTable(report, { compactMoney: true });
  return (
    <ReportBlock title={title} note={`${swapBasisSentence(report.swap)} ${note}`}>
      <ReportTable caption={title} {...table} />
    </ReportBlock>
  );
}

/** The report's swap sets within each segment value (engine 1.1 and later). */
export function ReportSwapSegments({ report, swap = report.swap, title = 'Swap sets by segment' }: { report: Report; swap?: Report['swap']; title?: string }) {
  const words = swapSegmentsTable({ swap, settings: report.settings });
  if (!words) return null;
  const { note, rows, ...table } = words;
  // Non-breaking hyphens in the flag: it may wrap between words, never inside "swap-in".
  const flag = table.head.length - 1;
  return (
    <ReportBlock title={title} note={note}>
      <ReportTable caption={title} nowrap={[0]} rows={rows.map((row) => row.map((cell, index) => (index === flag ? cell.replaceAll('-', '\u2011') : cell)))} {...table} />
    </ReportBlock>
  );
}

export function ReportStrategy({ report }: { report: Report }) {
  return <p className="text-sm text-ink">{equalApprovalSentence(report.strategyCurve.atApprovalRate)}</p>;
}

/** Challenger k's segments table (k = 0, the first challenger, under its own title "Segments"): the same columns for every challenger. */
export function ReportSegments({ report, k = 0, title = 'Segments' }: { report: Report; k?: number; title?: string }) {
  const words = segmentsTable(report, k);
  if (!words) return k === 0 ? <p className="text-sm text-ink-soft">{noSegmentsSentence}</p> : null;
  const { note, ...table } = words;
  return (
    <ReportBlock title={title} note={note}>
      <ReportTable caption={title} nowrap={[0]} {...table} />
    </ReportBlock>
  );
}
