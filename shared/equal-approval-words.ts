import { formatCount, formatNumber, formatPercent } from './format';
import type { StrategyCurve } from './report';

type Position = StrategyCurve['atApprovalRate'];

/** Bads counted in a book of equal size can be fractional (a tie block taken in proportion): one decimal then. */
export function formatBads(bads: number): string {
  // Sums of weights and inferred probabilities land a hair off a whole number: whole within 1e-6.
  return Math.abs(bads - Math.round(bads)) < 1e-6 ? formatCount(Math.round(bads)) : formatNumber(bads, 1);
}

/**
 * The strategy curve's two trade-offs at one approval rate, in words, with the number of accounts
 * both books are compared at and the challenger's own cut-off beside it (strategy-curve.ts). One
 * copy, used by the swap sets tab, the verdict tab, the printable report, the PDF and the CLI.
 */
export function equalApprovalSentence(at: Position): string {
  const rate = formatPercent(at.approvalRate, 1);
  const avoided =
    at.badsAvoided === 0
      ? 'as many bads as the champion'
      : `${formatBads(Math.abs(at.badsAvoided))} ${at.badsAvoided > 0 ? 'fewer' : 'more'} bads than the champion`;
  const own =
    Math.abs(at.challengerAtCutoff.accounts - at.accounts) < 1e-9
      ? ''
      : ` (its own cut-off for ${rate} approves ${formatCount(at.challengerAtCutoff.accounts)} accounts with ${formatBads(at.challengerAtCutoff.bads)} bads; ties at the cut-offs make the two books differ in size)`;
  const gained = at.approvalsGainedAtEqualBadRate;
  const approvals =
    gained === null
      ? 'No book of the challenger reaches the champion’s bad rate.'
      : Math.abs(gained) < 0.5
        ? 'At the champion’s bad rate it approves as many accounts.'
        : `At the champion’s bad rate it could approve ${formatCount(Math.abs(gained))} ${gained > 0 ? 'more' : 'fewer'} accounts.`;
  const basis =
    at.bads === 'inferred'
      ? ' Bads include those inferred for the applicants without an outcome (the run’s reject inference): an assumption, not an observation.'
      : at.bads === 'known-only'
        ? ' Caution: only bads with a known outcome are counted, so applicants without an outcome count as no bad and flatter the book that approves more of them; choose a reject inference to compare the books fairly.'
        : '';
  return `At equal approval — the ${formatCount(at.accounts)} accounts the champion approves at ${rate} — the champion’s book holds ${formatBads(
    at.championBads,
  )} bads and the challenger’s ${formatBads(at.challengerBads)}: the challenger approves ${avoided}${own}. ${approvals}${basis}`;
}
