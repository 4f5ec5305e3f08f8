import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { type LoaderFunctionArgs, useParams } from 'react-router';
import { paths } from '@/config/paths';
import { useUser } from '@/lib/auth';
import { ButtonLink } from '@/components/button';
import { Alert } from '@/components/callout';
import { Section } from '@/components/card';
import { DecisionCautions } from '@/components/decision-cautions';
import { auditTrailQueryOptions } from '@/features/governance/api/get-audit-trail';
import { governanceQueryOptions } from '@/features/governance/api/get-governance';
import { notesQueryOptions } from '@/features/governance/api/get-notes';
import { AuditTimeline, ChainStatus } from '@/features/governance/components/audit-timeline';
import { DecisionForm } from '@/features/governance/components/decision-form';
import { DecisionRecord } from '@/features/governance/components/decision-record';
import { DiscussionThread } from '@/features/governance/components/discussion-thread';
import { RefusalNote } from '@/features/governance/components/refusal-note';
import { ReviewForm } from '@/features/governance/components/review-form';
import { ReviewsList } from '@/features/governance/components/reviews-list';
import { SubmitForm } from '@/features/governance/components/submit-form';
import { VerdictRecords } from '@/features/governance/components/verdict-records';
import { VoteForm, VotesTally } from '@/features/governance/components/votes-panel';
import { WorkflowProgress } from '@/features/governance/components/workflow-progress';
import { keepableValues } from '@/features/governance/components/keep-champion';
import { segmentsOf } from '@shared/challenger-sections';
import { decisionRecipients } from '@/features/governance/lib/recipients';
import { viewerActions } from '@/features/governance/lib/workflow';
import { challengerOptions } from '@/features/governance/lib/choosing';
import { comparisonIdFrom } from '@/app/routes/comparisons/comparison-id';
import { useComparisonPage } from '@/app/routes/comparisons/context';

export const loader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  const id = comparisonIdFrom(params);
  await Promise.all([
    queryClient.ensureQueryData(governanceQueryOptions(id)),
    queryClient.ensureQueryData(auditTrailQueryOptions(id)),
    queryClient.ensureQueryData(notesQueryOptions(id)),
  ]);
  return null;
};

/**
 * Review and decision: where the comparison stands, the viewer's own step (submit, review, vote,
 * decide) with the reasons when a step is not theirs, the findings, the votes against the quorum,
 * the decision with the cautions beside it, the verdict records under their policy versions, the
 * discussion and the audit trail.
 */
export function Component() {
  const id = comparisonIdFrom(useParams());
  const { comparison, report } = useComparisonPage();
  const { data: user } = useUser();
  // The loader filled the cache; a failed load shows the route's error boundary.
  const governance = useSuspenseQuery(governanceQueryOptions(id));
  const audit = useSuspenseQuery(auditTrailQueryOptions(id));
  const notes = useSuspenseQuery(notesQueryOptions(id));
  const [notice, setNotice] = useState<string | null>(null);

  if (!user) return null;
  const g = governance.data;
  const actions = viewerActions({
    state: g.state,
    authorIds: g.authors.map((author) => author.id),
    user,
    latestRunStatus: comparison.runs[0]?.status ?? null,
    hasReport: comparison.currentRunId !== null,
  });
  const myVote = g.votes.find((vote) => vote.voter.id === user.id) ?? null;
  const quorumMet = g.quorum <= 0 || g.votes.length >= g.quorum;
  // Several challengers: votes and the decision name one (empty with one challenger).
  const challengers = challengerOptions(report);
  const step = (() => {
    if (actions.submit.kind === 'allowed') return { title: 'Submit for review', body: <SubmitForm comparisonId={id} onDone={setNotice} /> };
    if (actions.review.kind === 'allowed') return { title: 'Your review', body: <ReviewForm comparisonId={id} creator={g.createdBy.name} onDone={setNotice} /> };
    const refusal = [actions.submit, actions.review, actions.vote].find((permission) => permission.kind === 'refused');
    if (refusal?.kind === 'refused') {
      return {
        title: 'Your part',
        body: (
          <div className="space-y-3">
            <RefusalNote>{refusal.reason}</RefusalNote>
            {g.state === 'returned' && actions.submit.kind === 'refused' ? (
              <ButtonLink to={paths.comparisons.setup(id)} size="sm" variant="primary">
                Change the mapping or settings
              </ButtonLink>
            ) : null}
          </div>
        ),
      };
    }
    return null;
  })();

  return (
    <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <div className="min-w-0 space-y-6">
        <Section title="Where it stands" description="Submitted by a modeler, validated or returned by an analyst, decided by the committee.">
          <WorkflowProgress state={g.state} />
        </Section>

        {notice ? (
          <Alert tone="success" onDismiss={() => setNotice(null)}>
            <p>{notice}</p>
          </Alert>
        ) : null}

        {step ? <Section title={step.title}>{step.body}</Section> : null}

        <Section title="Review findings" description="Every review, newest first, with the analysis run it was made on.">
          <ReviewsList reviews={g.reviews} />
        </Section>

        {g.state === 'validated' || g.state === 'decided' || g.votes.length > 0 ? (
          <Section title="Committee votes" description="The votes of the current validation round; a member who votes again replaces their earlier vote.">
            <div className="space-y-5">
              <VotesTally votes={g.votes} quorum={g.quorum} challengers={challengers} adoptVotesByChallenger={g.adoptVotesByChallenger} />
              {actions.vote.kind === 'allowed' ? <VoteForm comparisonId={id} current={myVote} challengers={challengers} /> : null}
              {actions.vote.kind === 'refused' ? <RefusalNote>{actions.vote.reason}</RefusalNote> : null}
            </div>
          </Section>
        ) : null}

        {g.decision || actions.decide.kind !== 'hidden' ? (
          <Section title="Decision" description={g.decision ? undefined : challengers.length > 0 ? 'Adopt one of the challengers, keep the champion or defer, with the rationale.' : 'Adopt the challenger, keep the champion or defer, with the rationale.'}>
            {g.decision ? (
              <DecisionRecord decision={g.decision} several={challengers.length > 0} />
            ) : actions.decide.kind === 'allowed' ? (
              <div className="grid grid-cols-1 gap-5 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
                <DecisionForm
                  comparisonId={id}
                  runId={comparison.currentRunId}
                  quorumMet={quorumMet}
                  tally={g.tally}
                  majority={g.majority}
                  segmentValues={keepableValues(report.segments)}
                  recipients={decisionRecipients(g, user.id)}
                  onDone={setNotice}
                  challengers={challengers}
                  adoptVotesByChallenger={g.adoptVotesByChallenger}
                  segmentValuesByChallenger={challengers.map((option) => keepableValues(segmentsOf(report, option.index)))}
                />
                <DecisionCautions compact />
              </div>
            ) : actions.decide.kind === 'refused' ? (
              <RefusalNote>{actions.decide.reason}</RefusalNote>
            ) : null}
          </Section>
        ) : null}

        <Section title="Verdict records" description="What the adoption policy advised, each time under the version it used. Changing the policy never rewrites a stored verdict.">
          <VerdictRecords comparisonId={id} records={g.verdicts} currentRunId={comparison.currentRunId} canReEvaluate={actions.reEvaluate} />
        </Section>

        <Section title="Discussion">
          <DiscussionThread comparisonId={id} notes={notes.data} />
        </Section>
      </div>

      <aside className="min-w-0 space-y-6">
        <DecisionCautions />
        <Section
          title="Audit trail"
          actions={
            <ButtonLink to={paths.comparisons.report(id)} size="sm">
              Printable report
            </ButtonLink>
          }
        >
          <div className="space-y-4">
            <ChainStatus valid={audit.data.chainValid} events={audit.data.events.length} />
            <AuditTimeline events={audit.data.events} />
          </div>
        </Section>
      </aside>
    </div>
  );
}
