import { type Report } from '@shared/report';
import { formatCount, formatPercent, formatScore } from '@/lib/format';
import { Stat, StatGroup } from '@/components/stat';

/** The report's swap sets in four numbers, for the verdict page; the Swap sets tab has the rest. */
export function SwapGlance({ report }: { report: Report }) {
  const { swap, strategyCurve } = report;
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
    </div>
  );
}
