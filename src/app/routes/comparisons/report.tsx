import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { type LoaderFunctionArgs, useParams } from 'react-router';
import { hasSeveralChallengers } from '@shared/challengers-words';
import { comparisonStateLabels } from '@shared/comparisons';
import { paths } from '@/config/paths';
import { useUser } from '@/lib/auth';
import { ksChart, rocChart, segmentIntervalsChart, strategyChart, swapGridChart, upliftChart } from '@shared/pack/charts';
import { formatDateTime, formatPercent, formatScore } from '@/lib/format';
import { Button } from '@/components/button';
import { PackChart } from '@/components/charts/pack-chart';
import { DecisionCautions } from '@/components/decision-cautions';
import { DocumentTitle } from '@/components/document-title';
import { GiniContext } from '@/features/comparisons/components/gini-context';
import { auditTrailQueryOptions } from '@/features/governance/api/get-audit-trail';
import { governanceQueryOptions } from '@/features/governance/api/get-governance';
import { notesQueryOptions } from '@/features/governance/api/get-notes';
import { AuditEventWhat, ChainStatus } from '@/features/governance/components/audit-timeline';
import { DecisionRecord } from '@/features/governance/components/decision-record';
import { NoteItem } from '@/features/governance/components/discussion-thread';
import { ReviewsList } from '@/features/governance/components/reviews-list';
import { VerdictOutcomeBadge, VerdictRecords } from '@/features/governance/components/verdict-records';
import { VotesTally } from '@/features/governance/components/votes-panel';
import {
  ReportData,
  ReportMetrics,
  ReportSegments,
  ReportStrategy,
  ReportSwapSegments,
  ReportSwapTable,
  ReportTests,
} from '@/features/governance/components/report/report-evidence';
import { ReportCalibrationStability } from '@/features/governance/components/report/report-calibration';
import { ReportBlock, ReportPart, ReportTable } from '@/features/governance/components/report/report-table';
import { scenariosQueryOptions } from '@/features/swap-sets/api/get-scenarios';
import { ReportChallengers } from '@/features/governance/components/report/report-challengers';
import { challengerOptions } from '@/features/governance/lib/choosing';
import { comparisonIdFrom } from '@/app/routes/comparisons/comparison-id';
import { useComparisonPage } from '@/app/routes/comparisons/context';
import { committeeDecidesNote, criteriaTable, noDecisionSentence, notDecidedSentence, policyInOneSentence, shortenedHashesNote, verdictHeading, verdictRecordsNote } from '@shared/pack/record-words';
import { scenarioAccounts, scenarioBadRate } from '@/features/swap-sets/lib/scenario-cell';

export const loader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  const id = comparisonIdFrom(params);
  await Promise.all([
    queryClient.ensureQueryData(governanceQueryOptions(id)),
    queryClient.ensureQueryData(auditTrailQueryOptions(id)),
    queryClient.ensureQueryData(notesQueryOptions(id)),
    queryClient.ensureQueryData(scenariosQueryOptions(id)),
  ]);
  return null;
};

type Paper = 'a4' | 'letter';

/**
 * The printable model-risk report: one document a model-risk file can hold. On screen it is a
 * long page with a paper-size choice, a print button and the evidence pack; printed (styles.css,
 * "report") it drops the app's chrome, uses A4 or Letter pages and starts each part on a new page.
 */
export function Component() {
  const id = comparisonIdFrom(useParams());
  const { comparison, report } = useComparisonPage();
  const { data: user } = useUser();
  // The loader filled the cache; a failed load shows the route's error boundary.
  const governance = useSuspenseQuery(governanceQueryOptions(id));
  const audit = useSuspenseQuery(auditTrailQueryOptions(id));
  const notes = useSuspenseQuery(notesQueryOptions(id));
  const scenarios = useSuspenseQuery(scenariosQueryOptions(id));
  const [paper, setPaper] = useState<Paper>('a4');
  const [generatedAt] = useState(() => new Date());
  // The print stylesheet picks the paper from the root element (styles.css, "report").
  useEffect(() => {
    document.documentElement.dataset.reportPaper = paper;
    return () => {
      delete document.documentElement.dataset.reportPaper;
    };
  }, [paper]);

  const g = governance.data;
  const trail = audit.data;
  // The comparison's current verdict record (the decided one after a decision), as every page shows it.
  const verdict = comparison.verdict ?? report.verdict;
  const annotations = notes.data.filter((note) => note.anchor !== 'discussion');
  const discussion = notes.data.filter((note) => note.anchor === 'discussion');
  const segmentChart = segmentIntervalsChart(report);
  const scenarioName = new Map(scenarios.data.map((scenario) => [scenario.id, scenario.name]));
  const challengers = challengerOptions(report);

  return (
    <article data-report data-paper={paper} className="report mx-auto max-w-5xl space-y-10" aria-label="Model-risk report">
      <DocumentTitle>{`Report: ${comparison.name}`}</DocumentTitle>
      <div className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-line bg-paper-raised p-4 print:hidden" data-print="hide">
        <fieldset className="flex flex-wrap items-center gap-3 text-sm">
          <legend className="sr-only">Paper size</legend>
          <span className="font-medium text-ink">Paper</span>
          {(['a4', 'letter'] as const).map((size) => (
            <label key={size} className="inline-flex items-center gap-1.5">
              <input type="radio" name="paper" value={size} checked={paper === size} onChange={() => setPaper(size)} className="accent-court-700" />
              {size === 'a4' ? 'A4' : 'US Letter'}
            </label>
          ))}
        </fieldset>
        <div className="flex flex-wrap gap-2">
          <a className="inline-flex h-9 items-center rounded-md border border-line-strong bg-paper-raised px-3 text-sm font-medium text-ink hover:bg-paper-sunk" href={paths.exports.evidenceJson(id)} download>
            Download the evidence pack (JSON)
          </a>
          <Button variant="primary" size="sm" onClick={() => window.print()}>
            Print or save as PDF
          </Button>
        </div>
      </div>

      <ReportPart title="Champion–challenger comparison: model-risk report" id="report-summary">
        <div className="space-y-1">
          <p className="text-xl font-semibold text-ink">{comparison.name}</p>
          {comparison.description ? <p className="text-sm text-ink-soft">{comparison.description}</p> : null}
          <p className="text-sm text-ink-soft">
            Comparison {comparison.id} · {comparisonStateLabels[g.state]} · created by {comparison.createdBy.name} on {formatDateTime(comparison.createdAt)} ·
            report generated {formatDateTime(generatedAt)}
            {user ? ` by ${user.name}` : ''} with Scorecourt
          </p>
        </div>
        <div className="report-block flex flex-wrap items-center gap-3 rounded-md border border-line p-3 text-sm">
          <span className="font-medium">{verdictHeading(verdict)}:</span>
          <VerdictOutcomeBadge outcome={verdict.outcome} />
          <span className="text-ink-soft">{verdict.summary}</span>
        </div>
        {g.decision ? (
          <div className="report-block rounded-md border border-line p-3">
            <DecisionRecord decision={g.decision} several={challengers.length > 0} />
          </div>
        ) : (
          <p className="text-sm text-ink-soft">{noDecisionSentence(g.state)}</p>
        )}
        <ReportData report={report} comparison={comparison} />
        <DecisionCautions className="report-block" />
      </ReportPart>

      {hasSeveralChallengers(report) ? <ReportChallengers report={report} /> : null}

      <ReportPart title="Evidence: metrics and tests" id="report-metrics">
        <ReportMetrics report={report} />
        <PackChart chart={upliftChart(report)} />
        <PackChart chart={rocChart(report)} />
        <PackChart chart={ksChart(report)} />
        <ReportBlock title="Reading the Gini">
          <GiniContext report={report} />
        </ReportBlock>
        <ReportTests report={report} />
      </ReportPart>

      <ReportPart title="Calibration and stability" id="report-calibration">
        <ReportCalibrationStability report={report} />
      </ReportPart>

      <ReportPart title="Who changes sides: swap sets and segments" id="report-swap">
        <ReportSwapTable report={report} title="Swap sets at the report’s cut-offs" />
        <PackChart chart={swapGridChart(report)} />
        <ReportStrategy report={report} />
        <PackChart chart={strategyChart(report)} />
        <ReportSwapSegments report={report} />
        {scenarios.data && scenarios.data.length > 0 ? (
          <ReportBlock title="Saved cut-off scenarios" note="Chosen by credit policy; swap sets as computed when each was saved.">
            <ReportTable
              caption="Saved cut-off scenarios"
              head={['Scenario', 'Champion cut-off', 'Challenger cut-off', 'Approval rate', 'Swap-in', 'Swap-in bad rate', 'Swap-out', 'Swap-out bad rate', 'Saved by']}
              numeric={[1, 2, 3, 4, 5, 6, 7]}
              rows={scenarios.data.map((scenario) => [
                scenario.name,
                formatScore(scenario.cutoffs.champion),
                formatScore(scenario.cutoffs.challenger),
                scenario.approvalRate === null ? 'cut-offs' : formatPercent(scenario.approvalRate, 1),
                scenarioAccounts(scenario.swapIn),
                scenarioBadRate(scenario.swapIn),
                scenarioAccounts(scenario.swapOut),
                scenarioBadRate(scenario.swapOut),
                scenario.createdBy.name,
              ])}
            />
          </ReportBlock>
        ) : null}
        {annotations.length > 0 ? (
          <ReportBlock title="Credit policy’s annotations">
            <ol className="divide-y divide-line rounded-md border border-line">
              {annotations.map((note) => (
                <NoteItem key={note.id} note={note} scenarioName={note.scenarioId !== null ? (scenarioName.get(note.scenarioId) ?? null) : null} />
              ))}
            </ol>
          </ReportBlock>
        ) : null}
        <ReportSegments report={report} />
        {segmentChart ? <PackChart chart={segmentChart} /> : null}
      </ReportPart>

      <ReportPart title="Verdict, review and decision" id="report-governance">
        <ReportBlock title={`Adoption criteria (policy version ${verdict.policyVersion})`}>
          <ReportTable caption="Adoption criteria" nowrap={[1]} {...criteriaTable(verdict)} />
          <p className="text-xs text-ink-soft">{policyInOneSentence(report.policy)}</p>
        </ReportBlock>
        <ReportBlock title="Verdict records" note={verdictRecordsNote}>
          <VerdictRecords comparisonId={id} records={g.verdicts} currentRunId={comparison.currentRunId} canReEvaluate={false} />
        </ReportBlock>
        <ReportBlock title="Review findings">
          <ReviewsList reviews={g.reviews} />
        </ReportBlock>
        <ReportBlock title="Committee votes">
          <VotesTally votes={g.votes} quorum={g.quorum} challengers={challengers} adoptVotesByChallenger={g.adoptVotesByChallenger} />
        </ReportBlock>
        <ReportBlock title="Decision">
          {g.decision ? <DecisionRecord decision={g.decision} several={challengers.length > 0} /> : <p className="text-sm text-ink-soft">{notDecidedSentence}</p>}
        </ReportBlock>
        {discussion.length > 0 ? (
          <ReportBlock title="Discussion">
            <ol className="divide-y divide-line rounded-md border border-line">
              {discussion.map((note) => (
                <NoteItem key={note.id} note={note} />
              ))}
            </ol>
          </ReportBlock>
        ) : null}
        <p className="report-block text-xs text-ink-soft">{committeeDecidesNote}</p>
      </ReportPart>

      <ReportPart title="Audit trail" id="report-audit">
        <ChainStatus valid={trail.chainValid} events={trail.events.length} />
        <ReportTable
          caption="Audit trail"
          head={['When (UTC)', 'Who', 'What', 'Hash']}
          nowrap={[0]}
          rows={trail.events.map((event) => [
            formatDateTime(event.createdAt, 'UTC'),
            event.actor?.name ?? 'Scorecourt',
            <AuditEventWhat key={event.id} event={event} />,
            <code key="hash" className="font-mono text-[10px] break-all text-ink-soft">
              {event.hash.slice(0, 16)}…
            </code>,
          ])}
        />
        <p className="text-xs text-ink-soft">{shortenedHashesNote}</p>
      </ReportPart>
    </article>
  );
}
