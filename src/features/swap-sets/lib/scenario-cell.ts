import type { Scenario } from '@shared/comparisons';
import { formatCount, formatPercent } from '@/lib/format';

/**
 * A saved scenario's swap set in words: accounts (weighted when the holdout has weights) and the bad
 * rate the run states — inferred (and named so) when the run infers the bads of applicants without
 * an outcome, else of the accounts with an outcome.
 */
export function scenarioAccounts(cell: Scenario['swapIn']): string {
  return formatCount(Math.round(cell.accounts ?? cell.count));
}

export function scenarioBadRate(cell: Scenario['swapIn']): string {
  if (cell.inferredBadRate !== undefined && cell.inferredBadRate !== null) return `${formatPercent(cell.inferredBadRate)} inferred`;
  return formatPercent(cell.badRate);
}
