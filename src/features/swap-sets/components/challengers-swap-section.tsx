import { useState } from 'react';
import { approvalPatternsSentence, approvalPatternsTable, reportChallengersSwap, swapSideBySideTable } from '@shared/challengers-words';
import { type Report } from '@shared/report';
import { paths } from '@/config/paths';
import { useDebounced } from '@/lib/use-debounced';
import { buttonClasses } from '@/components/button';
import { Section } from '@/components/card';
import { ErrorState } from '@/components/error-state';
import { PercentField } from '@/components/percent-field';
import { Spinner } from '@/components/spinner';
import { WordTableView } from '@/components/word-table';
import { useChallengersSwap } from '@/features/swap-sets/api/get-challengers-swap';
import { challengersSwapRequest, validApprovalRate } from '@/features/swap-sets/lib/side-by-side';

/**
 * Several challengers on the Swap sets page: each challenger's swap sets against the champion at
 * one approval rate, side by side, and who each model approves (every combination of approve and
 * decline). The rate starts at the run's; another rate is computed by the server.
 */
export function ChallengersSwapSection({
  comparisonId,
  runId,
  report,
  canExportSwapList = false,
}: {
  comparisonId: number;
  runId: number | null;
  report: Report;
  /** The credit policy role downloads each challenger's swap list at this rate. */
  canExportSwapList?: boolean;
}) {
  const fromReport = reportChallengersSwap(report);
  const [rate, setRate] = useState(() => fromReport?.approvalRate ?? report.settings.approvalRate);
  const settled = useDebounced(rate, 300);
  const request = challengersSwapRequest(settled, report);
  const query = useChallengersSwap(comparisonId, runId, request);
  const result = request === null ? (validApprovalRate(settled) ? fromReport : (query.data ?? fromReport)) : query.data;
  const updating = request !== null && query.isFetching;
  return (
    <>
      <Section
        title="Every challenger at one approval rate"
        description="Each challenger against the champion, both at their cut-offs for the same approval rate: who each one swaps in and out, side by side."
      >
        <div className="space-y-4">
          <PercentField
            label="Approval rate for every challenger"
            className="max-w-xs"
            value={rate}
            min={0.1}
            max={99.9}
            error={validApprovalRate(rate) ? undefined : 'Give a rate above 0% and below 100%'}
            onChange={setRate}
          />
          <p className="flex min-h-5 items-center gap-2 text-sm text-ink-soft" aria-live="polite">
            {updating ? (
              <>
                <Spinner className="size-4 text-court-500" /> Recomputing every challenger…
              </>
            ) : query.isError && request !== null ? null : (
              'Up to date.'
            )}
          </p>
          {request !== null && query.isError ? (
            <ErrorState title="The swap sets could not be recomputed" error={query.error} onRetry={() => query.refetch()} retrying={query.isFetching} />
          ) : null}
          {result ? (
            <WordTableView
              table={swapSideBySideTable(result.challengers)}
              caption={`Swap sets of every challenger against the champion at a ${Math.round(result.approvalRate * 1000) / 10}% approval rate`}
              testId="swap-side-by-side"
              className={updating ? 'opacity-75' : undefined}
            />
          ) : null}
          {canExportSwapList && result ? (
            <div className="flex flex-wrap gap-2" data-testid="challenger-swap-lists">
              {result.challengers.map((challenger) => (
                <a
                  key={challenger.challenger}
                  href={paths.exports.swapCsv(comparisonId, { approvalRate: result.approvalRate }, challenger.challenger)}
                  download
                  className={buttonClasses({ size: 'sm' })}
                >
                  Swap list of {challenger.name} (CSV)
                </a>
              ))}
            </div>
          ) : null}
        </div>
      </Section>
      {result ? (
        <Section title="Who each model approves" description={approvalPatternsSentence(result.patterns)}>
          <WordTableView
            table={approvalPatternsTable(result.patterns)}
            caption="Applicants by the combination of models that approve them"
            textColumns={result.patterns.models.map((_, index) => index)}
            testId="approval-patterns"
            className={updating ? 'opacity-75' : undefined}
          />
        </Section>
      ) : null}
    </>
  );
}
