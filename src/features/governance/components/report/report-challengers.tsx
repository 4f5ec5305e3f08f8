import {
  challengerVerdictsNote,
  approvalPatternsSentence,
  approvalPatternsTable,
  challengerVerdictsTable,
  choiceCaution,
  choiceSentence,
  flaggedSegmentsNote,
  flaggedSegmentsTable,
  jointTestSentence,
  modelsSummaryTable,
  multiplicityNote,
  pairwiseNote,
  pairwiseTable,
  reportChallengersSwap,
  swapSideBySideTable,
} from '@shared/challengers-words';
import { type ChallengerResult, type Report } from '@shared/report';
import { type WordTable, withFigures } from '@shared/word-table';
import { formatPercent } from '@/lib/format';
import { ReportBlock, ReportPart, ReportTable } from '@/features/governance/components/report/report-table';
import { ReportSegments, ReportSwapSegments } from '@/features/governance/components/report/report-evidence';
import { furtherSwapSegmentsTitle } from '@shared/pack/evidence-words';

/** A word table as a printable report table: the first column names the row, the rest are figures unless listed as words. */
function PrintedTable({ table, caption, words = [] }: { table: WordTable; caption: string; words?: number[] }) {
  const { head, rows, numeric } = withFigures(table, words);
  return <ReportTable caption={caption} head={head} rows={rows} numeric={numeric} />;
}

/**
 * The printable report's part for several challengers: the choice with its caution, every model
 * side by side, the joint and pairwise tests, each challenger's verdict, the swap sets side by
 * side at the report's approval rate and who each model approves, with each challenger's
 * flagged segment values between them. The parts after it detail the
 * first challenger, as a two-model report does.
 */
export function ReportChallengers({ report }: { report: Report & { challengers: ChallengerResult[] } }) {
  const side = reportChallengersSwap(report);
  const count = report.challengers.length;
  return (
    <ReportPart title={`One champion, ${count} challengers`} id="report-challengers">
      <div className="report-block space-y-1 rounded-md border border-line p-3 text-sm">
        <p className="font-medium text-ink" data-testid="report-choice">
          {choiceSentence(report)}
        </p>
        <p className="text-ink-soft">{choiceCaution}</p>
      </div>
      <ReportBlock title="Every model" note={multiplicityNote(count)}>
        <PrintedTable table={modelsSummaryTable(report, report.settings.confidence)} caption="Every model side by side" words={[1, 8]} />
      </ReportBlock>
      <ReportBlock title="Joint test">
        <p className="text-sm text-ink">{jointTestSentence(report)}</p>
      </ReportBlock>
      <ReportBlock title="Challengers against each other" note={pairwiseNote}>
        <PrintedTable table={pairwiseTable(report)} caption="Every pair of challengers" />
      </ReportBlock>
      <ReportBlock title="Each challenger's verdict" note={challengerVerdictsNote(report)}>
        <PrintedTable table={challengerVerdictsTable(report)} caption="Each challenger's verdict" words={[1, 2, 3]} />
      </ReportBlock>
      <FlaggedSegmentsBlock report={report} />
      {side ? (
        <>
          <ReportBlock title={`Swap sets of every challenger at a ${formatPercent(side.approvalRate, 1)} approval rate`} note="Each challenger against the champion, both at their cut-offs for the same approval rate.">
            <PrintedTable table={swapSideBySideTable(side.challengers)} caption="Swap sets side by side" />
          </ReportBlock>
          <ReportBlock title="Who each model approves" note={approvalPatternsSentence(side.patterns)}>
            <PrintedTable table={approvalPatternsTable(side.patterns)} caption="Approval patterns" words={side.patterns.models.map((_, index) => index)} />
          </ReportBlock>
        </>
      ) : null}
      {report.challengers.map((challenger, k) =>
        k === 0 ? null : <ReportSwapSegments key={challenger.column} report={report} swap={challenger.swap} title={furtherSwapSegmentsTitle(challenger.name, challenger.swap)} />,
      )}
    </ReportPart>
  );
}

/** Every challenger's segment values where it is significantly or materially worse than the champion, then each further challenger's rows in full. */
function FlaggedSegmentsBlock({ report }: { report: Report & { challengers: ChallengerResult[] } }) {
  const table = flaggedSegmentsTable(report);
  return (
    <>
      <ReportBlock title="Segments where a challenger is worse" note={flaggedSegmentsNote(table)}>
        {table.rows.length > 0 ? <PrintedTable table={table} caption="Flagged segment values of every challenger" words={[1, 2]} /> : null}
      </ReportBlock>
      {report.challengers.map((challenger, k) => (k === 0 ? null : <ReportSegments key={challenger.column} report={report} k={k} title={`Segments: ${challenger.name} against the champion`} />))}
    </>
  );
}
