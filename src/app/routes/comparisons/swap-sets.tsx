import { hasSeveralChallengers } from '@shared/challengers-words';
import { hasUnknownOrWeights } from '@shared/population';
import { useCallback, useMemo, useState } from 'react';
import { useSearchParams } from 'react-router';
import { type Scenario, type SwapQuery, type SwapResult } from '@shared/comparisons';
import { type SegmentValueRef } from '@shared/mixed-strategy';
import { hasRole, useUser } from '@/lib/auth';
import { formatCount, formatPercent } from '@/lib/format';
import { useDebounced } from '@/lib/use-debounced';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Section } from '@/components/card';
import { DecisionCautions } from '@/components/decision-cautions';
import { ErrorState } from '@/components/error-state';
import { LoadingState } from '@/components/loading-state';
import { Spinner } from '@/components/spinner';
import { keepableValues, KeepChampionPicker, MixedStrategyPreview } from '@/features/governance/components/keep-champion';
import { segmentsOf } from '@shared/challenger-sections';
import { Select } from '@/components/select';
import { SwapSetNotes } from '@/features/governance/components/swap-set-notes';
import { useScenarios } from '@/features/swap-sets/api/get-scenarios';
import { useSwap } from '@/features/swap-sets/api/get-swap';
import { ExportLinks } from '@/features/swap-sets/components/export-links';
import { SaveScenarioDialog } from '@/features/swap-sets/components/save-scenario-dialog';
import { ScenariosTable } from '@/features/swap-sets/components/scenarios-table';
import { StrategyCurveChart } from '@/features/swap-sets/components/strategy-curve-chart';
import { SwapControls } from '@/features/swap-sets/components/swap-controls';
import { SwapMatrixTable } from '@/features/swap-sets/components/swap-matrix-table';
import { SwapSegmentsSection } from '@/features/swap-sets/components/swap-segments-section';
import { SwapTable } from '@/features/swap-sets/components/swap-table';
import { SwapTest } from '@/features/swap-sets/components/swap-test';
import { reportSwapQuery, swapQueryFromParams } from '@/features/swap-sets/lib/swap-controls';
import { isUpdating, needsServer, reportSwapResult, scenarioQuery, swapSearchParams } from '@/features/swap-sets/lib/swap-page';
import { ChallengersSwapSection } from '@/features/swap-sets/components/challengers-swap-section';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/**
 * Swap sets at the cut-offs or approval rate the person chooses: recomputed by the server
 * (debounced, the last result kept on screen meanwhile), with the 2×2, its test, the same within
 * each segment value, the swap matrix, the strategy curve, exports and saved scenarios. The
 * settings live in the URL.
 */
export function Component() {
  const { comparison, report } = useComparisonPage();
  const { data: user } = useUser();
  const [params, setParams] = useSearchParams();
  const isPolicy = hasRole(user, 'policy');
  const isCommittee = hasRole(user, 'committee');
  const [kept, setKept] = useState<SegmentValueRef[]>([]);
  // Several challengers: the one adopted outside the kept values (0 = the first).
  const [strategyChallenger, setStrategyChallenger] = useState(0);
  const fromReport = useMemo(() => reportSwapQuery(report.swap), [report.swap]);
  const [draft, setDraft] = useState<SwapQuery>(() => swapQueryFromParams(params) ?? fromReport);
  const settled = useDebounced(draft, 300);
  const fromServer = needsServer(settled, fromReport);
  const swap = useSwap(comparison.id, comparison.currentRunId, fromServer ? settled : null);
  const updating = isUpdating({ draft, settled, fromReport, fetching: swap.isFetching });
  const [saving, setSaving] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const scenarios = useScenarios(comparison.id);

  const reportResult: SwapResult = useMemo(() => reportSwapResult(report), [report]);
  const result = fromServer ? swap.data : reportResult;

  const change = useCallback(
    (query: SwapQuery) => {
      setDraft(query);
      setNotice(null);
      setParams(swapSearchParams(query, fromReport), { replace: true, preventScrollReset: true });
    },
    [fromReport, setParams],
  );
  const onShow = useCallback((scenario: Scenario) => change(scenarioQuery(scenario)), [change]);

  const confidence = formatPercent(report.settings.confidence, 0);
  const hasAmount = !!report.mapping.exposure;

  return (
    <div className="space-y-6">
      <Section
        title="Cut-offs"
        description="Accounts on the safe side of a model's cut-off, the cut-off itself included, are accepted. Try the settings you would actually run."
        actions={
          isPolicy && result ? (
            <Button variant="primary" size="sm" onClick={() => setSaving(true)}>
              Save as a scenario
            </Button>
          ) : null
        }
      >
        <SwapControls report={report} value={draft} shown={(result ?? reportResult).swap} onChange={change} />
        <p className="mt-3 flex min-h-5 items-center gap-2 text-sm text-ink-soft" aria-live="polite">
          {updating ? (
            <>
              <Spinner className="size-4 text-court-500" /> Recomputing the swap sets…
            </>
          ) : swap.isError && fromServer ? null : (
            'Up to date.'
          )}
        </p>
      </Section>

      {notice ? (
        <Alert tone="success" onDismiss={() => setNotice(null)}>
          <p>{notice}</p>
        </Alert>
      ) : null}

      {fromServer && swap.isError ? (
        <ErrorState title="The swap sets could not be recomputed" error={swap.error} onRetry={() => swap.refetch()} retrying={swap.isFetching} />
      ) : null}

      {!result ? (
        swap.isError ? null : <LoadingState label="Computing the swap sets…" variant="skeleton" />
      ) : (
        <div aria-busy={updating || undefined} className={updating ? 'opacity-75 transition-opacity' : 'transition-opacity'}>
          <div className="space-y-6">
            <Section
              title="Who each model accepts"
              description={`${
                report.population && hasUnknownOrWeights(report)
                  ? `${formatCount(report.population.rows)} rows of the holdout standing for ${formatCount(Math.round(report.population.accounts))} applicants, ${formatCount(Math.round(report.population.unknown.accounts))} of them without an outcome`
                  : `${formatCount(report.rows)} accounts of the holdout`
              }. Bad rates with ${confidence} Wilson intervals${hasAmount ? `; amounts are the sum of ${report.mapping.exposure}` : ''}.`}
            >
              <div className="space-y-4">
                <SwapTable swap={result.swap} confidence={confidence} hasAmount={hasAmount} caption="Accounts by the champion's and the challenger's decision" />
                <SwapTest swap={result.swap} alpha={report.policy.alpha} />
              </div>
            </Section>
            {result.swap.bySegment.length > 0 ? (
              <SwapSegmentsSection comparisonId={comparison.id} runId={comparison.currentRunId} report={report} settled={settled} shown={result} confidence={confidence} />
            ) : null}
            <div className="grid grid-cols-1 gap-6 2xl:grid-cols-2">
              <StrategyCurveChart curve={report.strategyCurve} swap={result.swap} position={result.strategyPosition} />
              <Section title="Swap matrix" description="How the two models band the same accounts: champion band by challenger band, band 1 the riskiest.">
                <SwapMatrixTable matrix={result.swapMatrix} />
              </Section>
            </div>
          </div>
        </div>
      )}

      {hasSeveralChallengers(report) ? <ChallengersSwapSection comparisonId={comparison.id} runId={comparison.currentRunId} report={report} canExportSwapList={isPolicy} /> : null}

      {(isPolicy || isCommittee) && report.segments.length > 0 ? (
        <Section
          title="Adopt except in some segment values"
          description={`Conditional adoption: the challenger decides every account except those in the values ticked here, which keep the champion; both at their cut-offs for the run’s ${formatPercent(
            report.settings.approvalRate,
            0,
          )} approval rate. The committee can record a decision with such exceptions.`}
        >
          <div className="space-y-3" data-testid="conditional-adoption">
            {hasSeveralChallengers(report) ? (
              <Select
                label="Challenger adopted outside the kept values"
                className="max-w-sm"
                value={String(strategyChallenger)}
                onChange={(event) => setStrategyChallenger(Number(event.target.value))}
                options={report.challengers.map((challenger, index) => ({ value: String(index), label: `${challenger.name} (challenger ${index + 1})` }))}
              />
            ) : null}
            <KeepChampionPicker values={keepableValues(segmentsOf(report, strategyChallenger))} kept={kept} onChange={setKept} />
            <MixedStrategyPreview comparisonId={comparison.id} runId={comparison.currentRunId} kept={kept} challenger={hasSeveralChallengers(report) ? strategyChallenger : undefined} />
          </div>
        </Section>
      ) : null}

      <Section title="Saved scenarios">
        {scenarios.isPending ? (
          <LoadingState label="Loading scenarios…" />
        ) : scenarios.isError ? (
          <ErrorState error={scenarios.error} onRetry={() => scenarios.refetch()} retrying={scenarios.isFetching} />
        ) : (
          <ScenariosTable scenarios={scenarios.data} onShow={onShow} canSave={isPolicy} />
        )}
      </Section>

      <Section
        title="Credit policy’s annotations"
        description={
          isPolicy
            ? 'Notes on the swap sets for the reviewers and the committee, optionally tied to a saved scenario. Everyone can read them.'
            : 'Notes by the credit policy role on the swap sets, for the review and the decision.'
        }
      >
        <SwapSetNotes comparisonId={comparison.id} canWrite={isPolicy} scenarios={scenarios.data ?? []} />
      </Section>

      <Section title="Downloads">
        <ExportLinks comparisonId={comparison.id} query={settled} canExportSwapList={isPolicy} />
      </Section>

      <DecisionCautions />

      {result ? (
        <SaveScenarioDialog
          open={saving}
          onClose={() => setSaving(false)}
          comparisonId={comparison.id}
          query={settled}
          cutoffs={{ champion: result.swap.champion.cutoff, challenger: result.swap.challenger.cutoff }}
          onSaved={(scenario) => {
            setSaving(false);
            setNotice(`Scenario “${scenario.name}” saved.`);
          }}
        />
      ) : null}
    </div>
  );
}
