import { useState } from 'react';
import { challengerName, hasSeveralChallengers } from '@shared/challengers-words';
import { type SwapQuery, type SwapResult } from '@shared/comparisons';
import { furtherSwapSegmentsSentence } from '@shared/pack/evidence-words';
import { type Report } from '@shared/report';
import { Section } from '@/components/card';
import { ErrorState } from '@/components/error-state';
import { LoadingState } from '@/components/loading-state';
import { Select } from '@/components/select';
import { useSwap } from '@/features/swap-sets/api/get-swap';
import { SwapSegmentsTable } from '@/features/swap-sets/components/swap-segments-table';
import { furtherSwapQuery, furtherSwapRate } from '@/features/swap-sets/lib/swap-page';

/**
 * Who changes sides within each segment value, for the challenger chosen (several challengers: a
 * choice above the table). The first challenger's follow the page's cut-offs exactly; a further
 * challenger's are at the page's approval rate (furtherSwapRate), read from the report at the
 * report's rate and asked of the server (POST …/swap { challenger: k }) at another.
 */
export function SwapSegmentsSection({
  comparisonId,
  runId,
  report,
  settled,
  shown,
  confidence,
}: {
  comparisonId: number;
  runId: number | null;
  report: Report;
  /** The page's settled choice and what it shows for the first challenger. */
  settled: SwapQuery;
  shown: SwapResult;
  confidence: string;
}) {
  const [k, setK] = useState(0);
  const rate = furtherSwapRate(settled, shown);
  const request = furtherSwapQuery(report, k, rate);
  const further = useSwap(comparisonId, runId, request);
  const rows = k === 0 ? shown.swap.bySegment : request === null ? (report.challengers?.[k]?.swap.bySegment ?? []) : further.data?.swap.bySegment;
  return (
    <Section
      title="Swap sets by segment"
      description={
        k === 0
          ? `The same cut-offs within each value of each segment column, champion → ${hasSeveralChallengers(report) ? challengerName(report, 0) : 'challenger'}: where the challenger approves more or fewer accounts, and how risky they are.`
          : furtherSwapSegmentsSentence(challengerName(report, k), rate, settled.cutoffs !== undefined)
      }
    >
      <div className="space-y-4" data-testid="swap-segments">
        {hasSeveralChallengers(report) ? (
          <Select
            label="Challenger against the champion"
            className="max-w-sm"
            value={String(k)}
            onChange={(event) => setK(Number(event.target.value))}
            options={report.challengers.map((challenger, index) => ({ value: String(index), label: `${challenger.name} (challenger ${index + 1})` }))}
          />
        ) : null}
        {rows ? (
          <div aria-busy={(request !== null && further.isFetching) || undefined}>
            <SwapSegmentsTable rows={rows} confidence={confidence} />
          </div>
        ) : further.isError ? (
          <ErrorState title="The swap sets by segment could not be computed" error={further.error} onRetry={() => further.refetch()} retrying={further.isFetching} />
        ) : (
          <LoadingState label="Computing the swap sets by segment…" variant="skeleton" />
        )}
      </div>
    </Section>
  );
}
