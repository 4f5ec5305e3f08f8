import { type Report, swapInRiskier } from '@shared/report';
import { formatCount, formatPercent, formatScore } from '@/lib/format';
import { Stat, StatGroup } from '@/components/stat';

/** Segment values named in the sentence; the Swap sets tab lists them all. */
const NAMED = 4;

/**
 * The report's swap sets in four numbers, for the verdict page, and the segment values where the
 * swap-in is riskier than the swap-out; the Swap sets tab has the rest.
 */
export function SwapGlance({ report }: { report: Report }) {
  const { swap, strategyCurve } = report;
  // Only values with both a swap-in and a swap-out can be compared.
  const comparable = swap.bySegment.filter((row) => row.swapIn.count > 0 && row.swapOut.count > 0);
  const riskier = comparable.filter(swapInRiskier);
  const others = swap.bySegment.length - comparable.length;
  const uncompared = others > 0 ? ` (${formatCount(others)} more have no swap-in or no swap-out)` : '';
  const named = riskier.slice(0, NAMED).map((row) => `${row.column} = ${row.value}`);
  if (riskier.length > NAMED) named.push(`${formatCount(riskier.length - NAMED)} more`);
  const at = swap.basis === 'approval-rate' && swap.requestedApprovalRate !== null ? `a ${formatPercent(swap.requestedApprovalRate, 0)} approval rate` : 'the chosen cut-offs';
  return (
    <div className="space-y-3">
      <p className="text-sm text-ink-soft">
        At {at} (champion cut-off {formatScore(swap.champion.cutoff)}, challenger {formatScore(swap.challenger.cutoff)}):
      </p>
      <StatGroup>
        <Stat label="Swap-in: newly approved" value={formatCount(swap.swapIn.count)} unit="accounts" interval={`bad rate ${formatPercent(swap.swapIn.badRate)}`} />
        <Stat label="Swap-out: newly declined" value={formatCount(swap.swapOut.count)} unit="accounts" interval={`bad rate ${formatPercent(swap.swapOut.badRate)}`} />
        <Stat
          label="Bads avoided at equal approval"
          value={formatCount(strategyCurve.atApprovalRate.badsAvoided)}
          footnote={`champion's approved bads minus the challenger's, at ${formatPercent(strategyCurve.atApprovalRate.approvalRate, 0)} approval`}
        />
        <Stat
          label="Approvals gained at equal bad rate"
          value={formatCount(strategyCurve.atApprovalRate.approvalsGainedAtEqualBadRate)}
          footnote="keeping the champion's portfolio bad rate"
        />
      </StatGroup>
      {swap.bySegment.length > 0 ? (
        <p className="text-sm text-ink-soft" data-testid="swap-segments-glance">
          {riskier.length === 0
            ? `Within every one of the ${formatCount(comparable.length)} segment values${uncompared}, the swap-in's bad rate is at or below the swap-out's.`
            : `Within segments, the swap-in's bad rate is above the swap-out's in ${formatCount(riskier.length)} of ${formatCount(comparable.length)} values${uncompared}: ${named.join(', ')}. Small groups move a lot with a few accounts; the Swap sets tab gives their intervals.`}
        </p>
      ) : null}
    </div>
  );
}
