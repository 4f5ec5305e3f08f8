import { type Scenario, type SwapQuery, type SwapResult } from '@shared/comparisons';
import { type Report } from '@shared/report';
import { sameSwapQuery, swapQueryToParams } from './swap-controls';

/**
 * The swap-sets page's control logic (app/routes/comparisons/swap-sets.tsx renders it): at the
 * report's own cut-offs the page shows the report's swap sets and asks the server nothing; any
 * other choice is sent once it has settled (debounced), and the page says "updating" while the
 * choice is newer than what is shown. The URL carries the choice, and nothing at the report's.
 */

/** The report's own swap sets in the shape the server answers for other cut-offs. */
export function reportSwapResult(report: Pick<Report, 'swap' | 'swapMatrix' | 'strategyCurve'>): SwapResult {
  return {
    swap: report.swap,
    swapMatrix: report.swapMatrix,
    strategyPosition: {
      ...report.strategyCurve.atApprovalRate,
      championApprovalRate: report.swap.champion.approvalRate,
      challengerApprovalRate: report.swap.challenger.approvalRate,
    },
  };
}

/**
 * A further challenger's swap sets by segment (k ≥ 1) follow the page's choice at an approval rate:
 * the rate chosen, or at given cut-offs the champion's approval rate there (the challenger's own
 * cut-off is on its own score). The report's own when it is the rate the report holds them at.
 */
export function furtherSwapRate(settled: SwapQuery, shown: Pick<SwapResult, 'swap'>): number {
  return settled.cutoffs ? shown.swap.champion.approvalRate : (settled.approvalRate ?? shown.swap.champion.approvalRate);
}

/** The request for challenger k's swap sets at `approvalRate`; null for the first (the page's own) and where the report has them. */
export function furtherSwapQuery(report: Pick<Report, 'challengers'>, k: number, approvalRate: number): SwapQuery | null {
  if (k === 0) return null;
  const stored = report.challengers?.[k]?.swap;
  if (stored && stored.basis === 'approval-rate' && stored.requestedApprovalRate === approvalRate) return null;
  return { approvalRate, challenger: k };
}

/** The settled choice is not the report's own, so the server computes it. */
export function needsServer(settled: SwapQuery, fromReport: SwapQuery): boolean {
  return !sameSwapQuery(settled, fromReport);
}

/** The page is updating while the choice is newer than the settled one, or the server is still answering it. */
export function isUpdating(input: { draft: SwapQuery; settled: SwapQuery; fromReport: SwapQuery; fetching: boolean }): boolean {
  return !sameSwapQuery(input.draft, input.settled) || (needsServer(input.settled, input.fromReport) && input.fetching);
}

/** The URL's search parameters for a choice: none at the report's own. */
export function swapSearchParams(query: SwapQuery, fromReport: SwapQuery): Record<string, string> {
  return sameSwapQuery(query, fromReport) ? {} : swapQueryToParams(query);
}

/** The choice a saved scenario stands for: its approval rate, or its cut-offs. */
export function scenarioQuery(scenario: Pick<Scenario, 'approvalRate' | 'cutoffs'>): SwapQuery {
  return scenario.approvalRate !== null ? { approvalRate: scenario.approvalRate } : { cutoffs: scenario.cutoffs };
}
