import { hasSeveralChallengers } from '@shared/challengers-words';
import { paths } from '@/config/paths';
import { formatCount, formatPercent } from '@/lib/format';
import { ButtonLink } from '@/components/button';
import { Section } from '@/components/card';
import { DecisionCautions } from '@/components/decision-cautions';
import { CriteriaList } from '@/features/comparisons/components/criteria-list';
import { FlaggedSegments, FlaggedSegmentsByChallenger } from '@/features/comparisons/components/flagged-segments';
import { GiniContext } from '@/features/comparisons/components/gini-context';
import { ModelMetrics } from '@/features/comparisons/components/model-metrics';
import { SwapGlance } from '@/features/comparisons/components/swap-glance';
import { UpliftChart } from '@/features/comparisons/components/uplift-chart';
import { VerdictHeadline } from '@/features/comparisons/components/verdict-headline';
import { SeveralChallengersSections } from '@/features/comparisons/components/challengers-overview';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** The comparison's front page: the verdict, the uplift against zero and materiality, the metrics and criteria. */
export function Component() {
  const { comparison, report } = useComparisonPage();
  // One verdict everywhere: the comparison's current verdict record (the newest under its policy
  // version, or the one a decision was made on); the report's own only before records exist.
  const verdict = comparison.verdict ?? report.verdict;
  const policyRate = report.policy.swapRule.approvalRate;
  const runRate = report.swap.basis === 'approval-rate' ? report.swap.requestedApprovalRate : null;
  return (
    <div className="space-y-6">
      {hasSeveralChallengers(report) ? <SeveralChallengersSections report={report} /> : null}
      <VerdictHeadline verdict={verdict} title={hasSeveralChallengers(report) ? `Verdict on ${report.challengers[0]!.name}, challenger 1` : undefined} />
      <Section title="The uplift" description="How much better the challenger separates goods from bads, with the uncertainty of the estimate.">
        <UpliftChart report={report} />
      </Section>
      <div className="grid grid-cols-1 gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Section title="Adoption criteria" description="The adoption policy turns the evidence into a recommendation; each rule with the numbers that decided it.">
          <CriteriaList verdict={verdict} />
        </Section>
        <Section title="Reading a Gini">
          <GiniContext report={report} />
        </Section>
      </div>
      {report.segments.length > 0 ? (
        <Section
          title={hasSeveralChallengers(report) ? 'Segments where a challenger is worse' : 'Segments where the challenger is worse'}
          actions={
            <ButtonLink to={paths.comparisons.segments(comparison.id)} size="sm">
              All segments
            </ButtonLink>
          }
        >
          {hasSeveralChallengers(report) ? <FlaggedSegmentsByChallenger report={report} /> : <FlaggedSegments report={report} />}
        </Section>
      ) : null}
      <Section title="Both models" description={`On ${formatCount(report.rows)} accounts with ${formatCount(report.bads)} bads.`}>
        <ModelMetrics report={report} />
      </Section>
      <Section
        title="Who changes sides"
        actions={
          <ButtonLink to={paths.comparisons.swapSets(comparison.id)} size="sm">
            Explore the swap sets
          </ButtonLink>
        }
      >
        {report.policy.swapRule.enabled && runRate !== policyRate ? (
          <p className="mb-3 text-sm text-ink-soft" data-testid="approval-rate-sources">
            These swap sets are at the run&apos;s {runRate === null ? 'own cut-offs' : `${formatPercent(runRate, 1)} approval rate`}; the verdict judges the swap rule at the
            policy&apos;s {formatPercent(policyRate, 1)}.
          </p>
        ) : null}
        <SwapGlance report={report} />
      </Section>
      <DecisionCautions />
    </div>
  );
}
