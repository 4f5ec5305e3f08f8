import { equalApprovalSentence, formatBads } from '@shared/equal-approval-words';
import { type Report, statedBadRate, type SwapCell, swapInRiskier } from '@shared/report';
import { formatCount, formatPercent, formatScore } from '@/lib/format';
import { Stat, StatGroup } from '@/components/stat';

/** A swap set's bad rate as the run states it: inferred (named so) when the run infers the unknown applicants' bads. */
function glanceRate(cell: SwapCell): string {
  if (cell.inferred && (cell.unknown ?? 0) > 0) return `bad rate ${formatPercent(statedBadRate(cell))} inferred`;
  return `bad rate ${formatPercent(cell.badRate)}${(cell.unknown ?? 0) > 0 ? ' of those with an outcome' : ''}`;
}

/** Segment values named in the sentence; the Swap sets tab lists them all. */
const NAMED = 4;

/**
 * The report's swap sets in four numbers, for the verdict page, and the segment values where the
 * swap-in is riskier than the swap-out; the Swap sets tab has the rest.
 */
export function SwapGlance({ report }: { report: Report }) {
  const { swap, strategyCurve } = report;
  const equal = strategyCurve.atApprovalRate;
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
        <Stat label="Swap-in: newly approved" value={formatCount(Math.round(swap.swapIn.accounts ?? swap.swapIn.count))} unit="accounts" interval={glanceRate(swap.swapIn)} />
        <Stat label="Swap-out: newly declined" value={formatCount(Math.round(swap.swapOut.accounts ?? swap.swapOut.count))} unit="accounts" interval={glanceRate(swap.swapOut)} />
        <Stat
          label="Bads avoided at equal approval"
          value={formatBads(equal.badsAvoided)}
          footnote={`both books ${formatCount(equal.accounts)} accounts (the champion's at ${formatPercent(equal.approvalRate, 0)}): ${formatBads(equal.championBads)} bads against ${formatBads(equal.challengerBads)}`}
        />
        <Stat
          label="Approvals gained at equal bad rate"
          value={formatCount(equal.approvalsGainedAtEqualBadRate)}
          footnote="keeping the champion's portfolio bad rate"
        />
      </StatGroup>
      <p className="text-sm text-ink-soft" data-testid="equal-approval">
        {equalApprovalSentence(equal)}
      </p>
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
