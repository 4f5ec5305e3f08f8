import { formatCount, formatPercent } from '@/lib/format';

/** The strategy curve's two trade-offs in words, whichever way they go. */
export function tradeOff(position: { badsAvoided: number; approvalsGainedAtEqualBadRate: number | null; approvalRate: number }): string {
  const rate = formatPercent(position.approvalRate, 0);
  const bads =
    position.badsAvoided >= 0
      ? `At a ${rate} approval rate the challenger approves ${formatCount(position.badsAvoided)} fewer bads than the champion`
      : `At a ${rate} approval rate the challenger approves ${formatCount(-position.badsAvoided)} more bads than the champion`;
  const gained = position.approvalsGainedAtEqualBadRate;
  const approvals =
    gained === null
      ? 'no approval rate of the challenger matches the champion’s bad rate'
      : gained >= 0
        ? `at the champion’s bad rate it could approve ${formatCount(gained)} more accounts`
        : `at the champion’s bad rate it would approve ${formatCount(-gained)} fewer accounts`;
  return `${bads}; ${approvals}.`;
}
