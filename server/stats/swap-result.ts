import type { SwapCell, SwapSegmentRow, SwapSets } from '@shared/report';
import type { LocatedCutoff } from './cutoffs';

/**
 * The swap sets' result from its parts, one shape for plain and weighted holdouts (swap-sets.ts,
 * swap-sets-weighted.ts, which count the cells each their own way): the request, both cut-offs,
 * the four cells in the report's order (`cell(index)` with the cell indices below), the
 * swap-in vs swap-out test and the rows by segment; and a model's approvals within a segment value.
 * Common practice, no source.
 * Cost: O(1) beyond the cells it is given.
 */

export type SwapRequest =
  | { basis: 'cutoffs'; cutoffs: { champion: number; challenger: number } }
  | { basis: 'approval-rate'; approvalRate: number };

// Cell index: bit 0 = champion accepts, bit 1 = challenger accepts.
export const BOTH_REJECT = 0;
export const SWAP_OUT = 1;
export const SWAP_IN = 2;
export const BOTH_ACCEPT = 3;

export function swapResult(
  request: SwapRequest,
  champion: LocatedCutoff,
  challenger: LocatedCutoff,
  cell: (index: number) => SwapCell,
  test: SwapSets['test'],
  bySegment: SwapSegmentRow[],
): SwapSets {
  return {
    basis: request.basis,
    requestedApprovalRate: request.basis === 'approval-rate' ? request.approvalRate : null,
    champion: champion.position,
    challenger: challenger.position,
    bothAccept: cell(BOTH_ACCEPT),
    swapIn: cell(SWAP_IN),
    swapOut: cell(SWAP_OUT),
    bothReject: cell(BOTH_REJECT),
    test,
    bySegment,
  };
}

/**
 * A model's approvals within a segment value of `accounts`: how many it approves, the share, and
 * the bad rate of the approved accounts with an outcome (null when none has one).
 */
export function segmentApproval(accounts: number, approved: number, approvedKnown: number, approvedBads: number): SwapSegmentRow['champion'] {
  return { approved, approvalRate: accounts > 0 ? approved / accounts : 0, approvedBadRate: approvedKnown > 0 ? approvedBads / approvedKnown : null };
}
