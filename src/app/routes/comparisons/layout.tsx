import { useMemo } from 'react';
import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { chosenModelWords, hasSeveralChallengers, recommendedName } from '@shared/challengers-words';
import { canSetUp } from '@shared/workflow';
import { type LoaderFunctionArgs, Link, Outlet, redirect, useParams } from 'react-router';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { hasRole, useUser } from '@/lib/auth';
import { formatCount, formatDateTime, isoDateTime } from '@/lib/format';
import { ButtonLink } from '@/components/button';
import { Callout } from '@/components/callout';
import { DocumentTitle } from '@/components/document-title';
import { ErrorState } from '@/components/error-state';
import { LoadingState } from '@/components/loading-state';
import { PageHeader } from '@/components/page-header';
import { StatusBadge } from '@/components/status-badge';
import { Steps } from '@/components/steps';
import { Tabs } from '@/components/tabs';
import { PackDownloads } from '@/features/comparisons/components/pack-downloads';
import { comparisonQueryOptions, isRunActive } from '@/features/comparisons/api/get-comparison';
import { reportQueryOptions, useReport } from '@/features/comparisons/api/get-report';
import { shownReport } from '@/features/comparisons/lib/shown-report';
import { AnalysisFailed, AnalysisProgress } from '@/features/comparisons/components/analysis-progress';
import { NextStepCallout } from '@/features/comparisons/components/next-step-callout';
import { nextSteps } from '@/features/comparisons/lib/next-step';
import { bodyShowsNextStep, comparisonPageState } from '@/features/comparisons/lib/page-state';
import { stateLabel, stateTones, verdictLabels, verdictTones } from '@/features/comparisons/lib/state-tone';
import { requireUser } from '@/app/guards';
import { comparisonIdFrom } from '@/app/routes/comparisons/comparison-id';
import { type ComparisonPageContext } from '@/app/routes/comparisons/context';
import { comparisonTabs, stepTargetUrl } from '@/app/routes/comparisons/tabs';
import { wizardSteps } from '@/app/routes/comparisons/wizard-steps';

export const loader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const user = await requireUser(queryClient, request);
  const id = comparisonIdFrom(params);
  const comparison = await queryClient.ensureQueryData(comparisonQueryOptions(id));
  // A draft that has never been mapped resumes the wizard at the column mapping.
  if (comparison.state === 'draft' && comparison.runs.length === 0 && hasRole(user, 'modeler')) throw redirect(paths.comparisons.setup(id));
  if (comparison.currentRunId !== null) {
    try {
      await queryClient.ensureQueryData(reportQueryOptions(id, comparison.currentRunId));
    } catch (error) {
      // 409: no run is done after all (a race with a new run); the page says so.
      if (!isApiError(error) || error.status !== 409) throw error;
    }
  }
  return null;
};

/**
 * The frame of a comparison's pages: its name, state and verdict, the next step for the person
 * looking at it, and the tabs. While no run is done, the tabs' place shows the analysis progress
 * (or its failure); once a report exists every tab reads it from the outlet context.
 */
export function Component() {
  const id = comparisonIdFrom(useParams());
  const { data: user } = useUser();
  // The loader filled the cache; a failed load shows the route's error boundary. The report is
  // read with useQuery: a new run's report arrives while the page is open (page-state.ts).
  const { data: detail } = useSuspenseQuery(comparisonQueryOptions(id));
  const report = useReport(id, detail.currentRunId);
  // Several challengers: each one's verdict and the recommended one as the current verdict record says.
  const shown = useMemo(() => (report.data ? shownReport(report.data, detail.verdict) : undefined), [report.data, detail.verdict]);
  // Several challengers, decided: the header names the model chosen (the comparison's decision).
  const several = !!shown && hasSeveralChallengers(shown);
  const decided = several && detail.state === 'decided' ? chosenModelWords(detail.decided?.chosen) : null;

  if (!user) return null;

  const latest = detail.runs[0] ?? null;
  const active = isRunActive(detail);
  const pageInput = {
    comparison: detail,
    active,
    report: { loaded: !!shown, pending: report.isPending, errorStatus: isApiError(report.error) ? report.error.status : null },
  };
  const state = comparisonPageState(pageInput);
  const steps = nextSteps({ state: detail.state, latestRun: latest, hasReport: detail.currentRunId !== null, createdById: detail.createdBy.id, authorIds: detail.authorIds, user });
  const actionFor = (target: NonNullable<typeof steps.primary.action>) => {
    const url = stepTargetUrl(target.target, id);
    return url ? (
      <ButtonLink to={url} variant={steps.primary.kind === 'done' ? 'secondary' : 'primary'} size="sm">
        {target.label}
      </ButtonLink>
    ) : null;
  };
  const isModeler = hasRole(user, 'modeler');
  const bodySaysNextStep = bodyShowsNextStep(pageInput);
  // One verdict everywhere: the comparison's current verdict record (newest, or the decided one).
  const verdict = detail.verdict?.outcome ?? shown?.verdict.outcome;

  let body;
  if (state.kind === 'report' && shown) {
    body = (
      <>
        {state.newRunActive && latest ? (
          <Callout tone="info" title="A new analysis is running" className="mb-5">
            <p>
              {latest.stage ?? 'Working'} ({Math.round(latest.progress * 100)}%). These pages show the previous run until it finishes.
            </p>
          </Callout>
        ) : null}
        <Outlet context={{ comparison: detail, report: shown } satisfies ComparisonPageContext} />
      </>
    );
  } else if (state.kind === 'running' && latest) {
    body = (
      <AnalysisProgress run={latest}>
        {state.firstRun ? <Steps steps={wizardSteps} current="run" label="New comparison steps" /> : null}
      </AnalysisProgress>
    );
  } else if (state.kind === 'failed' && latest) {
    body = (
      <AnalysisFailed
        run={latest}
        action={
          isModeler ? (
            <ButtonLink to={paths.comparisons.setup(id)} variant="primary" size="sm">
              Back to the column mapping
            </ButtonLink>
          ) : null
        }
      />
    );
  } else if (state.kind === 'not-mapped') {
    body = (
      <Callout tone="info" title="No analysis yet">
        <p>The columns of this holdout have not been mapped yet. The evidence appears here once a modeler runs the analysis.</p>
      </Callout>
    );
  } else if (state.kind === 'loading-report') {
    body = <LoadingState label="Loading the report…" variant="skeleton" />;
  } else if (state.kind === 'no-finished-report') {
    body = (
      <Callout tone="info" title="No finished analysis yet" actions={<ButtonLink to={paths.comparisons.detail(id)} size="sm">Check again</ButtonLink>}>
        <p>The server has no finished report for this comparison yet.</p>
      </Callout>
    );
  } else {
    body = <ErrorState title="The report could not be loaded" error={report.error} onRetry={() => report.refetch()} retrying={report.isFetching} />;
  }

  return (
    <>
      <DocumentTitle>{detail.name}</DocumentTitle>
      <PageHeader
        eyebrow={
          <Link to={paths.comparisons.list()} className="hover:underline">
            Comparisons
          </Link>
        }
        title={detail.name}
        subtitle={detail.description ?? undefined}
        actions={
          isModeler && canSetUp(detail.state) && !active && detail.runs.length > 0 && !bodySaysNextStep ? (
            <ButtonLink to={paths.comparisons.setup(id)} size="sm">
              Change mapping or settings
            </ButtonLink>
          ) : null
        }
      >
        <div className="flex flex-wrap items-center gap-x-4 gap-y-2 text-sm text-ink-soft">
          <span className="inline-flex items-center gap-1.5">
            <span className="sr-only">State:</span>
            <StatusBadge tone={stateTones[detail.state]}>{stateLabel(detail.state)}</StatusBadge>
          </span>
          {verdict ? (
            <span className="inline-flex items-center gap-1.5">
              <span>Verdict:</span>
              <StatusBadge tone={verdictTones[verdict]}>{verdictLabels[verdict]}</StatusBadge>
            </span>
          ) : null}
          {shown && hasSeveralChallengers(shown) ? (
            <span data-testid="header-recommended">
              {shown.challengers.length} challengers ·{' '}
              {recommendedName(shown) ? (
                <>
                  recommended: <span className="font-medium text-ink">{recommendedName(shown)}</span>
                </>
              ) : (
                'none recommended'
              )}
              {decided ? (
                <>
                  {' '}
                  · decided: <span className="font-medium text-ink">{decided}</span>
                </>
              ) : null}
            </span>
          ) : null}
          <span>
            {detail.holdout.fileName} · <span className="num">{formatCount(detail.holdout.rowCount)}</span> rows
          </span>
          <span>
            Created by {detail.createdBy.name}, <time dateTime={isoDateTime(detail.createdAt)}>{formatDateTime(detail.createdAt)}</time>
          </span>
        </div>
        {bodySaysNextStep ? null : <NextStepCallout step={steps.primary} action={steps.primary.action ? actionFor(steps.primary.action) : undefined} />}
        {steps.others.length > 0 ? (
          <ul className="space-y-1 text-sm text-ink-soft">
            {steps.others.map((other) => (
              <li key={other.title}>
                Also for you: <span className="font-medium text-ink">{other.title}</span>
                {other.action && stepTargetUrl(other.action.target, id) ? (
                  <>
                    {' '}
                    —{' '}
                    <Link className="font-medium text-court-700 underline" to={stepTargetUrl(other.action.target, id)!}>
                      {other.action.label}
                    </Link>
                  </>
                ) : null}
              </li>
            ))}
          </ul>
        ) : null}
        {shown ? <PackDownloads comparisonId={id} decided={detail.state === 'decided'} /> : null}
        <Tabs
          label="Comparison pages"
          items={comparisonTabs.map((tab) => ({ to: tab.path(id), label: tab.label, end: tab.key === 'verdict' }))}
        />
      </PageHeader>
      {body}
    </>
  );
}
